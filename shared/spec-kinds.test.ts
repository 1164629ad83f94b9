/**
 * The specification kinds beyond "a fundamental in Hz and ratios in cents": targets by note name
 * at a chosen reference pitch, tolerances in Hz or ppm, a strike-note target, and the bell's
 * per-partial tuning guidance — through the real schema and the real evaluation.
 *
 * References: equal temperament f = A4·2^(k/12) with A4 = 440 Hz (ISO 16:1975); the cent is
 * 1/1200 octave (1200·log2(f/fref)); ppm = 10⁶·Δf/f. Expected numbers are worked out here by hand.
 */
import { describe, expect, it } from "vitest";
import type { Partial as MeasuredPartial } from "./schemas/analysis.ts";
import { specInputSchema, type SpecPartialInput } from "./schemas/spec.ts";
import { evaluateUnit, matchStrike } from "./evaluation.ts";
import { measuredPartial } from "../tests/support/measured-partial.ts";

const partial = measuredPartial;
const parse = (partials: SpecPartialInput[], o: Record<string, unknown> = {}) => specInputSchema.parse({ name: "T", family: "tube", partials, ...o });
const issues = (input: unknown) => {
  const r = specInputSchema.safeParse(input);
  return r.success ? [] : r.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
};
const evaluate = (s: ReturnType<typeof parse>, partials: MeasuredPartial[]) => evaluateUnit(s, [{ strikeId: "s", segment: 0, temperatureC: null, partials }], { clockHalfWidthPpm: 0 });

describe("targets by note name", () => {
  it("turns a note into its equal-tempered frequency at the reference pitch (ISO 16 A4 = 440 Hz by default)", () => {
    const s = parse([{ label: "Note", isFundamental: true, targetKind: "absolute", targetNote: "C5", toleranceCents: 5 }]);
    expect(s.referencePitchHz).toBe(440);
    expect(s.partials[0].targetNote).toBe("C5");
    expect(s.partials[0].targetHz).toBeCloseTo(440 * 2 ** (3 / 12), 9); // 523.2511 Hz
  });

  it("follows the customer's reference pitch: C5 at A4 = 442 Hz is 525.63 Hz, at 432 Hz 513.74 Hz", () => {
    const at = (a4: number) => parse([{ label: "Note", isFundamental: true, targetKind: "absolute", targetNote: "c5", toleranceCents: 5 }], { referencePitchHz: a4 }).partials[0].targetHz!;
    expect(at(442)).toBeCloseTo(525.6295, 3);
    expect(at(432)).toBeCloseTo(513.7375, 3);
    // The note wins over a stale Hz value (an edit that changed the reference pitch).
    const s = parse([{ label: "Note", isFundamental: true, targetKind: "absolute", targetNote: "A4", targetHz: 440, toleranceCents: 5 }], { referencePitchHz: 443 });
    expect(s.partials[0].targetHz).toBe(443);
  });

  it("says what is wrong with a bad note or reference pitch, on the field", () => {
    expect(issues({ name: "T", family: "tube", partials: [{ label: "N", isFundamental: true, targetKind: "absolute", targetNote: "H4", toleranceCents: 5 }] })).toEqual([
      "partials.0.targetNote: Write a note as a letter A–G, an optional # or b, and an octave: A4, C#5, Bb3",
    ]);
    expect(issues({ name: "T", family: "tube", referencePitchHz: 500, partials: [{ label: "N", isFundamental: true, targetKind: "absolute", targetHz: 440, toleranceCents: 5 }] })).toEqual([
      "referencePitchHz: Reference pitch must be at most 480 Hz",
    ]);
    expect(issues({ name: "T", family: "tube", partials: [{ label: "N", isFundamental: true, targetKind: "absolute", toleranceCents: 5 }] })).toEqual(["partials.0.targetHz: Give the target in Hz, or a note name"]);
  });
});

