/**
 * The durable analysis queue. A strike's state lives in SQLite (queued → analysing → done | failed),
 * so the queue is the table: on start, strikes left analysing by a crash go back to queued and
 * everything queued is picked up again. The embedded runner analyses in the worker pool of this
 * process; with REDIS_URL the same jobs go through BullMQ (server/services/redis-queue.ts).
 */
import { and, asc, eq, inArray } from "drizzle-orm";
import type { Db, Sqlite } from "../db/client.ts";
import { strike } from "../db/schema.ts";
import type { Logger } from "../logger.ts";
import { AnalysisInputError } from "../analysis/errors.ts";
import { PoolBusyError, type AnalysisPool } from "../workers/analysis-pool.ts";
import type { Storage } from "./storage.ts";
import { markFailed, recordAnalysis } from "./strikes.ts";

/** What the rest of the server needs of a queue, whichever runs it. */
export interface AnalysisQueue {
  /** Tells the runner there is new work (the row is already queued in SQLite). */
  notify(): void;
  /** Resolves when nothing is queued or analysing (tests and shutdown). */
  drained(): Promise<void>;
  close(): Promise<void>;
}

const MAX_ATTEMPTS = 3;

export type AnalyseFn = (strikeId: string, path: string) => Promise<import("../../shared/schemas/analysis.ts").AnalysisResult>;

/** Runs one claimed strike through `analyse` and records the outcome. Shared by both runners. */
export async function runStrike(deps: { db: Db; sqlite: Sqlite; storage: Storage; logger: Logger }, strikeId: string, analyse: AnalyseFn): Promise<"done" | "failed" | "retry"> {
  const { db, sqlite, storage, logger } = deps;
  const row = db.select().from(strike).where(eq(strike.id, strikeId)).get();
  if (!row || row.state === "done" || row.state === "failed") return "done";
  try {
    const result = await analyse(strikeId, storage.pathOf(row.fileKey));
    recordAnalysis(db, sqlite, strikeId, result);
    return "done";
  } catch (error) {
    if (error instanceof PoolBusyError) return "retry";
    if (error instanceof AnalysisInputError) {
      markFailed(db, strikeId, error.code, error.message);
      return "failed";
    }
    logger.error({ err: error, strikeId }, "analysis failed unexpectedly");
    if (row.attempts >= MAX_ATTEMPTS) {
      markFailed(db, strikeId, "internal", "The analysis stopped on an internal error three times. The recording is kept; tell the workshop owner.");
      return "failed";
    }
    return "retry";
  }
}

/** Claims the next queued strike (marks it analysing, counts the attempt). */
function claim(db: Db, exclude: Set<string>): string | null {
  return db.transaction((tx) => {
    const next = tx.select({ id: strike.id, attempts: strike.attempts }).from(strike).where(eq(strike.state, "queued")).orderBy(asc(strike.uploadedAt), asc(strike.id)).limit(exclude.size + 1).all().find((r) => !exclude.has(r.id));
    if (!next) return null;
    tx.update(strike).set({ state: "analysing", startedAt: new Date(), attempts: next.attempts + 1 }).where(and(eq(strike.id, next.id), eq(strike.state, "queued"))).run();
    return next.id;
  });
}

/** Strikes a crash left in `analysing` go back to the queue. */
export function requeueInterrupted(db: Db): number {
  return db.update(strike).set({ state: "queued" }).where(eq(strike.state, "analysing")).run().changes;
}

export function createInProcessQueue(deps: { db: Db; sqlite: Sqlite; storage: Storage; logger: Logger; pool: AnalysisPool; concurrency: number }): AnalysisQueue {
  const { db, pool, logger } = deps;
  const running = new Set<string>();
  let closed = false;
  let waiters: (() => void)[] = [];
  let retryTimer: NodeJS.Timeout | null = null;

  const resumed = requeueInterrupted(db);
  if (resumed) logger.info({ resumed }, "re-queued strikes interrupted by a restart");

  const pending = () => db.select({ id: strike.id }).from(strike).where(inArray(strike.state, ["queued", "analysing"])).limit(1).get();

  function settle() {
    if (running.size === 0 && !pending()) {
      const w = waiters;
      waiters = [];
      w.forEach((f) => f());
    }
  }

  function pump() {
    while (!closed && running.size < deps.concurrency) {
      const id = claim(db, running);
      if (!id) break;
      running.add(id);
      runStrike(deps, id, (_sid, path) => pool.analyzeFile(path, { plot: true }))
        .then((outcome) => {
          if (outcome === "retry") {
            db.update(strike).set({ state: "queued" }).where(eq(strike.id, id)).run();
            retryTimer ??= setTimeout(() => { retryTimer = null; pump(); }, 500);
          }
        })
        .catch((error) => logger.error({ err: error, strikeId: id }, "could not record analysis"))
        .finally(() => {
          running.delete(id);
          pump();
          settle();
        });
    }
    settle();
  }

  setImmediate(pump);
  return {
    notify: () => setImmediate(pump),
    drained: () => new Promise<void>((resolve) => { waiters.push(resolve); settle(); }),
    async close() {
      if (closed) return;
      closed = true;
      if (retryTimer) clearTimeout(retryTimer);
      await pool.close();
    },
  };
}
