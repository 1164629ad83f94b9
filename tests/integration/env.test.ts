/** Configuration: parsed once with zod; production refuses to start without a real secret. */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { ConfigError, loadEnv } from "../../server/env.ts";

const dir = () => mkdtempSync(path.join(tmpdir(), "tinelog-env-"));

describe("environment", () => {
  it("refuses a production start without BETTER_AUTH_SECRET and BASE_URL, naming both", () => {
    try {
      loadEnv({ NODE_ENV: "production", DATA_DIR: dir() });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(ConfigError);
      expect((error as ConfigError).problems.join("\n")).toMatch(/BETTER_AUTH_SECRET[\s\S]*BASE_URL/);
    }
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