describe("tolerances in Hz or ppm", () => {
  it("converts ±0.5 Hz at 440 Hz to 1200·log2(440.5/440) = 1.966 cents and keeps what was typed", () => {
    const s = parse([{ label: "F", isFundamental: true, targetKind: "absolute", targetHz: 440, toleranceUnit: "hz", toleranceValue: 0.5 }]);
    expect(s.partials[0].toleranceCents).toBeCloseTo(1200 * Math.log2(440.5 / 440), 12);
    expect(s.partials[0].toleranceUnit).toBe("hz");
    expect(s.partials[0].toleranceValue).toBe(0.5);
  });

  it("converts ±100 ppm to 1200·log2(1.0001) = 0.1731 cents, at any frequency", () => {
    const s = parse([{ label: "F", isFundamental: true, targetKind: "absolute", targetHz: 4096, toleranceUnit: "ppm", toleranceValue: 100 }]);
    expect(s.partials[0].toleranceCents).toBeCloseTo(1200 * Math.log2(1.0001), 12);
  });

  it("takes a ratio partial's Hz tolerance at ratio × the fundamental's target: ±2 Hz at 2 × 440 Hz", () => {
    const s = parse([
      { label: "F", isFundamental: true, targetKind: "absolute", targetHz: 440, toleranceCents: 5 },
      { label: "Octave", targetKind: "ratio", ratio: 2, toleranceUnit: "hz", toleranceValue: 2 },
    ]);
    expect(s.partials[1].toleranceCents).toBeCloseTo(1200 * Math.log2(882 / 880), 12);
  });

  it("keeps an old-style request in cents as it was (tolerance value = cents)", () => {
    const s = parse([{ label: "F", isFundamental: true, targetKind: "absolute", targetHz: 440, toleranceCents: 7 }]);
    expect(s.partials[0]).toMatchObject({ toleranceCents: 7, toleranceUnit: "cents", toleranceValue: 7 });
  });

  it("refuses a tolerance without a value, and Hz where no frequency is known", () => {
    expect(issues({ name: "T", family: "tube", partials: [{ label: "F", isFundamental: true, targetKind: "absolute", targetHz: 440, toleranceUnit: "hz" }] })).toEqual(["partials.0.toleranceValue: Give the tolerance"]);
    expect(
      issues({
        name: "T",
        family: "tube",
        partials: [
          { label: "A", isFundamental: false, targetKind: "absolute", targetHz: 440, toleranceCents: 5 },
          { label: "B", targetKind: "ratio", ratio: 2, toleranceUnit: "hz", toleranceValue: 1 },
        ],
      }),
    ).toContain("partials.1.toleranceUnit: A tolerance in Hz needs a target in Hz; give this one in cents or ppm");
  });

  it("judges a measured value against the converted tolerance: 440.4 Hz passes ±0.5 Hz, 440.6 Hz fails", () => {
    const s = parse([{ label: "F", isFundamental: true, targetKind: "absolute", targetHz: 440, toleranceUnit: "hz", toleranceValue: 0.5 }]);
    expect(evaluate(s, [partial(440.4)]).verdict).toBe("within_tolerance");
    expect(evaluate(s, [partial(440.6)]).verdict).toBe("out_of_tolerance");
    expect(evaluate(s, [partial(439.6)]).verdict).toBe("within_tolerance");
  });
});

