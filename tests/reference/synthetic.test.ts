/**
 * Synthetic strikes with analytic ground truth: x(t) = Σ Aₖ·e^(−t/τₖ)·cos(2πfₖt + φₖ) plus white
 * Gaussian noise at a stated SNR (power over the first 100 ms), fixed seeds (fixtures/synth.ts).
 * The reported uncertainties are Cramér–Rao bounds at the fitted SNR (Yao & Pandit, IEEE Trans. SP
 * 43(4), 1995; Kay, Estimation Theory, 1993, §3.9): the errors must be consistent with them.
 */
import { describe, expect, it } from "vitest";
import { analyzeSynth, cents, nearest } from "./helpers";
import { LN_1000 } from "../../shared/physics";

const FS = 48000;

describe("isolated partials (analytic ground truth)", () => {
  it("SNR 40 dB: frequency within 0.01 cent, τ within 1 %, errors within 4 standard uncertainties", () => {
    const truth = [
      { frequencyHz: 523.251, amplitude: 0.4, tauS: 0.8 },
      { frequencyHz: 1442.7, amplitude: 0.1, tauS: 0.35 },
    ];
    const { result } = analyzeSynth({ sampleRate: FS, durationS: 3, seed: 11, snrDb: 40, strikes: [{ onsetS: 0.15, modes: truth, click: 0.1 }] });
    expect(result.strikes).toHaveLength(1);
    const ps = result.strikes[0].partials;
    expect(ps).toHaveLength(2);
    for (const t of truth) {
      const p = nearest(ps, t.frequencyHz);
      expect(Math.abs(cents(p.frequencyHz, t.frequencyHz))).toBeLessThan(0.01);
      expect(Math.abs(p.tauS / t.tauS - 1)).toBeLessThan(0.01);
      expect(Math.abs(p.frequencyHz - t.frequencyHz)).toBeLessThan(4 * p.frequencyUncertaintyHz);
      expect(Math.abs(p.tauS - t.tauS)).toBeLessThan(4 * p.tauUncertaintyS);
      // T60 = τ·ln 1000 and Q = π·f·τ (amplitude decays as e^(−t/τ); 60 dB is a factor 1000).
      expect(p.t60S).toBeCloseTo(p.tauS * LN_1000, 9);
      expect(p.q).toBeCloseTo(Math.PI * p.frequencyHz * p.tauS, 6);
      // amplitudeDb applies at amplitudeAtS: A·e^(−(t − onset)/τ) there.
      const at = p.amplitudeAtS! - 0.15;
      expect(Math.abs(p.amplitudeDb - 20 * Math.log10(t.amplitude * Math.exp(-at / t.tauS)))).toBeLessThan(0.1);
      expect(p.beatHz).toBeNull();
      expect(p.tauUnreliable).toBe(false);
      expect(p.fitR2).toBeGreaterThan(0.99);
    }
    expect(result.strikes[0].onsetS).toBeCloseTo(0.15, 2);
  });

  it("SNR 20 dB: frequency within 0.2 cent, τ within 5 %", () => {
    const t = { frequencyHz: 880, amplitude: 0.3, tauS: 0.6 };
    const { result } = analyzeSynth({ sampleRate: 44100, durationS: 2.5, seed: 12, snrDb: 20, strikes: [{ onsetS: 0.1, modes: [t] }] });
    const p = nearest(result.strikes[0].partials, t.frequencyHz);
    expect(Math.abs(cents(p.frequencyHz, t.frequencyHz))).toBeLessThan(0.2);
    expect(Math.abs(p.tauS / t.tauS - 1)).toBeLessThan(0.05);
  });

  it("the uncertainties are honest: normalised errors over 12 seeds have an RMS near 1", () => {
    const zf: number[] = [];
    const zt: number[] = [];
    for (let seed = 100; seed < 112; seed++) {
      const t = { frequencyHz: 700, amplitude: 0.3, tauS: 0.5 };
      const { result } = analyzeSynth({ sampleRate: FS, durationS: 2, seed, snrDb: 25, strikes: [{ onsetS: 0.1, modes: [t] }] });
      const p = nearest(result.strikes[0].partials, t.frequencyHz);
      zf.push((p.frequencyHz - t.frequencyHz) / p.frequencyUncertaintyHz);
      zt.push((p.tauS - t.tauS) / p.tauUncertaintyS);
    }
    const rms = (a: number[]) => Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length);
    // With 12 draws the RMS of a standard normal lies in 0.6…1.4 with > 95 % probability.
    expect(rms(zf)).toBeGreaterThan(0.5);
    expect(rms(zf)).toBeLessThan(1.6);
    expect(rms(zt)).toBeGreaterThan(0.5);
    expect(rms(zt)).toBeLessThan(1.6);
  });
});

