/**
 * The durable analysis queue. A strike's state lives in SQLite (queued → analysing → done | failed),
 * so the queue is the table: on start, strikes left analysing by a crash go back to queued and
 * everything queued is picked up again. The embedded runner analyses in the worker pool of this
 * process; with REDIS_URL the same jobs go through BullMQ (server/services/redis-queue.ts).
 *
 * Fair to every workshop on the server: each has its own share of waiting places (a per-workshop
 * limit beside the server's total, checked in the same synchronous step as the insert, so it is
 * exact however many uploads arrive at once), and the next strike to analyse is chosen round-robin
 * across workshops (claimNext), so one workshop's flood never holds another's upload behind it.
 */
import { and, count, eq, inArray } from "drizzle-orm";
import type { Db, Sqlite } from "../db/client.ts";
import { strike } from "../db/schema.ts";
import { HttpError } from "../http-error.ts";
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

/** How many strikes may wait (queued or analysing): on the whole server, and per workshop. */
export type QueueLimits = { total: number; perWorkshop: number };

/**
 * Refuses a new strike (503) when its workshop's share or the server's total is taken. Call it in the
 * same synchronous step (or transaction) as the insert: nothing can slip in between the count and the row.
 */
export function assertQueueRoom(db: Pick<Db, "select">, workshopId: string, limits: QueueLimits): void {
  const waiting = inArray(strike.state, ["queued", "analysing"]);
  const [{ mine }] = db.select({ mine: count() }).from(strike).where(and(waiting, eq(strike.workshopId, workshopId))).all();
  if (mine >= limits.perWorkshop) {
    throw new HttpError(503, "busy", `Your workshop already has ${mine} recordings waiting for analysis, its full share of the queue. Nothing was stored; upload again when some are done (usually a minute or two).`);
  }
  const [{ all }] = db.select({ all: count() }).from(strike).where(waiting).all();
  if (all >= limits.total) {
    throw new HttpError(503, "busy", `The analysis queue is full (${all} recordings waiting). Nothing was stored; upload again in a minute.`);
  }
}

/**
 * Claims the next strike to analyse, round-robin across workshops, in one statement (atomic also
 * between processes): each queued strike's place is its workshop's strikes already analysing plus its
 * rank in its workshop's queue; the lowest place goes first, the older upload on a tie. Two workshops
 * with ten strikes each alternate; a workshop with one strike waits for at most one of the other's.
 * Marks the strike analysing and counts the attempt.
 */
export function claimNext(sqlite: Sqlite): string | null {
  // Column names as in drizzle/ (strike.uploadedAt is the created_at column).
  const row = sqlite
    .prepare(
      `UPDATE strike SET state = 'analysing', started_at = ?, attempts = attempts + 1
       WHERE state = 'queued' AND id = (
         SELECT id FROM (
           SELECT s.id, s.created_at AS uploaded_at,
             ROW_NUMBER() OVER (PARTITION BY s.workshop_id ORDER BY s.created_at, s.id)
               + (SELECT count(*) FROM strike a WHERE a.state = 'analysing' AND a.workshop_id = s.workshop_id) AS place
           FROM strike s WHERE s.state = 'queued'
         ) ORDER BY place, uploaded_at, id LIMIT 1
       )
       RETURNING id`,
    )
    .get(Date.now()) as { id: string } | undefined;
  return row?.id ?? null;
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
      const id = claimNext(deps.sqlite);
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
