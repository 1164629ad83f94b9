/**
 * The scale-out path: with REDIS_URL, a strike's analysis goes through BullMQ on a real Redis
 * (Debian's redis-server on 127.0.0.1, started here) and lands in the ledger like the embedded queue's.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { batch, unit } from "../../server/db/schema.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";
import { freePort } from "../support/server-process.ts";
import { forkWav } from "../support/wav.ts";

let redis: ChildProcess;
let t: TestApp;
let port = 0;

beforeAll(async () => {
  if (spawnSync("redis-server", ["--version"]).error) throw new Error("redis-server is missing: apt-get install -y redis-server (.ci/run installs it)");
  port = await freePort();
  const dir = mkdtempSync(path.join(tmpdir(), "tinelog-redis-"));
  redis = spawn("redis-server", ["--port", String(port), "--bind", "127.0.0.1", "--save", "", "--appendonly", "no", "--dir", dir], { stdio: "ignore" });
  for (let i = 0; i < 100; i++) {
    if (spawnSync("redis-cli", ["-p", String(port), "ping"], { encoding: "utf8" }).stdout?.trim() === "PONG") break;
    await new Promise((r) => setTimeout(r, 100));
  }
  t = await startTestApp({ DEMO_STRIKES: "0", REDIS_URL: `redis://127.0.0.1:${port}` });
});

afterAll(async () => {
  await t?.close();
  redis?.kill("SIGTERM");
});

describe("BullMQ queue on Redis", () => {
  it("runs an uploaded strike through Redis to a finished evaluation", async () => {
    const { db } = t.runtime;
    const open = db.select().from(batch).where(eq(batch.code, "BTW-2612")).get()!;
    const u = db.select().from(unit).where(eq(unit.batchId, open.id)).all()[0];
    const res = await (await t.as("maker")).post(`/api/units/${u.id}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(forkWav({ frequencyHz: 440, seed: 3 })), "redis.wav");
    expect(res.status).toBe(202);
    await t.runtime.queue.drained();
    const unitView = (await (await t.as("maker")).get(`/api/units/${u.id}`)).body;
    expect(unitView.strikes[0].state).toBe("done");
    expect(unitView.evaluation.verdict).toBe("within_tolerance");
    const q = (t.runtime.queue as unknown as { queue: import("bullmq").Queue }).queue;
    const job = await q.getJob(res.body.id);
    expect(job?.returnvalue).toBe("done");
  });
});
