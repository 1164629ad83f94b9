/**
 * Piscina worker: reads the stored recording itself (so the main thread never holds the bytes)
 * and runs the pure analysis core. Errors cross the worker boundary as plain data.
 */
import { readFile } from "node:fs/promises";
import { AnalysisInputError, analyzeWav } from "../analysis/index";
import { measureReferenceTone, ReferenceToneRefused, type ReferenceToneMeasurement } from "../analysis/reference-tone";
import type { AnalysisResult } from "../../shared/schemas/analysis";

export interface AnalysisTask {
  path: string;
  plot?: boolean;
  /** Measure the file as a reference tone near this frequency (a recorder calibration) instead of as a strike. */
  referenceHz?: number;
}

export type AnalysisReply =
  | { ok: true; result: AnalysisResult }
  | { ok: true; reference: ReferenceToneMeasurement }
  | { ok: false; kind: "input"; code: AnalysisInputError["code"]; message: string }
  | { ok: false; kind: "refused"; code: ReferenceToneRefused["code"]; message: string }
  | { ok: false; kind: "internal"; message: string };

export default async function analyzeTask(task: AnalysisTask): Promise<AnalysisReply> {
  let bytes: Buffer;
  try {
    bytes = await readFile(task.path);
  } catch (err) {
    return { ok: false, kind: "internal", message: `The stored recording could not be read (${(err as Error).message}).` };
  }
  try {
    const view = new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    if (task.referenceHz !== undefined) return { ok: true, reference: measureReferenceTone(view, { expectedHz: task.referenceHz }) };
    const result = analyzeWav(view, { plot: task.plot });
    return { ok: true, result };
  } catch (err) {
    if (err instanceof AnalysisInputError) return { ok: false, kind: "input", code: err.code, message: err.message };
    if (err instanceof ReferenceToneRefused) return { ok: false, kind: "refused", code: err.code, message: err.message };
    return { ok: false, kind: "internal", message: `The analysis failed unexpectedly (${(err as Error)?.message ?? String(err)}).` };
  }
}
