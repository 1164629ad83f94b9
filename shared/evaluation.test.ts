import { describe, expect, it } from "vitest";
import type { Partial as MeasuredPartial } from "./schemas/analysis.ts";
import { measuredPartial } from "../tests/support/measured-partial.ts";
import { specInputSchema, type SpecInput, type SpecPartialInput } from "./schemas/spec.ts";
import {
  EvaluationInputError,
  evaluateUnit,
  matchPartials,
  matchWindowCents,
  temperatureCorrect,
  tuningGuidance,
  type EvaluationStrikeInput,
  SAMPLE_CLOCK_HALF_WIDTH_PPM,
} from "./evaluation.ts";

/**
 * Most checks below derive exact uncertainty budgets, so they run with a negligible sample-clock
 * term; "adds the sample-clock term" checks that term on its own.
 */
const evaluate = (spec: SpecInput, strikes: EvaluationStrikeInput[]) => evaluateUnit(spec, strikes, { clockHalfWidthPpm: 0 });

// Definitions used to derive expected numbers in this file, independently of the code under test:
// - cents: 1200·log2(f/fref) (an octave = 1200 cents, an equal-tempered semitone = 100 cents).
// - T60 = τ·ln(1000) (a 60 dB fall is a factor 1000 in amplitude); Q = π·f·τ.
// - GUM (JCGM 100:2008): sample standard deviation §4.2.2, rectangular distribution u = a/√3
//   §4.3.7, root-sum-square combination §5.1.2, expanded uncertainty U = k·u_c with k = 2 §6.
// - ILAC-G8:09/2019 §4.2: guarded acceptance with w = U.
const centsOf = (f: number, ref: number) => 1200 * Math.log2(f / ref);
const atCents = (ref: number, c: number) => ref * 2 ** (c / 1200);
/** Standard uncertainty, Hz, at f that gives an expanded uncertainty of `U` cents (k = 2), from d(cents) = 1200/ln2 · df/f. */
const uHzForExpandedCents = (f: number, U: number) => (U / 2) * (f * Math.LN2) / 1200;
const toCents = (f: number, dfHz: number) => (1200 / Math.LN2) * (dfHz / f);

/** Builds a measured partial with consistent T60 and Q from τ. */
const partial = measuredPartial;

let strikeCounter = 0;
function strike(partials: MeasuredPartial[], temperatureC: number | null = null): EvaluationStrikeInput {
  strikeCounter += 1;
  return { strikeId: `s${strikeCounter}`, segment: 0, temperatureC, partials };
}

const fundamental = (o: Partial<SpecPartialInput> = {}): SpecPartialInput => ({
  label: "Fundamental",
  isFundamental: true,
  targetKind: "absolute",
  targetHz: 440,
  toleranceCents: 5,
  ...o,
});
const overtone = (ratio: number, o: Partial<SpecPartialInput> = {}): SpecPartialInput => ({
  label: "Overtone",
  targetKind: "ratio",
  ratio,
  toleranceCents: 15,
  ...o,
});

/** A spec through the real schema, so defaults (20 °C, −1e-4/°C, simple rule, 1 strike) are the product's. */
function spec(partials: SpecPartialInput[], o: Record<string, unknown> = {}): SpecInput {
  return specInputSchema.parse({ name: "Test fork", family: "tuning_fork", partials, ...o });
}

describe("temperatureCorrect: f_ref = f / (1 + α·(T − T_ref))", () => {
  const s = spec([fundamental()], { tempCoefficientPerC: -1e-4, referenceTemperatureC: 20 });

  it("raises the frequency of a warm steel part (it rang flat) — worked number", () => {
    // 440 / (1 + (−1e-4)·(30 − 20)) = 440 / 0.999 = 440.440440… Hz (by hand).
    expect(temperatureCorrect(440, 30, s)).toBeCloseTo(440.44044044, 7);
    expect(temperatureCorrect(440, 30, s)).toBeGreaterThan(440);
  });

  it("lowers the frequency of a cold part and leaves it alone without a temperature or at T_ref", () => {
    // 440 / 1.001 = 439.56043956… Hz.
    expect(temperatureCorrect(440, 10, s)).toBeCloseTo(439.56043956, 7);
    expect(temperatureCorrect(440, null, s)).toBe(440);
    expect(temperatureCorrect(440, 20, s)).toBe(440);
  });
});

