/**
 * A bounded pool of analysis workers (piscina), so an analysis never blocks the event loop.
 * When the queue is full, analyzeFile rejects at once with PoolBusyError (code "busy") instead of
 * queueing without limit.
 */
import { availableParallelism } from "node:os";
import { Piscina } from "piscina";
import { AnalysisInputError } from "../analysis/errors";
import { ReferenceToneRefused, type ReferenceToneMeasurement } from "../analysis/reference-tone";
import type { AnalysisResult } from "../../shared/schemas/analysis";
import type { AnalysisReply, AnalysisTask } from "./analysis-worker";

export class PoolBusyError extends Error {
  readonly code = "busy" as const;
  constructor(message = "The analysis queue is full. Try again in a minute.") {
    super(message);
    this.name = "PoolBusyError";
  }
}

export interface AnalysisPool {
  analyzeFile(path: string, opts?: { plot?: boolean }): Promise<AnalysisResult>;
  /** Measures a reference tone recording (a recorder calibration); rejects with ReferenceToneRefused or AnalysisInputError. */
  measureReferenceFile(path: string, expectedHz: number): Promise<ReferenceToneMeasurement>;
  close(): Promise<void>;
  readonly queued: number;
  readonly running: number;
}

/** Default threads: one fewer than the cores (the main thread serves HTTP), at least one. */
export function createAnalysisPool(opts: { maxThreads?: number; maxQueue?: number } = {}): AnalysisPool {
  const maxThreads = Math.max(1, opts.maxThreads ?? availableParallelism() - 1);
  const maxQueue = Math.max(0, opts.maxQueue ?? 64);
  const pool = new Piscina({
    filename: new URL("./analysis-worker.mjs", import.meta.url).href,
    minThreads: 0,
    maxThreads,
    // Bounded here by our own count so the "busy" answer is ours, with a clear message.
    maxQueue: maxQueue + maxThreads,
    idleTimeout: 30_000,
  });
  let inFlight = 0;
  let closed = false;
  async function run(task: AnalysisTask): Promise<Extract<AnalysisReply, { ok: true }>> {
    if (closed) throw new Error("The analysis pool is closed.");
    if (inFlight >= maxThreads + maxQueue) throw new PoolBusyError();
    inFlight++;
    try {
      const reply = (await pool.run(task)) as AnalysisReply;
      if (reply.ok) return reply;
      if (reply.kind === "input") throw new AnalysisInputError(reply.code, reply.message);
      if (reply.kind === "refused") throw new ReferenceToneRefused(reply.code, reply.message);
      throw new Error(reply.message);
    } finally {
      inFlight--;
    }
  }
  return {
    async analyzeFile(path: string, o?: { plot?: boolean }): Promise<AnalysisResult> {
      const reply = await run({ path, plot: o?.plot });
      if (!("result" in reply)) throw new Error("The analysis worker answered a strike with a reference measurement.");
      return reply.result;
    },
    async measureReferenceFile(path: string, expectedHz: number): Promise<ReferenceToneMeasurement> {
      const reply = await run({ path, referenceHz: expectedHz });
      if (!("reference" in reply)) throw new Error("The analysis worker answered a reference tone with a strike analysis.");
      return reply.reference;
    },
    async close(): Promise<void> {
      closed = true;
      await pool.destroy();
    },
    get queued() {
      return Math.max(0, inFlight - maxThreads);
    },
    get running() {
      return Math.min(inFlight, maxThreads);
    },
  };
}
