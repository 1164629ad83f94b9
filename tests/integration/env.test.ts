/**
 * Configuration: parsed once with zod; a production server others can reach refuses to start without
 * a real secret; the development server's origins are trusted only under `npm run dev`.
 */
import { mkdtempSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { ConfigError, loadEnv } from "../../server/env.ts";

const dir = () => mkdtempSync(path.join(tmpdir(), "tinelog-env-"));

describe("environment", () => {
  it("refuses a production start at a public address without BETTER_AUTH_SECRET, naming it", () => {
    try {
      loadEnv({ NODE_ENV: "production", DATA_DIR: dir(), BASE_URL: "https://tinelog.example" });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(ConfigError);
      expect((error as ConfigError).problems.join("\n")).toMatch(/BETTER_AUTH_SECRET: required in production for https:\/\/tinelog\.example/);
    }
  });

  it("runs the local demo (no BASE_URL) as production on localhost with a generated secret, trusting no development origin", () => {
    const env = loadEnv({ NODE_ENV: "production", DATA_DIR: dir(), PORT: "3430" });
    expect(env.baseUrl).toBe("http://localhost:3430");
    expect(env.secret).toMatch(/^[0-9a-f]{64}$/);
    expect(env.trustedOrigins.sort()).toEqual(["http://127.0.0.1:3430", "http://localhost:3430"]);
  });

  it("treats an unset NODE_ENV as production: the development server's origins are not trusted", () => {
    const env = loadEnv({ DATA_DIR: dir() });
    expect(env.NODE_ENV).toBe("production");
    expect(env.trustedOrigins.some((o) => o.endsWith(":5173"))).toBe(false);
  });

  it("trusts the development server's origins under NODE_ENV=development, which only `npm run dev` sets", () => {
    expect(loadEnv({ NODE_ENV: "development", DATA_DIR: dir() }).trustedOrigins).toEqual(expect.arrayContaining(["http://localhost:5173", "http://127.0.0.1:5173"]));
    const scripts = JSON.parse(readFileSync(new URL("../../package.json", import.meta.url), "utf8")).scripts as Record<string, string>;
    expect(scripts.dev).toMatch(/NODE_ENV=development tsx watch server\/index\.ts/);
    expect(scripts.start).toMatch(/NODE_ENV=production node/);
    expect(Object.entries(scripts).filter(([name, cmd]) => name !== "dev" && /NODE_ENV=development/.test(cmd))).toEqual([]);
  });

  it("refuses a short secret", () => {
    expect(() => loadEnv({ NODE_ENV: "production", DATA_DIR: dir(), BETTER_AUTH_SECRET: "short", BASE_URL: "https://t.example" })).toThrow(/at least 32/);
  });

  it("names a malformed variable", () => {
    expect(() => loadEnv({ PORT: "eighty", DATA_DIR: dir() })).toThrow(/PORT/);
  });

  it("keeps the demo secret in DATA_DIR across starts", () => {
    const d = dir();
    expect(loadEnv({ DATA_DIR: d }).secret).toBe(loadEnv({ DATA_DIR: d }).secret);
  });
});