describe("matchPartials", () => {
  it("searches max(3 × tolerance, 150) cents, capped at 600 cents", () => {
    expect(matchWindowCents(5)).toBe(150);
    expect(matchWindowCents(50)).toBe(150);
    expect(matchWindowCents(100)).toBe(300);
    expect(matchWindowCents(500)).toBe(600);
  });

  it("finds the fundamental within the window and not beyond it", () => {
    const s = spec([fundamental()]);
    expect(matchPartials(s, [partial(atCents(440, -149))])).toEqual([0]);
    expect(matchPartials(s, [partial(atCents(440, 151))])).toEqual([null]);
    expect(matchPartials(s, [partial(200), partial(atCents(440, 20)), partial(atCents(440, -3)), partial(900)])).toEqual([2]);
  });

  it("breaks a near-tie (under 1 cent apart) by amplitude, and otherwise takes the closest", () => {
    const s = spec([fundamental()]);
    const weakClose = partial(atCents(440, 0.3), { amplitudeDb: -40 });
    const strong = partial(atCents(440, -0.5), { amplitudeDb: -10 });
    expect(matchPartials(s, [weakClose, strong])).toEqual([1]);
    const strongFar = partial(atCents(440, -2), { amplitudeDb: -10 });
    expect(matchPartials(s, [weakClose, strongFar])).toEqual([0]);
  });

  it("expects a ratio partial at ratio × the measured fundamental, not × the target", () => {
    const s = spec([fundamental(), overtone(2.757, { toleranceCents: 50 })]);
    const f1 = 430; // 39.8 cents flat, still matched
    const partials = [partial(f1), partial(440 * 2.757), partial(f1 * 2.757)];
    expect(matchPartials(s, partials)).toEqual([0, 2]);
  });

  it("matches absolute overtones by their Hz and uses a measured partial at most once, closest pair first", () => {
    const a: SpecPartialInput = { label: "A", targetKind: "absolute", targetHz: 1000, toleranceCents: 50 };
    const b: SpecPartialInput = { label: "B", targetKind: "absolute", targetHz: 1010, toleranceCents: 50 };
    const measured = [partial(1004)]; // 6.9 cents from 1000 Hz, 10.3 cents from 1010 Hz
    expect(matchPartials(spec([a, b]), measured)).toEqual([0, null]);
    expect(matchPartials(spec([b, a]), measured)).toEqual([null, 0]);
    expect(matchPartials(spec([a, b]), [partial(1009), partial(1001)])).toEqual([1, 0]);
  });

  it("falls back to ratio × the fundamental's target when the fundamental is missing", () => {
    const s = spec([fundamental(), overtone(6.267, { toleranceCents: 100 })]);
    expect(matchPartials(s, [partial(440 * 6.0)])).toEqual([null, 0]);
  });
});

describe("evaluateUnit: pitch, simple acceptance (ILAC-G8 §4.2.1, w = 0)", () => {
  it("passes a deviation exactly at the tolerance and fails one just over it", () => {
    const s = spec([fundamental({ toleranceCents: 5 })]);
    const atEdge = evaluate(s, [strike([partial(atCents(440, 5))])]);
    expect(atEdge.requirements[0].deviationCents).toBeCloseTo(5, 9);
    expect(atEdge.requirements[0].pitch).toBe("pass");
    expect(atEdge.verdict).toBe("within_tolerance");
    expect(evaluate(s, [strike([partial(atCents(440, -5))])]).verdict).toBe("within_tolerance");

    const over = evaluate(s, [strike([partial(atCents(440, -5.01))])]);
    expect(over.requirements[0].pitch).toBe("fail");
    expect(over.verdict).toBe("out_of_tolerance");
    expect(over.reasons.join(" ")).toContain("5.0 cents flat of 440.00 Hz (tolerance ±5 cents)");
  });

  it("decides by the value alone, however large U is", () => {
    const f = atCents(440, 4);
    const r = evaluate(spec([fundamental()]), [strike([partial(f, { frequencyUncertaintyHz: uHzForExpandedCents(f, 3) })])]);
    expect(r.requirements[0].deviationUncertaintyCents).toBeCloseTo(3, 9);
    expect(r.requirements[0].pitch).toBe("pass");
  });
});

