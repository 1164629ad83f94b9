/**
 * API-test harness: the real app (createApp + bootstrap) on a fresh SQLite file in a temporary
 * folder, with the demo seeded, the real SMTP capture server and the real worker pool. Agents are
 * signed in once per user and reused (sign-in is rate limited, as in production).
 */
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import request from "supertest";
import { createApp } from "../../server/app.ts";
import { bootstrap, type Runtime } from "../../server/bootstrap.ts";
import { loadEnv } from "../../server/env.ts";
import { DEMO_PASSWORD } from "../../seeds/demo.ts";

export const ORIGIN = "http://tinelog.test";

export type Who = "anonymous" | "maker" | "qa" | "owner" | "other";
export const EMAILS: Record<Exclude<Who, "anonymous">, string> = {
  maker: "maker@example.com",
  qa: "qa@example.com",
  owner: "owner@example.com",
  other: "other@example.com",
};

export type TestApp = Awaited<ReturnType<typeof startTestApp>>;

export async function startTestApp(extraEnv: Record<string, string> = {}) {
  const dataDir = mkdtempSync(path.join(tmpdir(), "tinelog-test-"));
  const env = loadEnv({ NODE_ENV: "test", DATA_DIR: dataDir, BASE_URL: ORIGIN, LOG_LEVEL: "silent", SEED_DEMO: "1", DEMO_STRIKES: "0", ANALYSIS_THREADS: "1", ...extraEnv });
  const runtime: Runtime = await bootstrap(env);
  const app = createApp(runtime);
  const agents = new Map<Who, ReturnType<typeof request.agent>>();

  /** A supertest agent signed in as `who` (cookies kept), Origin set for better-auth's check. */
  async function as(who: Who) {
    const existing = agents.get(who);
    if (existing) return existing;
    const agent = request.agent(app);
    if (who !== "anonymous") {
      const res = await agent.post("/api/auth/sign-in/email").set("Origin", ORIGIN).send({ email: EMAILS[who], password: DEMO_PASSWORD });
      if (res.status !== 200) throw new Error(`sign-in as ${who} failed: ${res.status} ${JSON.stringify(res.body)}`);
    }
    agents.set(who, agent);
    return agent;
  }

  return {
    app,
    runtime,
    env,
    dataDir,
    as,
    async close() {
      await runtime.close();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}
