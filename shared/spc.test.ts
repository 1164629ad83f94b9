import { describe, expect, it } from "vitest";
import {
  capability,
  D2_N2,
  D3_N2,
  D4_N2,
  E2_N2,
  histogram,
  individualsChart,
  individualsChartWithRules,
  LOW_CONFIDENCE_BELOW,
  mean,
  movingRanges,
  NELSON_RULES,
  nelsonRules,
  sampleStandardDeviation,
  SpcInputError,
  t60LowerCapability,
  toleranceCapability,
  type NelsonRuleId,
} from "./spc";

/**
 * A 32-value set drawn once with NumPy (default_rng(7), normal(0.8, 1.6), rounded to 0.1 cent).
 * Reference numbers for it were computed with NumPy 2.4.6 (Debian python3-numpy), an
 * independent general-purpose library: mean, std(ddof=1), mean(abs(diff)), histogram.
 */
const SAMPLE = [
  0.8, 1.3, 0.4, -0.6, 0.1, -0.8, 0.9, 2.9, 0.0, -0.2, 1.6, 1.4, 1.0, -0.7, 0.8, 1.9, -1.4, 0.1, -2.2, -1.3, -2.1, 0.4, -1.2, 1.2, 1.1, 0.5,
  -3.2, -0.1, 0.7, 1.0, -1.6, 0.0,
];

describe("chart constants for a moving range of two", () => {
  // d₂(2) is the expected range of two independent N(0,1) values: X₁ − X₂ ~ N(0, 2), so
  // E|X₁ − X₂| = √2·√(2/π) = 2/√π; d₃(2)² = E[R²] − d₂² = 2 − 4/π. Tabulated values
  // d₂ = 1.128, E₂ = 3/d₂ = 2.66, D₄ = 1 + 3d₃/d₂ = 3.267, D₃ = 0: NIST/SEMATECH e-Handbook §6.3.2.
  const d2 = 2 / Math.sqrt(Math.PI);
  const d3 = Math.sqrt(2 - 4 / Math.PI);

  it("d₂ = 1.128 follows from the definition (NIST/SEMATECH e-Handbook §6.3.2)", () => {
    expect(D2_N2).toBeCloseTo(d2, 3);
  });
  it("E₂ = 3/d₂ = 2.66 (NIST/SEMATECH e-Handbook §6.3.2)", () => {
    expect(E2_N2).toBeCloseTo(3 / d2, 2);
  });
  it("D₄ = 1 + 3·d₃/d₂ = 3.267 and D₃ = max(0, 1 − 3·d₃/d₂) = 0 (NIST/SEMATECH e-Handbook §6.3.2)", () => {
    expect(D4_N2).toBeCloseTo(1 + (3 * d3) / d2, 3);
    expect(D3_N2).toBe(Math.max(0, 1 - (3 * d3) / d2));
  });
});

describe("individualsChart", () => {
  it("computes x̄, MR̄ and the limits of a hand-computable set (definition, NIST §6.3.2)", () => {
    // 1,3,2,4,3: x̄ = 13/5 = 2.6; MR = 2,1,2,1 → MR̄ = 1.5; UCL = 2.6 + 2.66·1.5 = 6.59;
    // LCL = 2.6 − 3.99 = −1.39; MR UCL = 3.267·1.5 = 4.9005.
    const c = individualsChart([1, 3, 2, 4, 3]);
    expect(c.n).toBe(5);
    expect(c.mean).toBeCloseTo(2.6, 12);
    expect(c.mrBar).toBeCloseTo(1.5, 12);
    expect(c.ucl).toBeCloseTo(6.59, 12);
    expect(c.lcl).toBeCloseTo(-1.39, 12);
    expect(c.mrUcl).toBeCloseTo(4.9005, 12);
    expect(c.mrLcl).toBe(0);
    expect(c.sigmaWithin).toBeCloseTo(1.5 / 1.128, 12);
    expect(c.movingRanges).toEqual([null, 2, 1, 2, 1]);
    expect(c.mrAboveLimit).toEqual([false, false, false, false, false]);
    expect(c.degenerate).toBe(false);
  });

  it("matches NumPy's mean and mean absolute difference on a 32-value set", () => {
    const c = individualsChart(SAMPLE);
    expect(c.mean).toBeCloseTo(0.084375, 10); // NumPy 2.4.6: np.mean
    expect(c.mrBar).toBeCloseTo(1.4709677419354839, 10); // NumPy 2.4.6: np.abs(np.diff(x)).mean()
    expect(c.sigmaWithin).toBeCloseTo(1.3040494166094716, 10);
  });

  it("flags a moving range above 3.267·MR̄", () => {
    const values = [0, 0.1, 0, 0.1, 0, 0.1, 0, 0.1, 0, 5];
    const c = individualsChart(values);
    // MR̄ = (8·0.1 + 5)/9 = 0.6444…; limit 2.105; only the last jump of 5 exceeds it.
    expect(c.mrUcl).toBeCloseTo(3.267 * (5.8 / 9), 12);
    expect(c.mrAboveLimit).toEqual([false, false, false, false, false, false, false, false, false, true]);
  });

  it("marks equal values as degenerate instead of inventing limits", () => {
    const c = individualsChart([2, 2, 2]);
    expect(c.degenerate).toBe(true);
    expect(c.ucl).toBe(2);
    expect(individualsChartWithRules([2, 2, 2]).points.every((p) => p.breaks.length === 0)).toBe(true);
  });

  it("refuses fewer than two values and non-finite values with a message saying what to do", () => {
    expect(() => individualsChart([1])).toThrow(SpcInputError);
    expect(() => individualsChart([1])).toThrow(/at least 2 values, got 1; measure more units/);
    expect(() => individualsChart([1, Number.NaN, 2])).toThrow(/position 2 is NaN/);
    expect(() => individualsChart([1, Infinity])).toThrow(/finite number/);
  });
});