describe("evaluateUnit: pitch, guarded acceptance (ILAC-G8 §4.2.2, w = U)", () => {
  const s = spec([fundamental({ toleranceCents: 5 })], { decisionRule: "guarded" });
  // One strike, no temperature: u_c = u_fit, so U = 2 cents exactly when u = (U/2)·f·ln2/1200.
  const run = (dev: number) => {
    const f = atCents(440, dev);
    return evaluate(s, [strike([partial(f, { frequencyUncertaintyHz: uHzForExpandedCents(f, 2) })])]);
  };

  it("passes when |dev| + U ≤ tol, including the edge 3 + 2 = 5 cents", () => {
    expect(run(3).requirements[0].deviationUncertaintyCents).toBeCloseTo(2, 9);
    expect(run(3).requirements[0].pitch).toBe("pass");
    expect(run(-2.5).verdict).toBe("within_tolerance");
  });

  it("is inconclusive inside the guard band, including the edge 7 − 2 = 5 cents", () => {
    for (const dev of [3.5, 4, -5, 6, 7]) {
      const r = run(dev);
      expect(r.requirements[0].pitch, `deviation ${dev} cents`).toBe("inconclusive");
      expect(r.verdict).toBe("inconclusive");
    }
    expect(run(4).reasons.join(" ")).toContain("Deviation +4.0 ± 2.0 cents (U, k = 2) overlaps the ±5 cents limit");
  });

  it("fails when |dev| − U > tol", () => {
    expect(run(7.01).requirements[0].pitch).toBe("fail");
    expect(run(-9).verdict).toBe("out_of_tolerance");
    expect(run(-9).reasons.join(" ")).toContain("even allowing for U = 2.0 cents");
  });
});

