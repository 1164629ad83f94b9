/**
 * Piscina worker: reads the stored recording itself (so the main thread never holds the bytes)
 * and runs the pure analysis core. Errors cross the worker boundary as plain data.
 */
import { readFile } from "node:fs/promises";
import { AnalysisInputError, analyzeWav } from "../analysis/index";
import type { AnalysisResult } from "../../shared/schemas/analysis";

export interface AnalysisTask {
  path: string;
  plot?: boolean;
}

export type AnalysisReply =
  | { ok: true; result: AnalysisResult }
  | { ok: false; kind: "input"; code: AnalysisInputError["code"]; message: string }
  | { ok: false; kind: "internal"; message: string };

export default async function analyzeTask(task: AnalysisTask): Promise<AnalysisReply> {
  let bytes: Buffer;
  try {
    bytes = await readFile(task.path);
  } catch (err) {
    return { ok: false, kind: "internal", message: `The stored recording could not be read (${(err as Error).message}).` };
  }
  try {
    const result = analyzeWav(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength), { plot: task.plot });
    return { ok: true, result };
  } catch (err) {
    if (err instanceof AnalysisInputError) return { ok: false, kind: "input", code: err.code, message: err.message };
    return { ok: false, kind: "internal", message: `The analysis failed unexpectedly (${(err as Error)?.message ?? String(err)}).` };
  }
}