describe("mean, sampleStandardDeviation, movingRanges", () => {
  it("NIST StRD univariate set NumAcc1 (from memory: 10000001, 10000003, 10000002; certified mean 10000002, s = 1)", () => {
    // Also hand-checkable: deviations −1, 1, 0 → s² = 2/2 = 1. A one-pass Σx² formula loses these digits.
    expect(mean([10000001, 10000003, 10000002])).toBe(10000002);
    expect(sampleStandardDeviation([10000001, 10000003, 10000002])).toBeCloseTo(1, 12);
  });
  it("matches NumPy's std(ddof=1) on a 32-value set", () => {
    expect(sampleStandardDeviation(SAMPLE)).toBeCloseTo(1.325946861923645, 12); // NumPy 2.4.6
  });
  it("moving ranges are |xᵢ − xᵢ₋₁|", () => {
    expect(movingRanges([3, 1, 4, 1, 5])).toEqual([2, 3, 3, 4]);
  });
  it("explains why a standard deviation of one value is refused", () => {
    expect(() => sampleStandardDeviation([4])).toThrow(/at least 2 values, got 1/);
    expect(() => mean([])).toThrow(/at least 1 values, got 0/);
  });
});

/** Rules that fire anywhere in the sequence. */
function rulesFired(values: number[], centre = 0, sigma = 1): NelsonRuleId[] {
  return [...new Set(nelsonRules(values, { centre, sigma }).signals.map((s) => s.rule))].sort();
}