describe("evaluateUnit: combining strikes (median, spread, GUM uncertainty)", () => {
  it("takes the median of three strikes, their spread in cents and U = 2·u_c", () => {
    const fs = [439.0, 441.0, 440.5];
    const us = [0.01, 0.03, 0.02];
    const s = spec([fundamental({ toleranceCents: 10 })], { strikesRequired: 3 });
    const r = evaluate(s, fs.map((f, i) => strike([partial(f, { frequencyUncertaintyHz: us[i] })])));
    const line = r.requirements[0];
    expect(line.measuredHz).toBeCloseTo(440.5, 12);
    expect(line.spreadCents).toBeCloseTo(centsOf(441, 439), 10); // ≈ 7.87 cents
    // GUM §4.2.2: s² = Σ(x − x̄)²/(n − 1); u_c² = u_fit² + s²/n with u_fit = median(0.01, 0.03, 0.02) = 0.02 Hz.
    const mean = (439 + 441 + 440.5) / 3;
    const s2 = ((439 - mean) ** 2 + (441 - mean) ** 2 + (440.5 - mean) ** 2) / 2;
    const uc = Math.sqrt(0.02 ** 2 + s2 / 3); // ≈ 0.6013 Hz
    expect(line.uncertaintyHz).toBeCloseTo(uc, 10);
    expect(line.expandedUncertaintyHz).toBeCloseTo(2 * uc, 10); // k = 2, GUM §6.3
    expect(line.deviationCents).toBeCloseTo(centsOf(440.5, 440), 10); // ≈ +1.97 cents
    expect(line.deviationUncertaintyCents).toBeCloseTo(toCents(440.5, 2 * uc), 10);
    expect(r.verdict).toBe("within_tolerance");
    expect(r.strikesUsed).toBe(3);
  });

  it("takes the mean of the two middle strikes for an even count", () => {
    const s = spec([fundamental({ toleranceCents: 10 })], { strikesRequired: 4 });
    const r = evaluate(s, [439, 440, 441, 440.2].map((f) => strike([partial(f)])));
    expect(r.requirements[0].measuredHz).toBeCloseTo(440.1, 12);
  });

  it("corrects each strike to the reference temperature and adds u_temp = |α|·f·(0.5 °C/√3)", () => {
    const s = spec([fundamental()], { tempCoefficientPerC: -1e-4, referenceTemperatureC: 20 });
    // At 30 °C a steel fork that is exactly 440 Hz at 20 °C rings at 440·(1 − 0.001) = 439.56 Hz.
    const r = evaluate(s, [strike([partial(440 * 0.999, { frequencyUncertaintyHz: 0.01 })], 30)]);
    const line = r.requirements[0];
    expect(r.temperatureCorrected).toBe(true);
    expect(line.measuredHz).toBeCloseTo(440, 10);
    expect(line.deviationCents).toBeCloseTo(0, 9);
    const uTemp = 1e-4 * 440 * (0.5 / Math.sqrt(3)); // rectangular ±0.5 °C, GUM §4.3.7: ≈ 0.0127 Hz
    const uFit = 0.01 / 0.999; // the fit uncertainty scales with the correction factor
    expect(line.uncertaintyHz).toBeCloseTo(Math.sqrt(uFit ** 2 + uTemp ** 2), 10);
    // Without a temperature nothing is corrected and there is no u_temp.
    const raw = evaluate(s, [strike([partial(440 * 0.999, { frequencyUncertaintyHz: 0.01 })])]);
    expect(raw.temperatureCorrected).toBe(false);
    expect(raw.requirements[0].deviationCents).toBeCloseTo(centsOf(439.56, 440), 9); // ≈ −1.73 cents
    expect(raw.requirements[0].uncertaintyHz).toBeCloseTo(0.01, 12);
  });
});

describe("evaluateUnit: ratio targets", () => {
  it("judges the measured ratio f/f_fund against the target ratio and combines both uncertainties", () => {
    const s = spec([fundamental(), overtone(2.757, { toleranceCents: 15 })]);
    const f1 = 440;
    const f2 = 440 * 2.757 * 2 ** (-20 / 1200); // ratio 20 cents below target
    const r = evaluate(s, [strike([partial(f1, { frequencyUncertaintyHz: f1 * 1e-4 }), partial(f2, { frequencyUncertaintyHz: f2 * 2e-4 })])]);
    const line = r.requirements[1];
    expect(line.measuredRatio).toBeCloseTo(2.757 * 2 ** (-20 / 1200), 10);
    expect(line.targetRatio).toBe(2.757);
    expect(line.targetHz).toBeCloseTo(2.757 * 440, 9);
    expect(line.deviationCents).toBeCloseTo(-20, 9);
    // Relative uncertainties of a quotient add in quadrature (GUM §5.1.6): √(1e-4² + 2e-4²), then k = 2.
    expect(line.deviationUncertaintyCents).toBeCloseTo((1200 / Math.LN2) * 2 * Math.hypot(1e-4, 2e-4), 9);
    expect(line.pitch).toBe("fail");
    expect(line.note).toContain("cents below the target 2.757");
    expect(r.verdict).toBe("out_of_tolerance");
  });

  it("passes a right ratio on a mistuned fundamental (the ratio follows the measured fundamental)", () => {
    const s = spec([fundamental(), overtone(2.757)]);
    const r = evaluate(s, [strike([partial(430), partial(430 * 2.757 * 2 ** (10 / 1200))])]);
    expect(r.requirements[1].deviationCents).toBeCloseTo(10, 9);
    expect(r.requirements[1].pitch).toBe("pass");
    expect(r.requirements[0].pitch).toBe("fail");
  });

  it("cancels the temperature in a ratio, and gives the ratio of an absolute overtone for the ledger", () => {
    const s = spec([fundamental(), overtone(6.267, { toleranceCents: 100 }), { label: "Hum", targetKind: "absolute", targetHz: 220, toleranceCents: 20, required: false }]);
    const r = evaluate(s, [strike([partial(219), partial(440), partial(440 * 6)], 35)]);
    expect(r.requirements[1].measuredRatio).toBeCloseTo(6, 12);
    expect(r.requirements[1].deviationCents).toBeCloseTo(centsOf(6, 6.267), 9); // ≈ −75 cents
    expect(r.requirements[2].measuredRatio).toBeCloseTo(219 / 440, 12);
  });
});

