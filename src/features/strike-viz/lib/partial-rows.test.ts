/**
 * Labels, ratios and deviations of a strike's partials. Reference values: the just perfect fifth
 * 3:2 is 701.955 cents and the equal-tempered semitone 2^(1/12) is 100 cents (standard values of
 * tuning theory, e.g. Ellis's cents definition, 1885); 1200·log2(445.1/440) = 19.951 cents.
 */
import { describe, expect, it } from "vitest";
import type { Partial as AnalysedPartial } from "@shared/schemas/analysis";
import type { RequirementResult } from "@shared/schemas/evaluation";
import { partialRows, ratioReference } from "./partial-rows";

const partial = (frequencyHz: number): AnalysedPartial => ({
  frequencyHz,
  frequencyUncertaintyHz: 0.01,
  amplitudeDb: -20,
  tauS: 1,
  tauUncertaintyS: 0.01,
  t60S: 6.9,
  q: Math.PI * frequencyHz,
  fitR2: 0.99,
  beatHz: null,
  fitStartS: 0.1,
  fitEndS: 2,
  tauUnreliable: false,
});

const requirement = (r: Partial<RequirementResult> & { label: string }): RequirementResult =>
  ({
    isFundamental: false,
    required: true,
    measuredHz: null,
    spreadCents: null,
    uncertaintyHz: null,
    expandedUncertaintyHz: null,
    targetHz: null,
    targetRatio: null,
    measuredRatio: null,
    toleranceCents: 5,
    deviationCents: null,
    deviationUncertaintyCents: null,
    pitch: "pass",
    t60S: null,
    t60UncertaintyS: null,
    minT60S: null,
    t60: "not_checked",
    q: null,
    minQ: null,
    qResult: "not_checked",
    beatHz: null,
    maxBeatHz: null,
    beat: "not_checked",
    result: "pass",
    note: null,
    ...r,
  }) as RequirementResult;

describe("partialRows", () => {
  const requirements = [
    requirement({ label: "Fundamental", isFundamental: true, targetHz: 440, toleranceCents: 5 }),
    requirement({ label: "Fifth", targetRatio: 1.5, targetHz: 667.65, toleranceCents: 20 }),
  ];

  it("names partials by the spec, measures a frequency target in cents and a ratio target on the ratio", () => {
    // 445.1 Hz against 440 Hz; the second partial at exactly 3:2 × 1.059463 (a semitone sharp of a fifth).
    const f0 = 445.1;
    const rows = partialRows([partial(f0), partial(f0 * 1.5 * 2 ** (1 / 12)), partial(3000)], { 0: "Fundamental", 1: "Fifth" }, requirements);
    expect(rows.map((r) => r.label)).toEqual(["Fundamental", "Fifth", "partial 3"]);
    expect(rows[0].isFundamental).toBe(true);
    expect(rows[0].deviationCents).toBeCloseTo(19.951, 3);
    expect(rows[1].ratio).toBeCloseTo(1.5 * 1.059463, 6);
    expect(rows[1].deviationCents).toBeCloseTo(100, 6);
    expect(rows[2].deviationCents).toBeNull();
    expect(rows[2].labelled).toBe(false);
    expect(ratioReference(rows)).toBe("fundamental");
  });

  it("a 3:2 ratio reads 701.955 cents above its reference", () => {
    const rows = partialRows([partial(200), partial(300)], { 0: "Fundamental" }, [requirement({ label: "Fundamental", isFundamental: true, targetHz: 200 })]);
    expect(1200 * Math.log2(rows[1].ratio!)).toBeCloseTo(701.955, 3);
  });

  it("without a matched fundamental, ratios are to the lowest partial and ratio targets are not judged", () => {
    const rows = partialRows([partial(311.4), partial(622.9)], { 1: "Fifth" }, requirements);
    expect(ratioReference(rows)).toBe("lowest");
    expect(rows[1].ratio).toBeCloseTo(622.9 / 311.4, 9);
    expect(rows[1].deviationCents).toBeNull();
    expect(rows.some((r) => r.isFundamental)).toBe(false);
  });

  it("with no spec at all, every partial is 'partial n'", () => {
    expect(partialRows([partial(100), partial(250)], {}, null).map((r) => r.label)).toEqual(["partial 1", "partial 2"]);
  });
});