// Definitions of the tests: Nelson, L. S. (1984), "The Shewhart Control Chart — Tests for Special
// Causes", J. Quality Technology 16(4). Each case below is built from the rule's definition with a
// one-point-short counterpart that must NOT fire, so an off-by-one in a window length fails.
describe("Nelson rules (Nelson 1984, J. Quality Technology 16(4))", () => {
  it("rule 1: one point beyond 3σ; a point at exactly 3σ does not fire", () => {
    const r = nelsonRules([0.2, -0.3, 3.2, 0.1], { centre: 0, sigma: 1 });
    expect(r.points[2].breaks.map((b) => b.rule)).toContain(1);
    expect(r.points[0].breaks).toEqual([]);
    expect(rulesFired([0.2, -0.3, 3, 0.1])).not.toContain(1);
    expect(rulesFired([0.2, -3.01, 0.1])).toContain(1);
  });

  it("rule 2: nine in a row on one side fire, eight do not, a point on the centre breaks the run", () => {
    const nine = [-0.5, 0.3, 0.5, 0.2, 0.4, 0.6, 0.1, 0.3, 0.2, 0.5, -0.4];
    const r = nelsonRules(nine, { centre: 0, sigma: 1 });
    expect(r.signals.filter((s) => s.rule === 2)).toEqual([{ rule: 2, start: 1, end: 9 }]);
    expect(r.points.slice(1, 10).every((p) => p.breaks.some((b) => b.rule === 2))).toBe(true);
    expect(r.points[0].breaks.some((b) => b.rule === 2)).toBe(false);
    expect(rulesFired([-0.5, 0.3, 0.5, 0.2, 0.4, 0.6, 0.1, 0.3, 0.2, -0.4])).not.toContain(2);
    expect(rulesFired([0.3, 0.5, 0.2, 0.4, 0, 0.6, 0.1, 0.3, 0.2, 0.5])).not.toContain(2);
  });

  it("rule 3: six in a row steadily rising fire, five do not, a tie breaks the run", () => {
    expect(rulesFired([0, -0.5, -0.3, -0.1, 0.1, 0.3, 0.5, 0.2])).toContain(3);
    expect(rulesFired([0.9, 0.7, 0.5, 0.3, 0.1, -0.1])).toContain(3); // falling
    expect(rulesFired([0, -0.5, -0.3, -0.1, 0.1, 0.3, 0.2])).not.toContain(3);
    expect(rulesFired([-0.5, -0.3, -0.1, -0.1, 0.1, 0.3])).not.toContain(3);
  });

  it("rule 4: fourteen alternating fire, thirteen do not", () => {
    const alt = (n: number) => Array.from({ length: n }, (_, i) => (i % 2 ? 0.4 : -0.4) + i * 0.001);
    expect(rulesFired(alt(14))).toContain(4);
    expect(rulesFired(alt(13))).not.toContain(4);
    const r = nelsonRules(alt(14), { centre: 0, sigma: 1 });
    expect(r.points.every((p) => p.breaks.some((b) => b.rule === 4))).toBe(true);
  });

  it("rule 5: two of three beyond 2σ on the same side; on opposite sides it does not fire", () => {
    const r = nelsonRules([0, 2.5, 0.3, 2.2, 0], { centre: 0, sigma: 1 });
    expect(r.points[1].breaks.map((b) => b.rule)).toContain(5);
    expect(r.points[3].breaks.map((b) => b.rule)).toContain(5);
    expect(r.points[2].breaks.map((b) => b.rule)).not.toContain(5); // inside the window but not out
    expect(rulesFired([0, 2.5, 0.3, -2.2, 0])).not.toContain(5);
  });

  it("rule 6: four of five beyond 1σ on the same side; three do not", () => {
    expect(rulesFired([1.5, 1.2, 0.2, 1.8, 1.1])).toContain(6);
    expect(rulesFired([1.5, 1.2, 0.2, 0.8, 1.1])).not.toContain(6);
  });

  it("rule 7: fifteen within 1σ fire, fourteen do not", () => {
    const hug = (n: number) => Array.from({ length: n }, (_, i) => (i % 3) * 0.3 - 0.3);
    expect(rulesFired([2, ...hug(15), 2])).toContain(7);
    expect(rulesFired([2, ...hug(14), 2])).not.toContain(7);
  });

  it("rule 8: eight beyond 1σ on either side fire, seven do not", () => {
    const avoid = [1.5, -1.5, 1.2, -1.3, 1.6, -1.4, 1.1, -1.2];
    expect(rulesFired([0, ...avoid, 0])).toContain(8);
    expect(rulesFired([0, ...avoid.slice(0, 7), 0])).not.toContain(8);
  });

  it("every rule carries a name and a plain description for the hover", () => {
    for (const id of [1, 2, 3, 4, 5, 6, 7, 8] as const) {
      expect(NELSON_RULES[id].rule).toBe(id);
      expect(NELSON_RULES[id].name.length).toBeGreaterThan(5);
      expect(NELSON_RULES[id].description).toMatch(/\.$/);
    }
    const p = nelsonRules([0, 4], { centre: 0, sigma: 1 }).points[1];
    expect(p.breaks[0]).toMatchObject({ rule: 1, name: NELSON_RULES[1].name, description: NELSON_RULES[1].description });
  });

  it("runs only the rules asked for", () => {
    const r = nelsonRules([0, 4, 4.2], { centre: 0, sigma: 1, rules: [1] });
    expect(r.signals.every((s) => s.rule === 1)).toBe(true);
  });

  it("refuses σ ≤ 0", () => {
    expect(() => nelsonRules([1, 2], { centre: 0, sigma: 0 })).toThrow(/σ must be a positive number, got 0/);
  });

  it("individualsChartWithRules: a point beyond the drawn UCL is exactly a rule-1 point", () => {
    const values = [0.1, -0.2, 0.3, 0, -0.1, 0.2, 0.1, -0.3, 0, 3];
    const c = individualsChartWithRules(values);
    for (const p of c.points) {
      const beyond = p.value > c.ucl || p.value < c.lcl;
      expect(p.breaks.some((b) => b.rule === 1)).toBe(beyond);
    }
    expect(c.points[9].breaks.some((b) => b.rule === 1)).toBe(true);
  });
});

