import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

// Server, shared and reference tests run in node; better-sqlite3 is a native module, so forks.
// Browser tests (tests/e2e) drive Debian's Chromium through playwright-core.
export default defineConfig({
  resolve: {
    alias: {
      "@shared": fileURLToPath(new URL("./shared", import.meta.url)),
      "@": fileURLToPath(new URL("./src", import.meta.url)),
    },
  },
  test: {
    environment: "node",
    pool: "forks",
    testTimeout: 60_000,
    hookTimeout: 120_000,
    include: ["tests/**/*.test.ts", "shared/**/*.test.ts", "server/**/*.test.ts", "src/**/*.test.ts"],
  },
});