describe("evaluateUnit: strikes required and missing partials", () => {
  it("is inconclusive with too few strikes, saying how many", () => {
    const s = spec([fundamental()], { strikesRequired: 3 });
    const r = evaluate(s, [strike([partial(440)]), strike([partial(440.1)])]);
    expect(r.verdict).toBe("inconclusive");
    expect(r.reasons[0]).toBe("2 of 3 strikes measured: record 1 more strike of this unit.");
    expect(r.requirements[0].pitch).toBe("pass");
    // A failing line is still reported while strikes are missing.
    const bad = evaluate(s, [strike([partial(450)])]);
    expect(bad.verdict).toBe("inconclusive");
    expect(bad.reasons[0]).toContain("1 of 3 strikes measured");
    expect(bad.reasons[1]).toContain("Fundamental:");
    const none = evaluate(s, []);
    expect(none.verdict).toBe("inconclusive");
    expect(none.requirements[0].result).toBe("not_checked");
    expect(none.reasons).toEqual(["0 of 3 strikes measured: record 3 more strikes of this unit."]);
  });

  it("fails a required partial that is not found, and ignores a missing optional one", () => {
    const required = evaluate(spec([fundamental(), overtone(2.757)]), [strike([partial(440)])]);
    expect(required.requirements[1].pitch).toBe("not_found");
    expect(required.requirements[1].result).toBe("fail");
    expect(required.requirements[1].note).toContain("Not found");
    expect(required.verdict).toBe("out_of_tolerance");

    const optional = evaluate(spec([fundamental(), overtone(2.757, { required: false })]), [strike([partial(440)])]);
    expect(optional.requirements[1].result).toBe("not_found");
    expect(optional.verdict).toBe("within_tolerance");
  });

  it("fails a required partial missing from one of three strikes, naming the strike", () => {
    const s = spec([fundamental(), overtone(2.757)], { strikesRequired: 3 });
    const r = evaluate(s, [strike([partial(440), partial(440 * 2.757)]), strike([partial(440)]), strike([partial(440), partial(440 * 2.757)])]);
    expect(r.requirements[1].result).toBe("fail");
    expect(r.requirements[1].pitch).toBe("pass");
    expect(r.requirements[1].note).toContain("Not found in strike 2 of 3");
    expect(r.verdict).toBe("out_of_tolerance");
  });

  it("reports an optional line out of tolerance without letting it decide", () => {
    const r = evaluate(spec([fundamental(), overtone(2.757, { required: false })]), [strike([partial(440), partial(440 * 2.757 * 2 ** (40 / 1200))])]);
    expect(r.requirements[1].result).toBe("fail");
    expect(r.verdict).toBe("within_tolerance");
    expect(r.reasons.join(" ")).toContain("does not affect the verdict");
  });
});