describe("strike-note targets", () => {
  // A chime tube sounding C5 (523.2511 Hz): partials at 2, 3, 4 × the strike note, and lower modes.
  const f0 = 440 * 2 ** (3 / 12);
  const tube = [partial(0.2239 * f0, { amplitudeDb: -30 }), partial(0.617 * f0, { amplitudeDb: -28 }), partial(1.2097 * f0, { amplitudeDb: -25 }), partial(2 * f0, { amplitudeDb: -10 }), partial(3 * f0, { amplitudeDb: -14 }), partial(4 * f0, { amplitudeDb: -16 })];
  const spec = parse([
    { label: "Strike note", isFundamental: true, targetKind: "strike_note", targetNote: "C5", toleranceCents: 10 },
    { label: "Octave mode", targetKind: "ratio", ratio: 2, toleranceCents: 30 },
  ]);

  it("evaluates the heard pitch, not the lowest partial, and ratios are taken to it", () => {
    const r = evaluate(spec, tube);
    expect(r.verdict).toBe("within_tolerance");
    expect(r.requirements[0].measuredHz).toBeCloseTo(f0, 6);
    expect(Math.abs(r.requirements[0].deviationCents!)).toBeLessThan(0.01);
    expect(r.requirements[1].measuredRatio).toBeCloseTo(2, 6);
  });

  it("reports the partials the strike note was read from (harmonics 2, 3, 4) without using them up", () => {
    const m = matchStrike(spec, tube);
    expect(m.strikeNotes[0]!.members.map((x) => [x.index, x.harmonic])).toEqual([[3, 2], [4, 3], [5, 4]]);
    expect(m.indices[1]).toBe(3); // the octave mode is still matched to its own requirement
  });

  it("flags a tube whose series is 20 cents sharp, and gives the tube's remedy", () => {
    const sharp = tube.map((p) => partial(p.frequencyHz * 2 ** (20 / 1200), { amplitudeDb: p.amplitudeDb }));
    const r = evaluate(spec, sharp);
    expect(r.verdict).toBe("out_of_tolerance");
    expect(r.requirements[0].deviationCents).toBeCloseTo(20, 6);
    expect(r.guidance!.direction).toBe("lower");
  });

  it("says no strike note was found when no three partials stand near 2 : 3 : 4", () => {
    const r = evaluate(spec, tube.slice(0, 4));
    expect(r.verdict).toBe("out_of_tolerance");
    expect(r.requirements[0].result).toBe("fail");
    expect(r.requirements[0].note).toMatch(/No strike note found in any strike: no three partials stand near 2 : 3 : 4/);
  });

  it("allows one strike note per specification", () => {
    expect(
      issues({
        name: "T",
        family: "tube",
        partials: [
          { label: "A", isFundamental: true, targetKind: "strike_note", targetHz: 523, toleranceCents: 5 },
          { label: "B", targetKind: "strike_note", targetHz: 523, toleranceCents: 5 },
        ],
      }),
    ).toEqual(["partials.1.targetKind: One strike note per specification"]);
  });
});

describe("bell tuning guidance (direction only, with the caution)", () => {
  // Bell partials as ratios to the prime: hum 0.5, prime 1, tierce 1.2, quint 1.5, nominal 2.
  const bell = specInputSchema.parse({
    name: "Bell",
    family: "handbell",
    partials: [
      { label: "Hum", targetKind: "ratio", ratio: 0.5, toleranceCents: 10 },
      { label: "Prime", isFundamental: true, targetKind: "absolute", targetHz: 440, toleranceCents: 10 },
      { label: "Tierce", targetKind: "ratio", ratio: 1.2, toleranceCents: 10 },
      { label: "Quint", targetKind: "ratio", ratio: 1.5, toleranceCents: 10, required: false },
      { label: "Nominal", targetKind: "ratio", ratio: 2, toleranceCents: 10 },
    ],
  });
  const up = (f: number, c: number) => f * 2 ** (c / 1200);

  it("names where metal is taken for each partial out of tolerance, even when the prime is in", () => {
    const r = evaluate(bell, [partial(220), partial(440), partial(up(528, 30)), partial(660), partial(up(880, -25))]);
    expect(r.verdict).toBe("out_of_tolerance");
    const g = r.guidance!;
    expect(g.label).toBe("Tierce");
    expect(g.partials!.map((p) => [p.label, p.direction])).toEqual([
      ["Tierce", "lower"],
      ["Nominal", "raise"],
    ]);
    expect(g.partials![0].remedy).toContain("low in the waist just above the sound bow");
    expect(g.partials![1].remedy).toContain("Removing metal lowers bell partials");
    expect(g.estimate).toBeNull();
    expect(g.caution).toContain("eye and hearing protection");
    expect(g.caution).toContain("tuning lathe");
  });

  it("gives no length estimate for a bell, even with a length", () => {
    const withLength = { ...bell, lengthMm: 120 };
    const r = evaluate(withLength, [partial(220 * 0.99), partial(430), partial(516), partial(645), partial(860)]);
    expect(r.guidance!.direction).toBe("raise");
    expect(r.guidance!.estimate).toBeNull();
  });
});
