/**
 * Configuration, parsed once at start-up with zod, so no other module reads process.env. A wrong variable fails loudly with
 * a list of what is wrong; every variable has a safe default for the embedded demo.
 */
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { z } from "zod";

const boolish = z
  .enum(["0", "1", "true", "false"])
  .transform((v) => v === "1" || v === "true");

const envSchema = z.object({
  /** `npm run dev` sets development, the tests set test; anything else runs as production. */
  NODE_ENV: z.enum(["development", "production", "test"]).default("production"),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default("0.0.0.0"),
  DATA_DIR: z.string().default("./data"),
  DATABASE_FILE: z.string().optional(),
  BASE_URL: z.string().url().optional(),
  SMTP_URL: z.string().url().optional(),
  MAIL_FROM: z.string().default("Tinelog <no-reply@tinelog.invalid>"),
  BETTER_AUTH_SECRET: z.string().min(32, "must be at least 32 characters").optional(),
  SEED_DEMO: boolish.default(true),
  /** With the demo seed: synthesise and analyse the demo strikes (tests that need a quiet start set 0). */
  DEMO_STRIKES: boolish.default(true),
  LOG_LEVEL: z.enum(["fatal", "error", "warn", "info", "debug", "trace", "silent"]).default("info"),
  UPLOAD_LIMIT_MB: z.coerce.number().positive().default(100),
  WORKSHOP_QUOTA_MB: z.coerce.number().positive().default(2048),
  MIN_FREE_DISK_MB: z.coerce.number().nonnegative().default(200),
  ANALYSIS_THREADS: z.coerce.number().int().min(1).max(16).optional(),
  /** Strikes that may wait for analysis on the whole server, and per workshop (its share). */
  ANALYSIS_QUEUE: z.coerce.number().int().min(1).default(200),
  ANALYSIS_QUEUE_PER_WORKSHOP: z.coerce.number().int().min(1).default(50),
  REDIS_URL: z.string().url().optional(),
  TRUSTED_ORIGINS: z.string().optional(),
});

export type Env = z.infer<typeof envSchema> & {
  baseUrl: string;
  databaseFile: string;
  secret: string;
  trustedOrigins: string[];
};

export class ConfigError extends Error {
  constructor(public readonly problems: string[]) {
    super(`Tinelog cannot start; fix these settings:\n${problems.map((p) => `  - ${p}`).join("\n")}`);
    this.name = "ConfigError";
  }
}

/** True for an address only this machine can open (localhost, 127.0.0.0/8, ::1). */
export function isLoopbackUrl(url: string): boolean {
  const host = new URL(url).hostname;
  return host === "localhost" || host === "[::1]" || /^127(\.\d{1,3}){3}$/.test(host);
}

/** Reads the demo secret from DATA_DIR, creating it on first start (only for a server on a loopback address). */
function demoSecret(dataDir: string): string {
  const file = path.join(dataDir, "auth-secret");
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  const secret = randomBytes(32).toString("hex");
  writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}

export function loadEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    throw new ConfigError(parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`));
  }
  const e = parsed.data;
  const baseUrl = (e.BASE_URL ?? `http://localhost:${e.PORT}`).replace(/\/$/, "");
  // A production server others can reach (its BASE_URL is not a loopback address) must have a real
  // secret. `npm start` with no BASE_URL is the local demo: it runs as production, on localhost, with
  // the secret generated into DATA_DIR.
  const local = isLoopbackUrl(baseUrl);
  if (e.NODE_ENV === "production" && !e.BETTER_AUTH_SECRET && !local) {
    throw new ConfigError([`BETTER_AUTH_SECRET: required in production for ${baseUrl} (32+ random characters, e.g. \`openssl rand -hex 32\`); only a server on a loopback address (localhost) may use a generated one`]);
  }

  const dataDir = path.resolve(e.DATA_DIR);
  mkdirSync(dataDir, { recursive: true });
  const trustedOrigins = [baseUrl, ...(e.TRUSTED_ORIGINS?.split(",").map((s) => s.trim()).filter(Boolean) ?? [])];
  // The loopback spelling of a localhost base URL (a page opened at 127.0.0.1 instead).
  if (local) trustedOrigins.push(baseUrl.replace("localhost", "127.0.0.1"));
  // The Vite dev server's pages post to the API only under `npm run dev` (NODE_ENV=development).
  if (e.NODE_ENV === "development") trustedOrigins.push("http://localhost:5173", "http://127.0.0.1:5173");
  return {
    ...e,
    DATA_DIR: dataDir,
    baseUrl,
    databaseFile: path.resolve(e.DATABASE_FILE ?? path.join(dataDir, "tinelog.db")),
    secret: e.BETTER_AUTH_SECRET ?? demoSecret(dataDir),
    trustedOrigins: [...new Set(trustedOrigins)],
  };
}