describe("evaluateUnit: decay and beat checks", () => {
  const ln1000 = Math.log(1000);

  it("checks T60 = τ·ln1000 against a minimum", () => {
    const s = spec([fundamental({ minT60S: 5 })]);
    const pass = evaluate(s, [strike([partial(440, { tauS: 1 })])]); // T60 = 6.91 s
    expect(pass.requirements[0].t60S).toBeCloseTo(ln1000, 12);
    expect(pass.requirements[0].t60).toBe("pass");
    const fail = evaluate(s, [strike([partial(440, { tauS: 0.5 })])]); // T60 = 3.45 s
    expect(fail.requirements[0].t60).toBe("fail");
    expect(fail.verdict).toBe("out_of_tolerance");
    expect(fail.reasons.join(" ")).toContain("T60 3.45 s is below the minimum 5.00 s");
  });

  it("applies the guard band to T60, with U from tauUncertaintyS·ln1000 (k = 2)", () => {
    const partials = [partial(440, { tauS: 0.75, tauUncertaintyS: 0.02 })]; // T60 5.18 s, U = 2·0.02·ln1000 = 0.276 s
    const guarded = evaluate(spec([fundamental({ minT60S: 5 })], { decisionRule: "guarded" }), [strike(partials)]);
    expect(guarded.requirements[0].t60UncertaintyS).toBeCloseTo(2 * 0.02 * ln1000, 12);
    expect(guarded.requirements[0].t60).toBe("inconclusive");
    expect(guarded.verdict).toBe("inconclusive");
    expect(evaluate(spec([fundamental({ minT60S: 5 })]), [strike(partials)]).requirements[0].t60).toBe("pass");
  });

  it("adds the model error of an extrapolated T60 to its U, and says from how many dB it was extrapolated", () => {
    // τ 0.75 ± 0.002 s (fit) and ± 0.03 s (model: the envelope check), 12 dB of decay seen:
    // u(T60) = ln1000·√(0.002² + 0.03²) = 0.2077 s, U = 0.415 s; T60 5.18 s − U < 5 s → inconclusive.
    const partials = [partial(440, { tauS: 0.75, tauUncertaintyS: 0.002, tauModelUncertaintyS: 0.03, observedDecayDb: 12 })];
    const guarded = evaluate(spec([fundamental({ minT60S: 5 })], { decisionRule: "guarded" }), [strike(partials)]);
    expect(guarded.requirements[0].t60UncertaintyS).toBeCloseTo(2 * ln1000 * Math.hypot(0.002, 0.03), 12);
    expect(guarded.requirements[0].t60).toBe("inconclusive");
    expect(guarded.requirements[0].t60ObservedDecayDb).toBe(12);
    expect(guarded.requirements[0].note).toContain("(extrapolated from 12 dB of decay)");
    // Without the model term the fit's bound alone (U = 0.028 s) would have passed it.
    const fitOnly = evaluate(spec([fundamental({ minT60S: 5 })], { decisionRule: "guarded" }), [strike([partial(440, { tauS: 0.75, tauUncertaintyS: 0.002 })])]);
    expect(fitOnly.requirements[0].t60).toBe("pass");
  });

  it("says why τ is unreliable: a decay that is not exponential asks for a free ring, not a longer recording", () => {
    const r = evaluate(spec([fundamental({ minT60S: 5 })]), [strike([partial(440, { tauS: 2, tauUnreliable: true, nonExponential: true })])]);
    expect(r.requirements[0].t60).toBe("inconclusive");
    expect(r.requirements[0].note).toContain("its decay is not exponential");
    expect(r.requirements[0].t60Unreliable).toBe(true);
    expect(r.requirements[0].note).not.toContain("Record a longer strike");
  });

  it("makes T60 and Q inconclusive when τ is unreliable, asking for a longer recording", () => {
    const s = spec([fundamental({ minT60S: 5, minQ: 1000 })]);
    const r = evaluate(s, [strike([partial(440, { tauS: 20, tauUnreliable: true })])]);
    expect(r.requirements[0].t60).toBe("inconclusive");
    expect(r.requirements[0].qResult).toBe("inconclusive");
    expect(r.requirements[0].pitch).toBe("pass");
    expect(r.verdict).toBe("inconclusive");
    expect(r.requirements[0].note).toContain("Record a longer strike");
  });

  it("checks Q = π·f·τ against a minimum", () => {
    // π·440·1 s = 1382.3
    const r = evaluate(spec([fundamental({ minQ: 1000 })]), [strike([partial(440, { tauS: 1 })])]);
    expect(r.requirements[0].q).toBeCloseTo(Math.PI * 440, 9);
    expect(r.requirements[0].qResult).toBe("pass");
    expect(evaluate(spec([fundamental({ minQ: 1400 })]), [strike([partial(440, { tauS: 1 })])]).requirements[0].qResult).toBe("fail");
  });

  it("counts a missing beat as 0 Hz and fails a beat over the maximum", () => {
    const s = spec([fundamental({ maxBeatHz: 0.5 })]);
    const single = evaluate(s, [strike([partial(440)])]);
    expect(single.requirements[0].beat).toBe("pass");
    expect(single.requirements[0].beatHz).toBeNull();
    const beating = evaluate(s, [strike([partial(440, { beatHz: 1.2 })])]);
    expect(beating.requirements[0].beatHz).toBeCloseTo(1.2, 12);
    expect(beating.requirements[0].beat).toBe("fail");
    expect(beating.verdict).toBe("out_of_tolerance");
  });

  it("leaves checks without a limit as not checked", () => {
    const r = evaluate(spec([fundamental()]), [strike([partial(440)])]);
    expect([r.requirements[0].t60, r.requirements[0].qResult, r.requirements[0].beat]).toEqual(["not_checked", "not_checked", "not_checked"]);
    expect(r.requirements[0].result).toBe("pass");
    expect(r.reasons).toEqual(["Every required partial is within its limits."]);
  });
});

