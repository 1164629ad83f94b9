import { describe, expect, it } from "vitest";
import {
  centsToHz,
  centsToPpm,
  describeTolerance,
  hzToCents,
  nearestNote,
  normaliseNoteName,
  noteNameHz,
  noteNameOf,
  parseNoteName,
  ppmToCents,
  toleranceToCents,
} from "./tuning.ts";

// Independent references used below:
// - Equal temperament: each semitone multiplies the frequency by 2^(1/12); A4 = 440 Hz is the
//   standard tuning frequency of ISO 16:1975. The semitone distances from A4 are counted by hand
//   here (C4 is 9 semitones below A4, C5 3 above), not taken from the code under test.
// - Table values of the equal-tempered scale at A4 = 440 Hz (e.g. C4 = 261.626 Hz, A0 = 27.500 Hz,
//   C8 = 4186.01 Hz), as printed in acoustics handbooks' note-frequency tables (quoted from memory;
//   every one is also recomputed from the 2^(k/12) formula in the same test).
// - The cent: 1/1200 of an octave, so 1 cent = 2^(1/1200) = 1.000577789506555 (the 1200th root of
//   2, computed here with Math.pow), i.e. 577.79 ppm; ppm = 10⁶·Δf/f by definition.
const semitonesFromA4 = (k: number, a4 = 440) => a4 * Math.pow(2, k / 12);

describe("note names (equal temperament, ISO 16:1975 A4 = 440 Hz)", () => {
  it("numbers notes as MIDI does (A4 = 69, C4 = 60) and reads sharps and flats", () => {
    expect(parseNoteName("A4")).toBe(69);
    expect(parseNoteName("C4")).toBe(60);
    expect(parseNoteName("C#5")).toBe(73);
    expect(parseNoteName("Db5")).toBe(73);
    expect(parseNoteName("B♭3")).toBe(58);
    expect(parseNoteName(" a 4 ")).toBe(69);
    expect(parseNoteName("H4")).toBeNull();
    expect(parseNoteName("A")).toBeNull();
    expect(normaliseNoteName("c♯5")).toBe("C#5");
    expect(noteNameOf(61)).toBe("C♯4");
  });

  it("gives the handbook table frequencies at A4 = 440 Hz, within 0.005 Hz, and the 2^(k/12) values within 1e-9", () => {
    const table: [string, number, number][] = [
      // name, semitones from A4 (counted by hand), table value Hz
      ["A0", -48, 27.5],
      ["C4", -9, 261.626],
      ["E4", -5, 329.628],
      ["G#4", -1, 415.305],
      ["A4", 0, 440],
      ["C5", 3, 523.251],
      ["A5", 12, 880],
      ["C8", 39, 4186.009],
    ];
    for (const [name, k, value] of table) {
      expect(Math.abs(noteNameHz(name) - value), name).toBeLessThan(0.005);
      expect(noteNameHz(name) / semitonesFromA4(k) - 1, name).toBeLessThan(1e-12);
    }
  });

  it("follows the chosen reference pitch (442, 443, 432 Hz): every note scales with A4", () => {
    for (const a4 of [442, 443, 432]) {
      expect(noteNameHz("A4", a4)).toBe(a4);
      expect(noteNameHz("C5", a4)).toBeCloseTo(semitonesFromA4(3, a4), 9);
      expect(noteNameHz("C4", a4) / noteNameHz("C4", 440)).toBeCloseTo(a4 / 440, 12);
    }
    // At 442 Hz, C5 is 442·2^(3/12) = 525.63 Hz.
    expect(noteNameHz("C5", 442)).toBeCloseTo(525.63, 2);
  });

  it("names the nearest note and the offset in cents", () => {
    const n = nearestNote(445);
    expect(n.name).toBe("A4");
    expect(n.cents).toBeCloseTo(1200 * Math.log2(445 / 440), 9); // +19.56 cents
    expect(nearestNote(523.251 * Math.pow(2, -30 / 1200)).name).toBe("C5");
  });

  it("refuses a name that is not a note, saying how to write one", () => {
    expect(() => noteNameHz("X9")).toThrow(/letter A–G, an optional # or b, and an octave/);
  });
});

describe("tolerances in cents, Hz and ppm", () => {
  const oneCentRatio = Math.pow(2, 1 / 1200); // 1.000577789506555

  it("1 cent is 577.79 ppm at any frequency, and 0.2542 Hz at 440 Hz", () => {
    expect(centsToPpm(1)).toBeCloseTo((oneCentRatio - 1) * 1e6, 9);
    expect(centsToPpm(1)).toBeCloseTo(577.79, 2);
    expect(centsToHz(1, 440)).toBeCloseTo(440 * (oneCentRatio - 1), 12);
    expect(centsToHz(1, 440)).toBeCloseTo(0.2542, 4);
  });

  it("converts at several frequencies, both ways, with the same numbers as the definitions", () => {
    for (const f of [55, 261.626, 440, 1000, 4186.01]) {
      for (const c of [0.5, 1, 5, 25, 100]) {
        const hz = f * (Math.pow(2, c / 1200) - 1);
        expect(centsToHz(c, f)).toBeCloseTo(hz, 9);
        expect(hzToCents(hz, f)).toBeCloseTo(c, 9);
        expect(ppmToCents(centsToPpm(c))).toBeCloseTo(c, 9);
        // cents from Hz through log10 instead of log2: 1200·log10(1 + Δf/f)/log10(2).
        expect(hzToCents(hz, f)).toBeCloseTo((1200 * Math.log10(1 + hz / f)) / Math.log10(2), 9);
      }
    }
    // 0.1 Hz at 1000 Hz is 100 ppm, 0.1731 cents.
    expect(toleranceToCents(0.1, "hz", 1000)).toBeCloseTo(toleranceToCents(100, "ppm", null), 12);
    expect(toleranceToCents(100, "ppm", null)).toBeCloseTo(0.1731, 4);
    // 100 cents (a semitone) is 5.946 % = 59 463 ppm.
    expect(centsToPpm(100)).toBeCloseTo((Math.pow(2, 1 / 12) - 1) * 1e6, 6);
  });

  it("takes Hz and ppm on the narrower (upper) side, never widening the tolerance", () => {
    const f = 440;
    const c = toleranceToCents(2, "hz", f);
    expect(c).toBeCloseTo(1200 * Math.log2(442 / 440), 12);
    expect(c).toBeLessThan(Math.abs(1200 * Math.log2(438 / 440)));
    expect(() => toleranceToCents(2, "hz", null)).toThrow(/needs the target frequency/);
  });

  it("describes a tolerance in the unit it was given first, then the two others", () => {
    // 5 cents at 440 Hz: 440·(2^(5/1200) − 1) = 1.2735 Hz; 10⁶·(2^(5/1200) − 1) = 2892.3 ppm.
    expect(describeTolerance(5, 440)).toBe("±5 cents (±1.27 Hz, ±2892 ppm)");
    // 0.5 Hz at 440 Hz: 1200·log2(440.5/440) = 1.966 cents; 0.5/440 = 1136 ppm.
    expect(describeTolerance(toleranceToCents(0.5, "hz", 440), 440, "hz", 0.5)).toBe("±0.5 Hz (±1.97 cents, ±1136 ppm)");
    expect(describeTolerance(5, null)).toBe("±5 cents (±2892 ppm)");
  });
});
