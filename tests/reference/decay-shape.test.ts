/**
 * Decays that are not exponential. Every fit is checked against the isolated band's own envelope
 * (its level in dB over the same window); where the two part by more than the stated tolerance
 * (1.5 dB RMS), τ, T60 and Q are marked unreliable and a warning says why in words, instead of a
 * confident number. fitR2 is computed against that envelope, so it can fail.
 *
 * Each case is a 0.5-amplitude tone under an envelope a(t) written here, plus white noise 60 dB
 * below (50 dB for the short ones), 24-bit 48 kHz; the band-envelope check of the tests
 * (tests/reference/band-envelope.ts) shares no code with the engine.
 */
import { describe, expect, it } from "vitest";
import { LN_1000 } from "../../shared/physics";
import { analyze, encodeWav, mulberry32 } from "./helpers";
import { gaussian } from "../../fixtures/synth";
import { bandEnvelope, envelopeLine } from "./band-envelope";

const FS = 48000;

function tone(f: number, durationS: number, onsetS: number, env: (t: number) => number, snrDb = 60, seed = 1) {
  const n = Math.round(durationS * FS);
  const x = new Float64Array(n);
  const g = gaussian(mulberry32(seed));
  for (let i = Math.round(onsetS * FS); i < n; i++) {
    const t = i / FS - onsetS;
    x[i] = 0.5 * env(t) * Math.cos(2 * Math.PI * f * t + 0.3);
  }
  const noise = (0.5 / Math.SQRT2) * 10 ** (-snrDb / 20);
  for (let i = 0; i < n; i++) x[i] += noise * g();
  return { x, result: analyze(encodeWav([x], FS, { bits: 24 })) };
}

const T = 3;
const fades: Array<[string, (t: number) => number]> = [
  ["linear fade to nothing in 3 s", (t) => Math.max(0, 1 - t / T)],
  ["quarter-sine fade", (t) => (t < T ? Math.cos((Math.PI * t) / (2 * T)) : 0)],
  ["inverted-parabola fade", (t) => Math.max(0, 1 - (t / T) ** 2)],
  ["half-sine (raised-cosine) fade", (t) => (t < T ? 0.5 + 0.5 * Math.cos((Math.PI * t) / T) : 0)],
  ["held flat for 1 s, then decaying with τ 0.5 s", (t) => (t < 1 ? 1 : Math.exp(-(t - 1) / 0.5))],
];

describe("fades and held tones: marked unreliable, never a confident τ", () => {
  it.each(fades)("%s", (_name, env) => {
    const { result } = tone(440, 4, 0.3, env);
    const ps = result.strikes[0].partials;
    expect(ps).toHaveLength(1);
    const p = ps[0];
    expect(p.nonExponential).toBe(true);
    expect(p.tauUnreliable).toBe(true);
    // The figure that can fail: the model's envelope against the band's, well under a real decay's ≈ 1.
    expect(p.fitR2).toBeLessThan(0.9);
    expect(p.envelopeDeviationDb!).toBeGreaterThan(1.5);
    // No "beat" out of two cancelling modes drawing the fade (before: a 0.02 Hz beat, τ 225 s, +8 dBFS).
    expect(p.beatHz).toBeNull();
    expect(p.amplitudeDb).toBeLessThan(3);
    expect(p.tauModelUncertaintyS!).toBeGreaterThan(0.1 * p.tauS);
    const w = result.warnings.find((x) => x.code === "not_exponential");
    expect(w?.message).toMatch(/^The decay of the partial at 440\.0 Hz is not exponential/);
    expect(w?.message).toMatch(/record the strike again/);
  });

  it("the linear fade the sox way (`synth 4 sine 440 fade t 0 4 3.9`) is marked too", async () => {
    const { soxWrite } = await import("./helpers");
    const r = analyze(soxWrite(["-n", "-r", "48000", "-b", "24", "OUT", "synth", "4", "sine", "440", "fade", "t", "0", "4", "3.9"]));
    const p = r.strikes[0].partials[0];
    expect(p.tauUnreliable).toBe(true);
    expect(p.nonExponential).toBe(true);
    expect(p.beatHz).toBeNull();
    expect(r.warnings.map((x) => x.code)).toContain("not_exponential");
  });
});

describe("a strike damped by a finger for its first part, then released", () => {
  // A fast decay and then a slow one, continuous in level: two-stage (with the late τ the
  // released unit's) or flagged; never one confident τ that mixes the two.
  it.each([
    [880, 0.08, 0.4, 2.0],
    [600, 0.15, 0.8, 1.5],
  ])("%s Hz: τ %s s for the first %s s, then τ %s s", (f, tauEarly, releaseS, tauLate) => {
    const { result } = tone(f, 4, 0.3, (t) => (t < releaseS ? Math.exp(-t / tauEarly) : Math.exp(-releaseS / tauEarly) * Math.exp(-(t - releaseS) / tauLate)));
    const p = result.strikes[0].partials[0];
    if (p.twoStage) {
      expect(Math.abs(p.tauS / tauLate - 1)).toBeLessThan(0.05);
      expect(p.twoStage.earlyTauS).toBeLessThan(0.5 * tauLate);
    } else {
      expect(p.tauUnreliable).toBe(true);
    }
  });
});

describe("a short, fast-decaying strike (Q below 100)", () => {
  it("800 Hz, τ 0.03 s (Q ≈ 75), 0.5 s recorded: one mode, no doublet, τ as the band's envelope shows", () => {
    const { x, result } = tone(800, 0.5, 0.05, (t) => Math.exp(-t / 0.03), 50);
    const ps = result.strikes[0].partials;
    expect(ps).toHaveLength(1);
    const p = ps[0];
    expect(p.beatHz).toBeNull();
    expect(p.q).toBeLessThan(100);
    const line = envelopeLine(bandEnvelope(x, FS, p.frequencyHz, 60, 0.002), p.fitStartS, p.fitEndS);
    expect(line.r2).toBeGreaterThan(0.99);
    expect(Math.abs(p.tauS / line.tauS - 1)).toBeLessThan(0.1);
    expect(Math.abs(p.tauS / 0.03 - 1)).toBeLessThan(0.05);
  });
});

describe("an exponential decay is not marked, and its observed decay is reported", () => {
  it("440 Hz, τ 0.7 s, 3.7 s after the strike", () => {
    const { result } = tone(440, 4, 0.3, (t) => Math.exp(-t / 0.7));
    const p = result.strikes[0].partials[0];
    expect(p.nonExponential).toBe(false);
    expect(p.tauUnreliable).toBe(false);
    expect(p.fitR2).toBeGreaterThan(0.99);
    expect(p.envelopeDeviationDb!).toBeLessThan(0.5);
    expect(Math.abs(p.tauS / 0.7 - 1)).toBeLessThan(0.01);
    // The decay seen over the fit window: 20·log10(e)·(window)/τ, less the tenths the check averages.
    const expectedDb = ((20 / Math.LN10) * (p.fitEndS - p.fitStartS) * 0.9) / 0.7;
    expect(Math.abs(p.observedDecayDb! - expectedDb)).toBeLessThan(3);
    // T60 is 60 dB, so it is extrapolated beyond what was seen whenever observedDecayDb < 60.
    expect(p.t60S).toBeCloseTo(p.tauS * LN_1000, 9);
  });
});