describe("doublets and two-stage decays", () => {
  const T = 4;
  // At 0.15/T the two modes are nearly coherent and the Cramér–Rao bound of the beat grows as
  // 1/Δf: at 40 dB it is ≈ 16 % of the beat (no estimator can do better), so that case runs at 60 dB.
  it.each([
    ["0.15/T", 0.15 / T, 60],
    ["1/T", 1 / T, 40],
    ["3 Hz (resolved by the FFT)", 3, 40],
  ])("a doublet %s apart: both modes, f within 0.05 cent, beat within 5 %, τ within 3 %", (_label, df, snrDb) => {
    const a = { frequencyHz: 600, amplitude: 0.3, tauS: 1.0 };
    const b = { frequencyHz: 600 + df, amplitude: 0.25, tauS: 0.9, phaseRad: 1 };
    const { result } = analyzeSynth({ sampleRate: FS, durationS: T, seed: 3, snrDb, strikes: [{ onsetS: 0.2, modes: [a, b] }] });
    const ps = result.strikes[0].partials;
    expect(ps).toHaveLength(1);
    const p = ps[0];
    expect(p.beatHz).not.toBeNull();
    const uBeat = Math.hypot(p.modes![0].frequencyUncertaintyHz, p.modes![1].frequencyUncertaintyHz);
    expect(Math.abs(p.beatHz! - df)).toBeLessThan(4 * uBeat);
    expect(Math.abs(p.beatHz! / df - 1)).toBeLessThan(0.05);
    expect(p.modes).toHaveLength(2);
    const [lo, hi] = p.modes!;
    expect(Math.abs(cents(lo.frequencyHz, a.frequencyHz))).toBeLessThan(0.05);
    expect(Math.abs(cents(hi.frequencyHz, b.frequencyHz))).toBeLessThan(0.05);
    expect(Math.abs(lo.tauS / a.tauS - 1)).toBeLessThan(0.03);
    expect(Math.abs(hi.tauS / b.tauS - 1)).toBeLessThan(0.03);
  });

  it("a two-stage decay (same frequency, τ 0.1 s then 1.5 s) is reported with its knee", () => {
    const early = { frequencyHz: 800, amplitude: 0.3, tauS: 0.1 };
    const late = { frequencyHz: 800, amplitude: 0.05, tauS: 1.5 };
    const { result } = analyzeSynth({ sampleRate: FS, durationS: 4, seed: 5, snrDb: 40, strikes: [{ onsetS: 0.2, modes: [early, late] }] });
    const ps = result.strikes[0].partials;
    expect(ps).toHaveLength(1);
    const p = ps[0];
    expect(p.beatHz).toBeNull();
    expect(p.twoStage).toBeTruthy();
    expect(Math.abs(p.twoStage!.earlyTauS / 0.1 - 1)).toBeLessThan(0.03);
    expect(Math.abs(p.twoStage!.lateTauS / 1.5 - 1)).toBeLessThan(0.03);
    // Knee where the two contributions are equal: t = ln(A₁/A₂)/(1/τ₁ − 1/τ₂) after the onset.
    const knee = 0.2 + Math.log(0.3 / 0.05) / (1 / 0.1 - 1 / 1.5);
    expect(p.twoStage!.kneeS).toBeCloseTo(knee, 2);
    expect(p.tauS).toBeCloseTo(p.twoStage!.lateTauS, 9);
    expect(Math.abs(cents(p.frequencyHz, 800))).toBeLessThan(0.05);
  });
});