describe("evaluateUnit: labels for the strike page", () => {
  it("tells which measured partial carries which spec label, per strike segment", () => {
    const s = spec([fundamental(), overtone(6.267, { label: "First overtone", toleranceCents: 100 })]);
    const a: EvaluationStrikeInput = { strikeId: "rec-1", segment: 0, temperatureC: null, partials: [partial(120), partial(440.2), partial(2650)] };
    const b: EvaluationStrikeInput = { strikeId: "rec-1", segment: 1, temperatureC: null, partials: [partial(439.9)] };
    const r = evaluate(s, [a, b]);
    expect(r.labels).toEqual([
      { strikeId: "rec-1", segment: 0, labels: { 1: "Fundamental", 2: "First overtone" } },
      { strikeId: "rec-1", segment: 1, labels: { 0: "Fundamental" } },
    ]);
  });
});

describe("tuningGuidance", () => {
  it("tells a flat fork to be raised by grinding the tine ends, with the f ∝ 1/L² length estimate", () => {
    const s = spec([fundamental()], { lengthMm: 80 });
    const r = evaluate(s, [strike([partial(430)])]);
    const g = r.guidance!;
    expect(g.direction).toBe("raise");
    expect(g.cents).toBeCloseTo(Math.abs(centsOf(430, 440)), 1); // 39.8 cents
    expect(g.remedy).toContain("grinding the tine ends raises the pitch");
    // Euler–Bernoulli: f ∝ 1/L², so f_target/f_measured = (L/L_new)² → L_new = 80/√(440/430) = 79.09 mm.
    const newL = 80 / Math.sqrt(440 / 430);
    expect(g.estimate).toContain(`${newL.toFixed(2)} mm`);
    expect(g.estimate).toContain(`about ${(80 - newL).toFixed(2)} mm to remove`); // 0.91 mm
    expect(g.estimate).toContain("remove less, then measure again");
    expect(g.caution).toContain("eye and hearing protection");
    expect(g.caution).toContain("dust extraction");
    expect(g.caution).toContain("clinical or laboratory");
  });

  it("tells a sharp fork to be lowered by thinning near the crotch, without a length estimate", () => {
    const g = evaluate(spec([fundamental()], { lengthMm: 80 }), [strike([partial(450)])]).guidance!;
    expect(g.direction).toBe("lower");
    expect(g.remedy).toContain("near the crotch");
    expect(g.estimate).toBeNull();
  });

  it("gives no guidance within tolerance, nor for an inconclusive pitch", () => {
    expect(evaluate(spec([fundamental()]), [strike([partial(440.5)])]).guidance).toBeNull();
    const f = atCents(440, 4);
    const guarded = evaluate(spec([fundamental()], { decisionRule: "guarded" }), [strike([partial(f, { frequencyUncertaintyHz: uHzForExpandedCents(f, 2) })])]);
    expect(guarded.guidance).toBeNull();
  });

  it("uses each family's remedy, and no beam estimate for bells and bowls", () => {
    const line = evaluate(spec([fundamental()]), [strike([partial(430)])]).requirements[0];
    const bar = tuningGuidance(spec([fundamental()], { family: "free_bar", lengthMm: 300 }), line)!;
    expect(bar.remedy).toContain("ends of the bar");
    expect(bar.estimate).toContain("shared between the two ends");
    expect(bar.caution).not.toContain("clinical");
    const sharp = evaluate(spec([fundamental()]), [strike([partial(450)])]).requirements[0];
    expect(tuningGuidance(spec([fundamental()], { family: "free_bar" }), sharp)!.remedy).toContain("underside of the bar at its middle");
    expect(tuningGuidance(spec([fundamental()], { family: "tube", lengthMm: 500 }), line)!.remedy).toContain("Shorten the tube");
    const bell = tuningGuidance(spec([fundamental()], { family: "handbell", lengthMm: 100 }), sharp)!;
    expect(bell.remedy).toContain("Removing metal from the inside lowers the bell");
    expect(bell.remedy).toContain("workshop's own tuning practice");
    expect(bell.estimate).toBeNull();
    expect(tuningGuidance(spec([fundamental()], { family: "bowl" }), line)!.remedy).toContain("where metal is removed decides");
  });
});

