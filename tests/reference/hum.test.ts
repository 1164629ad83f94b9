/**
 * Mains hum shown by evidence, not by frequency alone. Mains are 50 or 60 Hz (IEC 60038) and the
 * grid may stray ±1 % (EN 50160); above a kilohertz the ±1 % windows around the harmonics cover
 * much of the spectrum, so a partial there must not be taken for hum because of where it sits.
 * Hum is steady, present before the strike at the same level, and its lines share one fractional
 * offset from nominal; a line that starts with the strike and decays is the unit's.
 */
import { describe, expect, it } from "vitest";
import { analyze, analyzeSynth, cents, soxWrite } from "./helpers";
import type { SynthMode } from "../../fixtures/synth";

const FS = 48000;

describe("a partial beside a harmonic of real hum", () => {
  // Hum over the whole file (it is in the lead-in), its harmonic next to the partial 20 dB below
  // the partial (0.03 against 0.3), the other harmonics at 0.01/h.
  const cases: Array<[number, number, number]> = [];
  for (const mains of [50, 60]) for (const h of [3, 7, 12, 25]) for (const d of [0.3, 0.6, 1.0]) cases.push([mains, h, d]);
  it.each(cases)("%s Hz mains, harmonic %s, partial %s Hz above it: the partial within 0.05 cent, no hum line as a partial", (mains, h, d) => {
    const f = h * mains + d;
    const levels = Array.from({ length: 30 }, (_, i) => (i + 1 === h ? 0.03 : 0.01 / (i + 1)));
    const { result } = analyzeSynth(
      { sampleRate: FS, durationS: 4, seed: h * 10 + Math.round(d * 10), snrDb: 60, hum: { mainsHz: mains, amplitude: 0.01, harmonics: 30, levels }, strikes: [{ onsetS: 0.5, modes: [{ frequencyHz: f, amplitude: 0.3, tauS: 1.2 }] }] },
      { bits: 24 },
    );
    expect(result.strikes).toHaveLength(1);
    const ps = result.strikes[0].partials;
    expect(ps).toHaveLength(1);
    expect(Math.abs(cents(ps[0].frequencyHz, f))).toBeLessThan(0.05);
    expect(Math.abs(ps[0].tauS / 1.2 - 1)).toBeLessThan(0.01);
    expect(ps[0].beatHz).toBeNull();
    expect(result.warnings.map((w) => w.code)).toContain("hum");
  });
});

describe("clean strikes near mains harmonics, no hum in the file", () => {
  // Partials from a few hundred hertz to several kilohertz, each within 0.2 % of a 50 or 60 Hz
  // harmonic, some ringing far longer than the recording (τ 8–40 s in 2–3 s).
  const sets: SynthMode[][] = [
    [{ frequencyHz: 300.4, amplitude: 0.3, tauS: 1.5 }, { frequencyHz: 1199.2, amplitude: 0.1, tauS: 20 }, { frequencyHz: 2401.1, amplitude: 0.05, tauS: 0.6 }],
    [{ frequencyHz: 420.9, amplitude: 0.3, tauS: 30 }, { frequencyHz: 1751.3, amplitude: 0.08, tauS: 0.8 }, { frequencyHz: 1800.6, amplitude: 0.05, tauS: 12 }],
    [{ frequencyHz: 660.2, amplitude: 0.3, tauS: 15 }, { frequencyHz: 900.3, amplitude: 0.1, tauS: 25 }, { frequencyHz: 1980.5, amplitude: 0.05, tauS: 9 }],
    [{ frequencyHz: 240.3, amplitude: 0.3, tauS: 8 }, { frequencyHz: 480.2, amplitude: 0.1, tauS: 40 }, { frequencyHz: 3599, amplitude: 0.05, tauS: 2 }],
  ];
  const cases: Array<[number, number, number]> = [];
  for (let i = 0; i < sets.length; i++) for (const onsetS of [0.3, 0]) for (const durationS of [2, 3]) cases.push([i, onsetS, durationS]);
  it.each(cases)("set %s, strike at %s s, %s s long: no hum warning, every partial reported", (i, onsetS, durationS) => {
    const modes = sets[i];
    const { result } = analyzeSynth({ sampleRate: FS, durationS, seed: 50 + i, snrDb: 55, strikes: [{ onsetS, modes, click: 0.1 }] }, { bits: 24 });
    expect(result.warnings.map((w) => w.code)).not.toContain("hum");
    const ps = result.strikes[0].partials;
    for (const m of modes) {
      const p = ps.find((q) => Math.abs(cents(q.frequencyHz, m.frequencyHz)) < 1);
      expect(p, `${m.frequencyHz} Hz`).toBeDefined();
      expect(Math.abs(cents(p!.frequencyHz, m.frequencyHz))).toBeLessThan(0.01);
      // A partial that decays less than 3 dB within the recording is reported, marked for a longer recording.
      const decayDb = ((20 / Math.LN10) * (durationS - onsetS)) / m.tauS;
      if (decayDb < 3) expect(p!.tauUnreliable).toBe(true);
    }
    expect(ps).toHaveLength(modes.length);
  });

  it("a 440 Hz tone under sox's fade (`synth 4 sine 440 fade 0 4 3.9`, 24-bit 48 kHz): no hum warning", () => {
    const r = analyze(soxWrite(["-n", "-r", "48000", "-b", "24", "OUT", "synth", "4", "sine", "440", "fade", "0", "4", "3.9"]));
    expect(r.warnings.map((w) => w.code)).not.toContain("hum");
    expect(r.strikes[0].partials.map((p) => Math.round(p.frequencyHz))).toEqual([440]);
  });
});

describe("hum that is there is still recognised", () => {
  it.each([
    [50, 0.3],
    [60, 0.3],
    [50, 0],
    [60, 0],
  ])("%s Hz hum with 8 harmonics, strike at %s s (0: no lead-in, the family decides)", (mains, onsetS) => {
    const modes = [{ frequencyHz: 440, amplitude: 0.3, tauS: 0.7 }, { frequencyHz: 1411.2, amplitude: 0.08, tauS: 0.3 }];
    const { result } = analyzeSynth({ sampleRate: FS, durationS: 3, seed: 31, snrDb: 50, hum: { mainsHz: mains, amplitude: 0.02, harmonics: 8 }, strikes: [{ onsetS, modes }] }, { bits: 24 }, true);
    expect(result.strikes[0].partials.map((p) => Math.round(p.frequencyHz))).toEqual([440, 1411]);
    const hum = result.warnings.find((w) => w.code === "hum");
    expect(hum?.message).toContain(`${mains} Hz family`);
    expect(result.strikes[0].plot!.humHz.length).toBeGreaterThanOrEqual(5);
    for (const f of result.strikes[0].plot!.humHz) expect(Math.abs(f / mains - Math.round(f / mains))).toBeLessThan(0.01);
  });

  it("a lone steady line at a mains harmonic without a lead-in and without its family is not called hum", () => {
    // 1200 Hz steady from the first sample (24 × 50 = 20 × 60), no 50/60 Hz or low harmonic: no evidence of mains.
    const { result } = analyzeSynth({ sampleRate: FS, durationS: 3, seed: 33, snrDb: 50, strikes: [{ onsetS: 0, modes: [{ frequencyHz: 523.25, amplitude: 0.3, tauS: 0.8 }, { frequencyHz: 1200, amplitude: 0.02, tauS: 1e6 }] }] }, { bits: 24 });
    expect(result.warnings.map((w) => w.code)).not.toContain("hum");
  });
});