describe("strikes, hum and spurious partials", () => {
  it("segments three strikes in one file and measures each", () => {
    const modes = [{ frequencyHz: 440, amplitude: 0.3, tauS: 0.4 }, { frequencyHz: 2757.3, amplitude: 0.05, tauS: 0.15 }];
    const onsets = [0.2, 2.0, 3.9];
    const { result } = analyzeSynth({ sampleRate: FS, durationS: 5.5, seed: 21, snrDb: 45, strikes: onsets.map((onsetS) => ({ onsetS, modes, click: 0.2 })) });
    expect(result.strikes.map((s) => s.onsetS)).toHaveLength(3);
    result.strikes.forEach((s, i) => {
      expect(Math.abs(s.onsetS - onsets[i])).toBeLessThan(0.002);
      const p = nearest(s.partials, 440);
      expect(Math.abs(cents(p.frequencyHz, 440))).toBeLessThan(0.05);
      expect(Math.abs(p.tauS / 0.4 - 1)).toBeLessThan(0.03);
    });
  });

  it("mains hum (50 Hz and harmonics, steady) is not reported, and is named in a warning", () => {
    // 440 Hz sits 40 Hz from the 400 Hz hum line: the hum must neither be reported nor be taken
    // for a doublet partner of the partial.
    const modes = [{ frequencyHz: 440, amplitude: 0.3, tauS: 0.7 }, { frequencyHz: 1411.2, amplitude: 0.08, tauS: 0.3 }];
    const { result } = analyzeSynth(
      { sampleRate: FS, durationS: 3, seed: 31, snrDb: 50, hum: { mainsHz: 50, amplitude: 0.02, harmonics: 8 }, strikes: [{ onsetS: 0.3, modes }] },
      { bits: 24 },
      true,
    );
    const ps = result.strikes[0].partials;
    for (const p of ps) {
      const h = Math.round(p.frequencyHz / 50);
      expect(Math.abs(p.frequencyHz - 50 * h)).toBeGreaterThan(2);
    }
    expect(ps.map((p) => Math.round(p.frequencyHz))).toEqual([440, 1411]);
    for (const p of ps) expect(p.beatHz).toBeNull();
    expect(Math.abs(cents(ps[0].frequencyHz, 440))).toBeLessThan(0.01);
    expect(result.warnings.map((w) => w.code)).toContain("hum");
    expect(result.strikes[0].plot!.humHz.length).toBeGreaterThanOrEqual(3);
  });

  it("a clean strike shows no spurious partial within 20 dB of the strongest", () => {
    const modes = [
      { frequencyHz: 261.63, amplitude: 0.4, tauS: 1.2 },
      { frequencyHz: 721.3, amplitude: 0.12, tauS: 0.5 },
      { frequencyHz: 1413.8, amplitude: 0.06, tauS: 0.25 },
    ];
    const { result } = analyzeSynth({ sampleRate: FS, durationS: 4, seed: 41, snrDb: 50, strikes: [{ onsetS: 0.1, modes, click: 0.3 }] });
    const ps = result.strikes[0].partials;
    const top = Math.max(...ps.map((p) => p.amplitudeDb));
    const strong = ps.filter((p) => p.amplitudeDb > top - 20);
    for (const p of strong) expect(modes.some((m) => Math.abs(cents(p.frequencyHz, m.frequencyHz)) < 1)).toBe(true);
    // 261.63 Hz at −8.0 dBFS, 721.3 Hz at −18.4 dBFS and 1413.8 Hz at −24.4 dBFS: all three, nothing else.
    expect(strong).toHaveLength(3);
  });

  it("a steel fork near 550 Hz: overtone near 3.3 kHz (about 6×) that dies faster (common practice, no published source)", () => {
    const modes = [{ frequencyHz: 550, amplitude: 0.3, tauS: 3 }, { frequencyHz: 3310, amplitude: 0.03, tauS: 0.25 }];
    const { result } = analyzeSynth({ sampleRate: FS, durationS: 3, seed: 51, snrDb: 45, strikes: [{ onsetS: 0.1, modes }] });
    const [f1, f2] = result.strikes[0].partials;
    expect(f2.frequencyHz / f1.frequencyHz).toBeGreaterThan(5.8);
    expect(f2.frequencyHz / f1.frequencyHz).toBeLessThan(6.3);
    expect(f2.tauS).toBeLessThan(f1.tauS);
  });

  it("a partial that hardly decays within the recording is flagged: τ needs a longer recording", () => {
    const { result } = analyzeSynth({ sampleRate: FS, durationS: 1.2, seed: 61, snrDb: 50, strikes: [{ onsetS: 0.1, modes: [{ frequencyHz: 440, amplitude: 0.3, tauS: 8 }] }] });
    const p = nearest(result.strikes[0].partials, 440);
    expect(p.tauUnreliable).toBe(true);
    const w = result.warnings.find((x) => x.code === "tau_unreliable");
    expect(w?.message).toMatch(/longer recording is needed/);
  });

  it("plot series are decimated to the sizes the client expects", () => {
    const modes = [{ frequencyHz: 440, amplitude: 0.3, tauS: 0.8 }, { frequencyHz: 1200, amplitude: 0.1, tauS: 0.4 }];
    const { result } = analyzeSynth({ sampleRate: 96000, durationS: 6, seed: 71, snrDb: 45, strikes: [{ onsetS: 0.1, modes }] }, { bits: 24 }, true);
    const s = result.strikes[0];
    const plot = s.plot!;
    expect(plot.spectrum.frequencyHz.length).toBeLessThanOrEqual(2000);
    expect(plot.spectrum.magnitudeDb).toHaveLength(plot.spectrum.frequencyHz.length);
    expect(plot.spectrum.noiseFloorDb).toHaveLength(plot.spectrum.frequencyHz.length);
    expect(plot.envelopes).toHaveLength(s.partials.length);
    for (const e of plot.envelopes) {
      expect(e.timeS.length).toBeLessThanOrEqual(600);
      expect(e.levelDb).toHaveLength(e.timeS.length);
      expect(e.noiseFloorDb).toBeLessThan(Math.max(...e.levelDb));
    }
    // The spectrum peaks at the partial's level (Hann coherent gain corrected): −10.5 dBFS.
    const i = plot.spectrum.magnitudeDb.indexOf(Math.max(...plot.spectrum.magnitudeDb));
    expect(Math.abs(plot.spectrum.frequencyHz[i] - 440)).toBeLessThan(30);
  });
});
