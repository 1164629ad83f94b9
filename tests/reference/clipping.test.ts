/**
 * Clipping below full scale: a recorder whose analogue stage clipped, or a file normalised after
 * clipping, has flat tops at its own extremes, not at digital full scale. The strikes here are
 * clipped at fractions of their peak and then scaled to levels below full scale, as a normalising
 * editor would; the warning must say so and what to do, and the analysis starts after the clipping.
 */
import { describe, expect, it } from "vitest";
import { analyze, cents, encodeWav, soxWrite, synthesize } from "./helpers";

const FS = 48000;
const modes = [
  { frequencyHz: 523.25, amplitude: 0.5, tauS: 0.9 },
  { frequencyHz: 1442.6, amplitude: 0.15, tauS: 0.4, phaseRad: 1 },
];

function clipped(fraction: number, levelDb: number, bits: 16 | 24, noiseAfterDb?: number) {
  const x = synthesize({ sampleRate: FS, durationS: 3, seed: 5, snrDb: 50, strikes: [{ onsetS: 0.2, modes, click: 0.1 }] }).samples;
  let peak = 0;
  for (const v of x) peak = Math.max(peak, Math.abs(v));
  const c = fraction * peak;
  const g = 10 ** (levelDb / 20) / c;
  for (let i = 0; i < x.length; i++) x[i] = Math.max(-c, Math.min(c, x[i])) * g;
  if (noiseAfterDb !== undefined) {
    // An analogue stage: the converter's own noise lands on the flat tops after the clip.
    let s = 12345;
    const rms = 10 ** (levelDb / 20) * 10 ** (noiseAfterDb / 20);
    for (let i = 0; i < x.length; i++) {
      s = (s * 1103515245 + 12345) % 2147483648;
      x[i] += rms * Math.sqrt(3) * (2 * (s / 2147483648) - 1);
    }
  }
  return analyze(encodeWav([x], FS, { bits }));
}

describe("flat tops below full scale", () => {
  const cases: Array<[number, number, 16 | 24]> = [];
  for (const fraction of [0.3, 0.5, 0.7, 0.9]) for (const levelDb of [-1, -6, -12]) for (const bits of [16, 24] as const) cases.push([fraction, levelDb, bits]);
  it.each(cases)("clipped at %s of its peak, then scaled to %s dBFS, %s-bit: warned, analysed after the clipping, no clipping products", (fraction, levelDb, bits) => {
    const r = clipped(fraction, levelDb, bits);
    const w = r.warnings.find((x) => x.code === "flat_topped");
    expect(w).toBeDefined();
    expect(w!.message).toContain(`${levelDb.toFixed(1)} dBFS`);
    expect(w!.message).toMatch(/Turn the input gain or the microphone's sensitivity down/);
    expect(r.warnings.map((x) => x.code)).not.toContain("clipped");
    const ps = r.strikes[0].partials;
    // Only the two partials: the clipping's harmonics and intermodulation products are not reported.
    expect(ps.map((p) => Math.round(p.frequencyHz))).toEqual([523, 1443]);
    for (const p of ps) expect(Math.abs(cents(p.frequencyHz, modes.find((m) => Math.abs(m.frequencyHz - p.frequencyHz) < 2)!.frequencyHz))).toBeLessThan(0.05);
    // Every fit starts after the last flat top the warning names.
    const last = Number(/the last at ([\d.]+) s/.exec(w!.message)![1]);
    expect(last).toBeGreaterThan(0.2);
    for (const p of ps) expect(p.fitStartS).toBeGreaterThan(last);
  });

  it("an analogue clip with the converter's noise on the flat tops (noise 60 dB under the level) is warned too", () => {
    const r = clipped(0.6, -3, 24, -60);
    expect(r.warnings.map((x) => x.code)).toContain("flat_topped");
  });

  it("unclipped strikes and steady tones at any level are not warned", () => {
    expect(clipped(1.0, -1, 16).warnings.map((x) => x.code)).not.toContain("flat_topped");
    expect(clipped(1.0, -20, 24).warnings.map((x) => x.code)).not.toContain("flat_topped");
    // Steady sines written by sox: a sine's samples do not pile up at its peak (their density near
    // a peak A goes as 1/√(A² − x²)), even at 50 Hz where consecutive samples near the top differ little.
    for (const hz of ["50", "100", "440", "5000"]) for (const gain of ["-1", "-30"]) {
      const r = analyze(soxWrite(["-n", "-r", "48000", "-b", "16", "OUT", "synth", "3", "sine", hz, "gain", gain]));
      expect(r.warnings.map((x) => x.code), `${hz} Hz at ${gain} dB`).not.toContain("flat_topped");
    }
  });
});
