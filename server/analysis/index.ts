/**
 * Tinelog's strike analysis engine: a pure core (bytes in, numbers out; no fs, no Express, no DB).
 * shared/schemas/analysis.ts holds the result contract.
 */
import type { AnalysisResult } from "../../shared/schemas/analysis";
import { analyzeWavTimed } from "./analyze";

export { ANALYSER_VERSION, analyzeWavTimed, type AnalysisTimings } from "./analyze";
export { AnalysisInputError } from "./errors";
export { readWavHeader, type WavHeader } from "./wav";

/**
 * Analyses one WAV recording of one or more strikes: partials (Hz), decay (τ, T60 in s), Q,
 * doublets (beat Hz), two-stage decays, with standard uncertainties and plain-words warnings.
 * `plot: true` adds decimated spectrum and envelope series for the client.
 * Throws AnalysisInputError (with a message for the maker) when the file cannot be analysed.
 */
export function analyzeWav(bytes: Uint8Array, options?: { plot?: boolean }): AnalysisResult {
  return analyzeWavTimed(bytes, options ?? {});
}
