/**
 * Shared builders for the reference tests: synthetic strikes with analytic ground truth (fixed
 * seeds, from fixtures/synth.ts), external tools (Debian's sox), and small comparisons.
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { analysisResultSchema, type AnalysisResult, type Partial } from "../../shared/schemas/analysis";
import { analyzeWav } from "../../server/analysis/index";
import { synthWav, type SynthSpec, type WavWriteOptions } from "../../fixtures/synth";

export { synthWav, encodeWav, synthesize, mulberry32 } from "../../fixtures/synth";

/** Analyses and checks the result against the zod contract. */
export function analyze(bytes: Uint8Array, plot = false): AnalysisResult {
  const r = analyzeWav(bytes, { plot });
  return analysisResultSchema.parse(r);
}

export function analyzeSynth(spec: SynthSpec, opt: WavWriteOptions = { bits: 32, float: true }, plot = false) {
  const { bytes, noiseRms } = synthWav(spec, opt);
  return { result: analyze(bytes, plot), noiseRms, bytes };
}

export const cents = (f: number, ref: number) => 1200 * Math.log2(f / ref);

/** The reported partial nearest to `hz`. */
export function nearest(partials: Partial[], hz: number): Partial {
  let best = partials[0];
  for (const p of partials) if (Math.abs(p.frequencyHz - hz) < Math.abs(best.frequencyHz - hz)) best = p;
  if (!best) throw new Error(`no partials reported (looking for ${hz} Hz)`);
  return best;
}

/** Path of a Debian tool, or a clear failure naming the package to install. */
export function requireTool(cmd: string, pkg: string): string {
  try {
    execFileSync("which", [cmd], { stdio: "pipe" });
    return cmd;
  } catch {
    throw new Error(`These reference tests need Debian's ${pkg} package (${cmd}): apt-get install -y ${pkg}`);
  }
}

/** Runs sox with `args`, where the argument "OUT" names a temporary output file; returns its bytes. */
export function soxWrite(args: string[], name = "out.wav"): Uint8Array {
  requireTool("sox", "sox");
  const dir = mkdtempSync(join(tmpdir(), "tinelog-sox-"));
  try {
    const file = join(dir, name);
    execFileSync("sox", args.map((a) => (a === "OUT" ? file : a)), { stdio: "pipe" });
    return new Uint8Array(readFileSync(file));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