// Cp = (USL − LSL)/6σ, Cpk = min(USL − μ, μ − LSL)/3σ, Cpl = (μ − LSL)/3σ:
// Montgomery, Introduction to Statistical Quality Control (process capability chapter).
describe("capability (Montgomery, Introduction to Statistical Quality Control)", () => {
  it("a hand-computable set: Cp, Cpk from MR̄/d₂ and Pp, Ppk from the overall s", () => {
    // values 1,2,1,2, limits 0…4: μ = 1.5; MR̄ = 1 → σw = 1/1.128; s = √(1/3).
    const c = capability([1, 2, 1, 2], { lsl: 0, usl: 4 });
    expect(c.sigmaWithin).toBeCloseTo(1 / 1.128, 12);
    expect(c.cp).toBeCloseTo(4 / (6 / 1.128), 12);
    expect(c.cpk).toBeCloseTo(1.5 / (3 / 1.128), 12); // the lower side is nearer
    expect(c.cpl).toBeCloseTo(1.5 / (3 / 1.128), 12);
    expect(c.cpu).toBeCloseTo(2.5 / (3 / 1.128), 12);
    expect(c.sigmaOverall).toBeCloseTo(Math.sqrt(1 / 3), 12);
    expect(c.pp).toBeCloseTo(4 / (6 * Math.sqrt(1 / 3)), 12);
    expect(c.ppk).toBeCloseTo(1.5 / (3 * Math.sqrt(1 / 3)), 12);
  });

  it("Cpk = Cp·(1 − k), k = |m − μ|/((USL − LSL)/2) (Montgomery; relation from memory, follows from the definitions)", () => {
    const c = toleranceCapability(SAMPLE, 5);
    const k = Math.abs(0 - c.mean) / 5;
    expect(c.cpk!).toBeCloseTo(c.cp! * (1 - k), 12);
    expect(c.ppk!).toBeCloseTo(c.pp! * (1 - k), 12);
  });

  it("a centred process has Cpk = Cp", () => {
    const c = toleranceCapability([-1, 1, -1, 1, 0, 0], 3);
    expect(c.mean).toBeCloseTo(0, 12);
    expect(c.cpk!).toBeCloseTo(c.cp!, 12);
  });

  it("±5 cents on the 32-value set matches the definitions evaluated with NumPy 2.4.6", () => {
    const c = toleranceCapability(SAMPLE, 5);
    expect(c.cp).toBeCloseTo(1.2780701754385964, 10);
    expect(c.cpk).toBeCloseTo(1.25650274122807, 10);
    expect(c.pp).toBeCloseTo(1.2569633931247557, 10);
    expect(c.ppk).toBeCloseTo(1.2357521358657755, 10);
    expect(c.lowConfidence).toBe(false);
  });

  it(`flags low confidence under ${LOW_CONFIDENCE_BELOW} values and not at ${LOW_CONFIDENCE_BELOW}`, () => {
    expect(toleranceCapability(SAMPLE.slice(0, 29), 5).lowConfidence).toBe(true);
    expect(toleranceCapability(SAMPLE.slice(0, 29), 5).notes.join(" ")).toMatch(/low confidence/);
    expect(toleranceCapability(SAMPLE.slice(0, 30), 5).lowConfidence).toBe(false);
  });

  it("a process off the tolerance has a negative Cpk", () => {
    const c = toleranceCapability([6, 7, 6.5, 7.2], 5);
    expect(c.cpk!).toBeLessThan(0);
  });

  it("returns null indices and says why when all values are equal", () => {
    const c = toleranceCapability([1, 1, 1], 5);
    expect(c.cp).toBeNull();
    expect(c.ppk).toBeNull();
    expect(c.notes.join(" ")).toMatch(/all values equal/);
  });

  it("refuses a tolerance that is not positive, inverted limits and no limits", () => {
    expect(() => toleranceCapability([1, 2], 0)).toThrow(/tolerance must be a positive number of cents, got 0/);
    expect(() => capability([1, 2], { lsl: 3, usl: 1 })).toThrow(/upper limit \(1\) must be above the lower limit \(3\)/);
    expect(() => capability([1, 2], {})).toThrow(/at least one specification limit/);
  });
});

