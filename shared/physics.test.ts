import { describe, expect, it } from "vitest";
import {
  A4_HZ,
  CANTILEVER_BETA_L,
  CANTILEVER_SECOND_TO_FIRST,
  FREE_FREE_BETA_L,
  FREE_FREE_RATIOS,
  STEEL_FREQUENCY_TEMPERATURE_COEFFICIENT_PER_C,
  beamFrequencyRatios,
  cents,
  correctToReferenceTemperature,
  frequencyFromCents,
  t60ExtrapolatedFrom,
  midiNoteHz,
  qFromTau,
  t60FromTau,
  tauFromQ,
  tauFromT60,
} from "./physics";

// Characteristic equations of the Euler–Bernoulli beam (Thomson, Theory of Vibration, App. D;
// Blevins, Formulas for Natural Frequency and Mode Shape, ch. 8):
//   cantilever: cos(x)·cosh(x) + 1 = 0;  free–free: cos(x)·cosh(x) − 1 = 0.
function bisect(f: (x: number) => number, lo: number, hi: number): number {
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (Math.sign(f(lo)) === Math.sign(f(mid))) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

describe("pitch (ISO 16:1975, A4 = 440 Hz; cents = 1200·log2(f/fref))", () => {
  it("uses A4 = 440 Hz", () => {
    expect(A4_HZ).toBe(440);
    expect(midiNoteHz(69)).toBe(440);
  });
  it("an octave is 1200 cents and an equal-tempered semitone 100 cents", () => {
    expect(cents(880, 440)).toBeCloseTo(1200, 12);
    expect(cents(midiNoteHz(70), midiNoteHz(69))).toBeCloseTo(100, 10);
    // C4 = 261.6256 Hz in 12-TET from A4 = 440 Hz (standard equal-temperament table value).
    expect(midiNoteHz(60)).toBeCloseTo(261.6256, 4);
  });
  it("frequencyFromCents inverts cents", () => {
    expect(frequencyFromCents(440, cents(452.3, 440))).toBeCloseTo(452.3, 10);
  });
  it("rejects non-positive frequencies with a message", () => {
    expect(() => cents(0, 440)).toThrow(/positive frequencies/);
  });
});

describe("decay (T60 = τ·ln 1000, Q = π·f·τ)", () => {
  it("T60 of τ = 1 s is 6.9078 s", () => {
    expect(t60FromTau(1)).toBeCloseTo(6.907755, 6);
    expect(tauFromT60(t60FromTau(0.37))).toBeCloseTo(0.37, 12);
  });
  it("Q = π·f·τ and back", () => {
    expect(qFromTau(440, 2)).toBeCloseTo(Math.PI * 880, 9);
    expect(tauFromQ(440, qFromTau(440, 2))).toBeCloseTo(2, 12);
  });
});

describe("Euler–Bernoulli beam ratios (Thomson App. D; Blevins ch. 8)", () => {
  it("the tabulated roots solve the characteristic equations", () => {
    const cantilever = (x: number) => Math.cos(x) * Math.cosh(x) + 1;
    const freeFree = (x: number) => Math.cos(x) * Math.cosh(x) - 1;
    const brackets = [[1, 3], [4, 6], [7, 9], [10, 12]];
    brackets.forEach(([lo, hi], i) => expect(bisect(cantilever, lo, hi)).toBeCloseTo(CANTILEVER_BETA_L[i], 6));
    const ffBrackets = [[4, 6], [7, 9], [10, 12], [13, 15]];
    ffBrackets.forEach(([lo, hi], i) => expect(bisect(freeFree, lo, hi)).toBeCloseTo(FREE_FREE_BETA_L[i], 6));
  });
  it("cantilever second/first = 6.267", () => {
    expect(beamFrequencyRatios(CANTILEVER_BETA_L)[1]).toBeCloseTo(6.267, 3);
    expect(CANTILEVER_SECOND_TO_FIRST).toBeCloseTo(beamFrequencyRatios(CANTILEVER_BETA_L)[1], 3);
  });
  it("free–free 1 : 2.757 : 5.404 : 8.933", () => {
    const r = beamFrequencyRatios(FREE_FREE_BETA_L);
    FREE_FREE_RATIOS.forEach((v, i) => expect(r[i]).toBeCloseTo(v, 3));
  });
  it("a steel fork near 550 Hz has its first balanced overtone near 3.3 kHz, about 6× (common practice, no published source)", () => {
    // Cantilever theory gives 6.27×; real forks sit a little lower because the stem is not a rigid clamp.
    const overtone = 550 * CANTILEVER_SECOND_TO_FIRST;
    expect(overtone).toBeGreaterThan(3200);
    expect(overtone).toBeLessThan(3500);
  });
});

describe("temperature coefficient (steel, from memory: about −1×10⁻⁴ per °C)", () => {
  it("a warmer steel part sounds lower, and the correction brings it back", () => {
    expect(STEEL_FREQUENCY_TEMPERATURE_COEFFICIENT_PER_C).toBeLessThan(0);
    const f20 = 440;
    const f30 = f20 * (1 + STEEL_FREQUENCY_TEMPERATURE_COEFFICIENT_PER_C * 10);
    expect(cents(f30, f20)).toBeCloseTo(-1.73, 2); // 10 °C warmer ≈ −1.7 cents
    expect(correctToReferenceTemperature(f30, 30, 20)).toBeCloseTo(f20, 9);
  });
});

describe("T60 extrapolated from the decay a recording saw (T60 is a 60 dB decay, by definition)", () => {
  it("names the dB seen when it is less than 60, and nothing otherwise", () => {
    expect(t60ExtrapolatedFrom(6.4)).toBe("from 6 dB");
    expect(t60ExtrapolatedFrom(59.6)).toBe("from 60 dB");
    expect(t60ExtrapolatedFrom(60)).toBeNull();
    expect(t60ExtrapolatedFrom(83)).toBeNull();
    expect(t60ExtrapolatedFrom(undefined)).toBeNull();
    expect(t60ExtrapolatedFrom(null)).toBeNull();
  });
});
