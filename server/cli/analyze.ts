/**
 * `npm run -s analyze -- [--json] [--plot] FILE...`
 * One file with --json: one JSON object on stdout; several: one object per line (the file name in
 * "file"). Without --json: a readable table. A file that cannot be analysed: one line on stderr
 * naming it and the reason, and exit code 1 (the other files are still analysed).
 */
import { readFileSync } from "node:fs";
import { basename } from "node:path";
import { AnalysisInputError, analyzeWav } from "../analysis/index";
import type { AnalysisResult } from "../../shared/schemas/analysis";

function usage(): never {
  process.stderr.write("Usage: npm run -s analyze -- [--json] [--plot] FILE.wav...\n");
  process.exit(2);
}

function reason(err: unknown): string {
  if (err instanceof AnalysisInputError) return err.message;
  const e = err as NodeJS.ErrnoException;
  if (e && e.code === "ENOENT") return "no such file";
  if (e && e.code === "EISDIR") return "is a directory, not a WAV file";
  if (e && e.code === "EACCES") return "permission denied";
  return `internal error while analysing (${e && e.message ? e.message.split("\n")[0] : String(err)})`;
}

function fmt(v: number, digits: number): string {
  return Number.isFinite(v) ? v.toFixed(digits) : "—";
}

function table(file: string, r: AnalysisResult): string {
  const lines: string[] = [];
  lines.push(`${file}: ${r.sampleRate} Hz, ${r.channels} ch, ${r.bitsPerSample}-bit ${r.encoding}, ${fmt(r.durationS, 2)} s`);
  for (const w of r.warnings) lines.push(`  warning (${w.code}): ${w.message}`);
  if (r.strikes.length === 0) lines.push("  no strikes found");
  r.strikes.forEach((s, i) => {
    lines.push(`  strike ${i + 1} at ${fmt(s.onsetS, 3)} s (noise floor ${fmt(s.noiseFloorDb, 1)} dBFS)`);
    if (s.partials.length === 0) {
      lines.push("    no partials");
      return;
    }
    lines.push("    frequency Hz        ± u Hz     level dBFS   tau s     ± u s     T60 s     Q          R²     beat Hz");
    for (const p of s.partials) {
      lines.push(
        "    " +
          [
            fmt(p.frequencyHz, 4).padStart(12),
            fmt(p.frequencyUncertaintyHz, 5).padStart(13),
            fmt(p.amplitudeDb, 1).padStart(10),
            fmt(p.tauS, 4).padStart(10),
            fmt(p.tauUncertaintyS, 4).padStart(9),
            fmt(p.t60S, 3).padStart(9),
            fmt(p.q, 0).padStart(10),
            fmt(p.fitR2, 3).padStart(6),
            (p.beatHz === null ? "—" : fmt(p.beatHz, 4)).padStart(9),
          ].join(" ") +
          (p.twoStage ? `  two-stage: early τ ${fmt(p.twoStage.earlyTauS, 3)} s, late τ ${fmt(p.twoStage.lateTauS, 3)} s, knee ${fmt(p.twoStage.kneeS, 2)} s` : "") +
          (typeof p.observedDecayDb === "number" ? `  decay seen ${fmt(p.observedDecayDb, 0)} dB` : "") +
          (p.tauUnreliable ? `  (τ unreliable: ${p.nonExponential ? "decay not exponential" : p.roomMasked ? "masked by the room" : p.earlyStageOverlap ? "early decay overlaps" : "record longer"})` : ""),
      );
    }
  });
  return lines.join("\n");
}

function main(): void {
  const args = process.argv.slice(2);
  const json = args.includes("--json");
  const plot = args.includes("--plot");
  const files = args.filter((a) => !a.startsWith("--"));
  if (args.some((a) => a.startsWith("--") && a !== "--json" && a !== "--plot")) usage();
  if (files.length === 0) usage();
  let failed = false;
  for (const file of files) {
    let result: AnalysisResult;
    try {
      const bytes = readFileSync(file);
      result = analyzeWav(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength), { plot });
    } catch (err) {
      failed = true;
      process.stderr.write(`${file}: ${reason(err).replace(/\s+/g, " ")}\n`);
      continue;
    }
    if (json) {
      const out = files.length > 1 ? { file: basename(file), ...result } : result;
      process.stdout.write(JSON.stringify(out) + "\n");
    } else {
      process.stdout.write(table(file, result) + "\n\n");
    }
  }
  process.exitCode = failed ? 1 : 0;
}

try {
  main();
} catch (err) {
  process.stderr.write(`analyze: ${reason(err)}\n`);
  process.exitCode = 1;
}