describe("t60LowerCapability (one-sided Cpl, Montgomery; log of T60)", () => {
  it("ln T60 = 1,2,1,2 against a minimum of 1 s (ln 1 = 0): Cpl = 1.5/(3·MR̄/d₂)", () => {
    const e = Math.E;
    const c = t60LowerCapability([e, e * e, e, e * e], 1);
    expect(c.mean).toBeCloseTo(1.5, 12);
    expect(c.cpk).toBeCloseTo(1.5 / (3 / 1.128), 12);
    expect(c.cpl).toBe(c.cpk);
    expect(c.cpu).toBeNull();
    expect(c.ppk).toBeCloseTo(1.5 / (3 * Math.sqrt(1 / 3)), 12);
    expect(c.cp).toBeNull(); // one-sided: no Cp
    expect(c.lowConfidence).toBe(true);
  });

  it("does not depend on the log base (a ratio of logs)", () => {
    const t = [2.1, 2.6, 1.9, 2.4, 3.0, 2.2];
    const cpl = t60LowerCapability(t, 1.5).cpk!;
    const l10 = t.map(Math.log10);
    const m = l10.reduce((a, b) => a + b) / l10.length;
    const mrBar = movingRanges(l10).reduce((a, b) => a + b) / (l10.length - 1);
    expect(cpl).toBeCloseTo((m - Math.log10(1.5)) / (3 * (mrBar / 1.128)), 10);
  });

  it("refuses a T60 or minimum that is not a positive number of seconds", () => {
    expect(() => t60LowerCapability([1, 0, 2], 1)).toThrow(/T60 at position 2 is 0 s/);
    expect(() => t60LowerCapability([1, 2], -1)).toThrow(/minimum T60 must be a positive number of seconds/);
  });
});

// NumPy 2.4.6 `np.histogram` is the reference: equal-width bins, half-open except the last.
describe("histogram (checked against NumPy 2.4.6 np.histogram)", () => {
  it("six bins by Sturges' rule on 32 values", () => {
    const h = histogram(SAMPLE);
    expect(h.counts).toEqual([2, 5, 4, 11, 8, 2]); // np.histogram(x, bins="sturges")
    const ref = [-3.2, -2.1833333333333336, -1.166666666666667, -0.15000000000000036, 0.8666666666666663, 1.8833333333333329, 2.9];
    h.edges.forEach((e, i) => expect(e).toBeCloseTo(ref[i], 12));
    expect(h.below + h.above).toBe(0);
  });

  it("an explicit range of [−5, 5] in 8 bins", () => {
    const h = histogram(SAMPLE, { bins: 8, range: [-5, 5] });
    expect(h.counts).toEqual([0, 1, 5, 6, 15, 4, 1, 0]); // np.histogram(x, bins=8, range=(-5, 5))
    expect(h.binWidth).toBeCloseTo(1.25, 12);
  });

  it("the last bin holds its upper edge; inner bins are half-open", () => {
    expect(histogram([0, 1, 1, 2, 3, 3, 3], { bins: 3 }).counts).toEqual([1, 2, 4]); // NumPy: [1, 2, 4]
  });

  it("a single value is widened by ±0.5 like NumPy", () => {
    const h = histogram([2], { bins: 3 });
    expect(h.counts).toEqual([0, 1, 0]); // NumPy: [0, 1, 0], edges 1.5 … 2.5
    expect(h.edges[0]).toBeCloseTo(1.5, 12);
    expect(h.edges[3]).toBeCloseTo(2.5, 12);
  });

  it("a bin width anchored at 0 puts edges on whole multiples (tolerance limits fall on edges)", () => {
    const h = histogram([-3.2, -0.4, 0.2, 0.9, 4.1], { binWidth: 1, anchor: 0 });
    expect(h.edges[0]).toBe(-4);
    expect(h.edges[h.edges.length - 1]).toBe(5);
    expect(h.counts).toEqual([1, 0, 0, 1, 2, 0, 0, 0, 1]);
    expect(h.counts.reduce((a, b) => a + b)).toBe(5);
  });

  it("counts values outside an explicit range separately", () => {
    const h = histogram([-10, 0, 1, 10], { bins: 2, range: [0, 2] });
    expect(h.counts).toEqual([1, 1]);
    expect(h.below).toBe(1);
    expect(h.above).toBe(1);
  });

  it("refuses empty input and nonsensical bins", () => {
    expect(() => histogram([])).toThrow(/at least 1 values, got 0/);
    expect(() => histogram([1, 2], { bins: 0 })).toThrow(/whole number of bins/);
    expect(() => histogram([1, 2], { binWidth: -1 })).toThrow(/bin width must be a positive number/);
  });
});