describe("bad input", () => {
  it("refuses a ratio target without a fundamental, naming the partial", () => {
    const s = { ...spec([fundamental(), overtone(2.757)]) };
    s.partials = s.partials.map((p) => ({ ...p, isFundamental: false }));
    expect(() => evaluate(s, [])).toThrow(EvaluationInputError);
    expect(() => evaluate(s, [])).toThrow('Partial "Overtone" is a ratio to the fundamental, but no other partial is marked as the fundamental; mark one.');
  });

  it("refuses a non-finite temperature or measured value", () => {
    const s = spec([fundamental()]);
    expect(() => evaluate(s, [{ strikeId: "x", segment: 2, temperatureC: Number.NaN, partials: [] }])).toThrow("Strike x (segment 2) has temperature NaN");
    expect(() => evaluate(s, [strike([partial(440, { frequencyUncertaintyHz: Number.NaN })])])).toThrow("frequencyUncertaintyHz = NaN");
  });
});

describe("sample clock", () => {
  it("adds the sample-clock term u = f·(50 ppm)/√3 (GUM §4.3.7, rectangular) to absolute frequencies", () => {
    const s = spec([fundamental()]);
    const f = 440;
    const without = evaluate(s, [strike([partial(f, { frequencyUncertaintyHz: 0.001 })])]).requirements[0];
    const withClock = evaluateUnit(s, [strike([partial(f, { frequencyUncertaintyHz: 0.001 })])]).requirements[0];
    const uClock = (f * SAMPLE_CLOCK_HALF_WIDTH_PPM * 1e-6) / Math.sqrt(3);
    expect(without.uncertaintyHz).toBeCloseTo(0.001, 12);
    expect(withClock.uncertaintyHz).toBeCloseTo(Math.hypot(0.001, uClock), 12);
  });
});
