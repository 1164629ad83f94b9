/**
 * The scale-out runner: with REDIS_URL set, strikes become BullMQ jobs on Redis, so several analysis
 * worker processes share the work. SQLite stays the source of truth for a strike's state (the job
 * only carries its id), so the guarantees of the embedded queue hold: a lost job is re-added from
 * the table on start, and a strike is recorded once however often its job runs.
 *
 * A job is a turn, not an order: the worker that takes it claims the next strike round-robin across
 * workshops (claimNext), which may be another job's strike; that job later takes the turn left over.
 * There is one job per queued strike, so every strike gets its turn, and the order stays fair.
 */
import { Queue, Worker } from "bullmq";
import { Redis } from "ioredis";
import { eq, inArray } from "drizzle-orm";
import type { Db, Sqlite } from "../db/client.ts";
import { strike } from "../db/schema.ts";
import type { Logger } from "../logger.ts";
import type { AnalysisPool } from "../workers/analysis-pool.ts";
import { claimNext, requeueInterrupted, runStrike, type AnalysisQueue } from "./analysis-queue.ts";
import type { Storage } from "./storage.ts";

export const QUEUE_NAME = "tinelog-analysis";

export function createRedisQueue(deps: { db: Db; sqlite: Sqlite; storage: Storage; logger: Logger; pool: AnalysisPool; redisUrl: string; concurrency: number }): AnalysisQueue & { queue: Queue } {
  const { db, logger, pool } = deps;
  // BullMQ's blocking commands need maxRetriesPerRequest: null (its documented requirement).
  const connection = new Redis(deps.redisUrl, { maxRetriesPerRequest: null });
  const queue = new Queue(QUEUE_NAME, { connection, defaultJobOptions: { attempts: 5, backoff: { type: "exponential", delay: 500 }, removeOnComplete: 1000, removeOnFail: 1000 } });

  const worker = new Worker<{ strikeId: string }>(
    QUEUE_NAME,
    async () => {
      const strikeId = claimNext(deps.sqlite);
      if (!strikeId) return "nothing waiting";
      const outcome = await runStrike(deps, strikeId, (_id, file) => pool.analyzeFile(file, { plot: true }));
      if (outcome === "retry") {
        db.update(strike).set({ state: "queued" }).where(eq(strike.id, strikeId)).run();
        throw new Error("analysis pool busy or failed; BullMQ retries with back-off");
      }
      return outcome;
    },
    { connection: connection.duplicate(), concurrency: deps.concurrency },
  );
  worker.on("failed", (job, err) => logger.warn({ strikeId: job?.data.strikeId, err: err.message }, "analysis job failed"));

  /** Adds a job for every queued strike; the strike id is the job id, so BullMQ never holds two. */
  async function enqueueWaiting() {
    const ids = db.select({ id: strike.id }).from(strike).where(eq(strike.state, "queued")).all();
    if (ids.length) await queue.addBulk(ids.map(({ id }) => ({ name: "analyse", data: { strikeId: id }, opts: { jobId: id } })));
  }

  const resumed = requeueInterrupted(db);
  if (resumed) logger.info({ resumed }, "re-queued strikes interrupted by a restart");
  void enqueueWaiting().catch((err) => logger.error({ err }, "could not enqueue waiting strikes"));

  const pending = () => db.select({ id: strike.id }).from(strike).where(inArray(strike.state, ["queued", "analysing"])).limit(1).get();
  return {
    queue,
    notify() {
      void enqueueWaiting().catch((err) => logger.error({ err }, "could not enqueue a strike"));
    },
    async drained() {
      while (pending()) await new Promise((r) => setTimeout(r, 100));
    },
    async close() {
      await worker.close();
      await queue.close();
      await pool.close();
      connection.disconnect();
    },
  };
}
