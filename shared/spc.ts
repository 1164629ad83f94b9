/**
 * Statistical process control for a batch ledger: individuals and moving-range charts, the
 * Nelson tests for special causes, process capability and a histogram helper.
 *
 * Pure functions: numbers in, plain objects out; no DOM, no Node APIs, safe for client and server.
 * Units follow the input: the batch charts feed deviations of the fundamental in cents, so the
 * centre line, limits and σ̂ come out in cents too; capability indices are dimensionless.
 *
 * Sources:
 * - NIST/SEMATECH e-Handbook of Statistical Methods, §6.3.2 (Shewhart charts for individuals,
 *   moving range of two, constants d₂, D₃, D₄ for n = 2).
 * - Nelson, L. S. (1984), "The Shewhart Control Chart — Tests for Special Causes",
 *   Journal of Quality Technology 16(4), 237–239 (tests 1–8 on zones of one σ).
 * - Montgomery, D. C., Introduction to Statistical Quality Control (Cp, Cpk, Cpl; the one-sided
 *   index; Pp/Ppk from the overall standard deviation).
 */

/** d₂ for a moving range of two: expected range of two standard normal values, 2/√π ≈ 1.128 (NIST §6.3.2). */
export const D2_N2 = 1.128;
/** E₂ = 3/d₂ for n = 2, tabulated as 2.66 (NIST §6.3.2): individuals limits are x̄ ± E₂·MR̄. */
export const E2_N2 = 2.66;
/** D₄ for n = 2, 3.267 (NIST §6.3.2): upper limit of the moving-range chart is D₄·MR̄. */
export const D4_N2 = 3.267;
/** D₃ for n = 2 is 0 (NIST §6.3.2): the moving-range chart has no lower limit above zero. */
export const D3_N2 = 0;
/**
 * Below this many values a capability index is flagged "low confidence". Common practice
 * (no single published source; Montgomery shows how wide the confidence interval of Cp is at small n).
 */
export const LOW_CONFIDENCE_BELOW = 30;

/** A precondition failed; `message` says what was wrong and what to do. */
export class SpcInputError extends Error {
  override name = "SpcInputError";
}

function requireFinite(values: readonly number[], what: string): void {
  values.forEach((v, i) => {
    if (typeof v !== "number" || !Number.isFinite(v)) {
      throw new SpcInputError(`${what}: value at position ${i + 1} is ${String(v)}; every value must be a finite number — remove or re-measure that unit.`);
    }
  });
}

function requireAtLeast(values: readonly number[], n: number, what: string): void {
  if (values.length < n) {
    throw new SpcInputError(`${what} needs at least ${n} values, got ${values.length}; measure more units first.`);
  }
}

/** Arithmetic mean, in the unit of the values. */
export function mean(values: readonly number[]): number {
  requireAtLeast(values, 1, "mean");
  requireFinite(values, "mean");
  // Shift by the first value before summing so large offsets (e.g. 10⁷ ± 1) keep their digits.
  const shift = values[0];
  let s = 0;
  for (const v of values) s += v - shift;
  return shift + s / values.length;
}

/**
 * Sample standard deviation with n − 1 in the denominator (two-pass, so it stays exact for values
 * with a large common offset), in the unit of the values.
 */
export function sampleStandardDeviation(values: readonly number[]): number {
  requireAtLeast(values, 2, "The sample standard deviation");
  const m = mean(values);
  let ss = 0;
  let c = 0;
  for (const v of values) {
    ss += (v - m) * (v - m);
    c += v - m;
  }
  // Corrected two-pass formula: the c² term removes the rounding error left in m.
  return Math.sqrt((ss - (c * c) / values.length) / (values.length - 1));
}

/** Moving ranges of two, |xᵢ − xᵢ₋₁| for i = 1…n−1 (n − 1 values), in the unit of the values. */
export function movingRanges(values: readonly number[]): number[] {
  requireFinite(values, "Moving ranges");
  const out: number[] = [];
  for (let i = 1; i < values.length; i++) out.push(Math.abs(values[i] - values[i - 1]));
  return out;
}

export interface IndividualsChart {
  /** Number of values. */
  n: number;
  /** Centre line x̄, in the unit of the values. */
  mean: number;
  /** Average moving range MR̄ over the n − 1 ranges of two. */
  mrBar: number;
  /** Within-process σ̂ = MR̄/d₂ (d₂ = 1.128). */
  sigmaWithin: number;
  /** Upper control limit x̄ + 2.66·MR̄. */
  ucl: number;
  /** Lower control limit x̄ − 2.66·MR̄. */
  lcl: number;
  /**
   * Moving ranges aligned with the values: entry 0 is null (the first value has no predecessor),
   * entry i is |xᵢ − xᵢ₋₁|. Plot these on the moving-range chart.
   */
  movingRanges: (number | null)[];
  /** Centre line of the moving-range chart, MR̄. */
  mrCentre: number;
  /** Upper limit of the moving-range chart, 3.267·MR̄. */
  mrUcl: number;
  /** Lower limit of the moving-range chart, 0 (D₃ = 0 for n = 2). */
  mrLcl: number;
  /** True for each moving range above mrUcl (entry 0 always false). */
  mrAboveLimit: boolean[];
  /** True when MR̄ is 0 (all values equal): the limits collapse onto the centre line. */
  degenerate: boolean;
}

/**
 * Individuals (X) and moving-range (MR) chart limits for values in measuring order
 * (NIST/SEMATECH e-Handbook §6.3.2): UCL/LCL = x̄ ± 2.66·MR̄, MR chart UCL = 3.267·MR̄, LCL = 0.
 * Units: those of the values (cents for the batch chart).
 * @throws SpcInputError with fewer than two values or a value that is not a finite number.
 */
export function individualsChart(values: readonly number[]): IndividualsChart {
  requireAtLeast(values, 2, "An individuals chart");
  requireFinite(values, "Individuals chart");
  const mr = movingRanges(values);
  const mrBar = mr.reduce((a, b) => a + b, 0) / mr.length;
  const m = mean(values);
  const mrUcl = D4_N2 * mrBar;
  return {
    n: values.length,
    mean: m,
    mrBar,
    sigmaWithin: mrBar / D2_N2,
    ucl: m + E2_N2 * mrBar,
    lcl: m - E2_N2 * mrBar,
    movingRanges: [null, ...mr],
    mrCentre: mrBar,
    mrUcl,
    mrLcl: D3_N2 * mrBar,
    mrAboveLimit: [false, ...mr.map((r) => r > mrUcl)],
    degenerate: mrBar === 0,
  };
}

// ---------------------------------------------------------------------------------------------
// Nelson tests for special causes

export type NelsonRuleId = 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8;

export interface NelsonRule {
  rule: NelsonRuleId;
  /** Short name for a legend. */
  name: string;
  /** One plain sentence for a hover: what the pattern is and what it usually suggests. */
  description: string;
  /** How many consecutive points the test looks at. */
  window: number;
}

/**
 * The eight tests of Nelson (1984), J. Quality Technology 16(4). Zones are multiples of σ from
 * the centre line (zone A: beyond 2σ, zone B: beyond 1σ). Descriptions in our own words.
 */
export const NELSON_RULES: Readonly<Record<NelsonRuleId, NelsonRule>> = {
  1: { rule: 1, window: 1, name: "Beyond a control limit", description: "This point lies more than 3σ from the centre line: something unusual happened to this unit." },
  2: { rule: 2, window: 9, name: "Nine on one side", description: "Nine points in a row fall on the same side of the centre line: the process average has probably shifted." },
  3: { rule: 3, window: 6, name: "Six in a steady run", description: "Six points in a row keep rising or keep falling: something is drifting (tool wear, temperature, material)." },
  4: { rule: 4, window: 14, name: "Fourteen alternating", description: "Fourteen points in a row alternate up and down: two sources (stations, people, stock) may be taking turns." },
  5: { rule: 5, window: 3, name: "Two of three beyond 2σ", description: "Two of three points in a row lie more than 2σ from the centre on the same side: an early sign of a shift." },
  6: { rule: 6, window: 5, name: "Four of five beyond 1σ", description: "Four of five points in a row lie more than 1σ from the centre on the same side: a small shift is likely." },
  7: { rule: 7, window: 15, name: "Fifteen hugging the centre", description: "Fifteen points in a row stay within 1σ of the centre: the limits may be too wide or the data mixed from several sources." },
  8: { rule: 8, window: 8, name: "Eight avoiding the centre", description: "Eight points in a row lie more than 1σ from the centre, on either side: the values may come from two different processes." },
};

/** One occurrence of a pattern: the points from `start` to `end` (inclusive, 0-based) form it. */
export interface NelsonSignal {
  rule: NelsonRuleId;
  start: number;
  end: number;
}

export interface NelsonPoint {
  index: number;
  value: number;
  /** The rules whose pattern this point is part of, each with its name and description. */
  breaks: NelsonRule[];
}

export interface NelsonResult {
  points: NelsonPoint[];
  signals: NelsonSignal[];
}

export interface NelsonOptions {
  /** Centre line, in the unit of the values. */
  centre: number;
  /** σ used for the zones, in the unit of the values (> 0). */
  sigma: number;
  /** Which tests to run; default all eight. */
  rules?: readonly NelsonRuleId[];
}

/**
 * Applies Nelson's tests (1984) to values in measuring order. A point is marked with every rule
 * whose pattern it belongs to; `signals` lists each pattern once (overlapping windows merged).
 * Points exactly on the centre line break a one-side run (rule 2); equal neighbours break a steady
 * run (rule 3) and an alternation (rule 4).
 * @throws SpcInputError for non-finite values or σ ≤ 0.
 */
export function nelsonRules(values: readonly number[], options: NelsonOptions): NelsonResult {
  requireFinite(values, "Nelson rules");
  const { centre, sigma } = options;
  if (!Number.isFinite(centre)) throw new SpcInputError(`Nelson rules: the centre line must be a finite number, got ${String(centre)}.`);
  if (!Number.isFinite(sigma) || sigma <= 0) {
    throw new SpcInputError(`Nelson rules: σ must be a positive number, got ${String(sigma)}; with all values equal there is no spread to test against.`);
  }
  const rules = options.rules ?? ([1, 2, 3, 4, 5, 6, 7, 8] as const);
  const z = values.map((v) => (v - centre) / sigma);
  const side = z.map((x) => (x > 0 ? 1 : x < 0 ? -1 : 0));
  const step = values.map((v, i) => (i === 0 ? 0 : Math.sign(v - values[i - 1])));
  const n = values.length;
  const hits: NelsonSignal[] = [];
  const marks: Set<NelsonRuleId>[] = values.map(() => new Set());

  const addWindow = (rule: NelsonRuleId, start: number, end: number, mark: (i: number) => boolean) => {
    for (let i = start; i <= end; i++) if (mark(i)) marks[i].add(rule);
    const last = hits.length ? hits[hits.length - 1] : undefined;
    // Merge overlapping or touching windows of the same rule into one signal.
    if (last && last.rule === rule && start <= last.end + 1) last.end = Math.max(last.end, end);
    else hits.push({ rule, start, end });
  };
  const all = () => true;

  for (const rule of rules) {
    const w = NELSON_RULES[rule].window;
    for (let end = w - 1; end < n; end++) {
      const start = end - w + 1;
      switch (rule) {
        case 1:
          if (Math.abs(z[end]) > 3) addWindow(rule, start, end, all);
          break;
        case 2: {
          const s = side[start];
          if (s !== 0 && side.slice(start, end + 1).every((x) => x === s)) addWindow(rule, start, end, all);
          break;
        }
        case 3: {
          // Six points make five steps, all in the same direction.
          const s = step[start + 1];
          let fires = s !== 0;
          for (let i = start + 2; fires && i <= end; i++) fires = step[i] === s;
          if (fires) addWindow(rule, start, end, all);
          break;
        }
        case 4: {
          // Fourteen points make thirteen steps, each opposite to the one before.
          let fires = step[start + 1] !== 0;
          for (let i = start + 2; fires && i <= end; i++) fires = step[i] !== 0 && step[i] === -step[i - 1];
          if (fires) addWindow(rule, start, end, all);
          break;
        }
        case 5:
        case 6: {
          const need = rule === 5 ? 2 : 4;
          const limit = rule === 5 ? 2 : 1;
          for (const s of [1, -1]) {
            const out = (i: number) => z[i] * s > limit;
            let count = 0;
            for (let i = start; i <= end; i++) if (out(i)) count++;
            // Only the points out in the zone on that side are marked, not the window's others.
            if (count >= need) addWindow(rule, start, end, out);
          }
          break;
        }
        case 7:
          if (z.slice(start, end + 1).every((x) => Math.abs(x) < 1)) addWindow(rule, start, end, all);
          break;
        case 8:
          if (z.slice(start, end + 1).every((x) => Math.abs(x) > 1)) addWindow(rule, start, end, all);
          break;
      }
    }
  }

  const points: NelsonPoint[] = values.map((value, index) => ({
    index,
    value,
    breaks: [...marks[index]].map((r) => NELSON_RULES[r]),
  }));
  for (const p of points) p.breaks.sort((a, b) => a.rule - b.rule);
  hits.sort((a, b) => a.start - b.start || a.rule - b.rule);
  return { points, signals: hits };
}

/**
 * Individuals chart plus Nelson tests, with zones of σ = E₂·MR̄/3 so that a point beyond the drawn
 * control limit is exactly a rule-1 point. Units: those of the values.
 * When all values are equal (MR̄ = 0) no test can run and every point is returned unmarked.
 */
export function individualsChartWithRules(values: readonly number[], rules?: readonly NelsonRuleId[]): IndividualsChart & NelsonResult {
  const chart = individualsChart(values);
  if (chart.degenerate) {
    return { ...chart, points: values.map((value, index) => ({ index, value, breaks: [] })), signals: [] };
  }
  return { ...chart, ...nelsonRules(values, { centre: chart.mean, sigma: (chart.ucl - chart.mean) / 3, rules }) };
}

// ---------------------------------------------------------------------------------------------
// Process capability

export interface CapabilityIndices {
  /** Number of values. */
  n: number;
  /** Mean of the values. */
  mean: number;
  /** Within-process σ̂ = MR̄/d₂ (values in measuring order). */
  sigmaWithin: number;
  /** Overall sample standard deviation (n − 1). */
  sigmaOverall: number;
  /** Cp = (USL − LSL)/(6σ̂within); null for a one-sided limit or σ̂ = 0. */
  cp: number | null;
  /** Cpk = min(Cpl, Cpu) with σ̂within; null when σ̂ = 0. */
  cpk: number | null;
  /** Cpl = (μ − LSL)/(3σ̂within); null without a lower limit or when σ̂ = 0. */
  cpl: number | null;
  /** Cpu = (USL − μ)/(3σ̂within); null without an upper limit or when σ̂ = 0. */
  cpu: number | null;
  /** Pp: as Cp with the overall standard deviation. */
  pp: number | null;
  /** Ppk: as Cpk with the overall standard deviation. */
  ppk: number | null;
  /** True under 30 values: the index is too uncertain to act on. */
  lowConfidence: boolean;
  /** Plain notes on anything that made an index unavailable. */
  notes: string[];
}

export interface SpecLimits {
  /** Lower specification limit, in the unit of the values; omit for an upper limit only. */
  lsl?: number;
  /** Upper specification limit; omit for a lower limit only. */
  usl?: number;
}

/**
 * Cp, Cpk (σ̂ = MR̄/d₂) and Pp, Ppk (overall sample σ) against specification limits
 * (Montgomery, Introduction to Statistical Quality Control). With only one limit, Cp/Pp are null
 * and Cpk/Ppk are the one-sided index (Cpl or Cpu). Values in measuring order, at least 2.
 * @throws SpcInputError for fewer than two values, non-finite values, no limit, or LSL ≥ USL.
 */
export function capability(values: readonly number[], limits: SpecLimits): CapabilityIndices {
  requireAtLeast(values, 2, "A capability index");
  requireFinite(values, "Capability");
  const { lsl, usl } = limits;
  if (lsl === undefined && usl === undefined) throw new SpcInputError("Capability needs at least one specification limit (lsl or usl); set the tolerance in the spec.");
  for (const [name, v] of [["lsl", lsl], ["usl", usl]] as const) {
    if (v !== undefined && !Number.isFinite(v)) throw new SpcInputError(`Capability: ${name} must be a finite number, got ${String(v)}.`);
  }
  if (lsl !== undefined && usl !== undefined && !(usl > lsl)) {
    throw new SpcInputError(`Capability: the upper limit (${usl}) must be above the lower limit (${lsl}); check the tolerance.`);
  }
  const m = mean(values);
  const mr = movingRanges(values);
  const sigmaWithin = mr.reduce((a, b) => a + b, 0) / mr.length / D2_N2;
  const sigmaOverall = sampleStandardDeviation(values);
  const notes: string[] = [];

  const indices = (sigma: number, label: string) => {
    if (!(sigma > 0)) {
      notes.push(`The ${label} standard deviation is 0 (all values equal), so its indices are undefined.`);
      return { p: null, pk: null, pl: null, pu: null };
    }
    const pu = usl !== undefined ? (usl - m) / (3 * sigma) : null;
    const pl = lsl !== undefined ? (m - lsl) / (3 * sigma) : null;
    return {
      p: lsl !== undefined && usl !== undefined ? (usl - lsl) / (6 * sigma) : null,
      pk: Math.min(pu ?? Infinity, pl ?? Infinity),
      pl,
      pu,
    };
  };
  const within = indices(sigmaWithin, "within-process");
  const overall = indices(sigmaOverall, "overall");
  const lowConfidence = values.length < LOW_CONFIDENCE_BELOW;
  if (lowConfidence) notes.push(`Only ${values.length} values (fewer than ${LOW_CONFIDENCE_BELOW}): treat the indices as low confidence.`);
  return { n: values.length, mean: m, sigmaWithin, sigmaOverall, cp: within.p, cpk: within.pk, cpl: within.pl, cpu: within.pu, pp: overall.p, ppk: overall.pk, lowConfidence, notes };
}

/**
 * Cp and Cpk of deviations from target (cents) against a symmetric tolerance ±toleranceCents
 * around 0 (LSL = −tol, USL = +tol). Deviations in measuring order.
 * @throws SpcInputError when the tolerance is not a positive number, or as `capability`.
 */
export function toleranceCapability(deviationsCents: readonly number[], toleranceCents: number): CapabilityIndices {
  if (!Number.isFinite(toleranceCents) || toleranceCents <= 0) {
    throw new SpcInputError(`The tolerance must be a positive number of cents, got ${String(toleranceCents)}.`);
  }
  return capability(deviationsCents, { lsl: -toleranceCents, usl: toleranceCents });
}

/**
 * Lower capability Cpl of ln T60 against a minimum T60 (s): (mean(ln T60) − ln min)/(3σ) with σ̂ from
 * the moving ranges of ln T60 (`cpl`, equal to `cpk` here) and the overall σ (`ppk`). T60 is close to log-normal across units
 * (it is a positive, multiplicative quantity), hence the log. The index does not depend on the log
 * base: ln and log₁₀ differ by a constant factor that cancels.
 * @throws SpcInputError for a T60 or minimum that is not a positive number.
 */
export function t60LowerCapability(t60S: readonly number[], minimumT60S: number): CapabilityIndices {
  if (!Number.isFinite(minimumT60S) || minimumT60S <= 0) {
    throw new SpcInputError(`The minimum T60 must be a positive number of seconds, got ${String(minimumT60S)}.`);
  }
  t60S.forEach((t, i) => {
    if (typeof t !== "number" || !Number.isFinite(t) || t <= 0) {
      throw new SpcInputError(`T60 at position ${i + 1} is ${String(t)} s; a T60 must be a positive number of seconds — re-analyse that strike.`);
    }
  });
  return capability(t60S.map(Math.log), { lsl: Math.log(minimumT60S) });
}

// ---------------------------------------------------------------------------------------------
// Histogram

export interface HistogramOptions {
  /** Number of bins; default Sturges' rule ⌈log₂ n⌉ + 1. Ignored when binWidth is given. */
  bins?: number;
  /** Bin width in the unit of the values. */
  binWidth?: number;
  /** Range [lo, hi] to bin over; default [min, max] of the values. Values outside go to below/above. */
  range?: readonly [number, number];
  /**
   * With binWidth: align edges to multiples of binWidth from this value (for example 0, so the
   * tolerance limits ±tol fall on edges when tol is a multiple of the width).
   */
  anchor?: number;
}

export interface Histogram {
  /** Bin edges, bins + 1 values, ascending. */
  edges: number[];
  /** Count per bin; bins are [edgeᵢ, edgeᵢ₊₁) and the last one also holds its upper edge. */
  counts: number[];
  binWidth: number;
  /** Values below the first edge / above the last edge (only with an explicit range or anchor). */
  below: number;
  above: number;
}

/**
 * Bins values into equal-width bins, half-open [a, b) except the last, which is closed — the
 * same convention as NumPy's `histogram`. Units: those of the values.
 * @throws SpcInputError for no values, non-finite values, or bins/binWidth/range that make no sense.
 */
export function histogram(values: readonly number[], options: HistogramOptions = {}): Histogram {
  requireAtLeast(values, 1, "A histogram");
  requireFinite(values, "Histogram");
  let lo = options.range ? options.range[0] : Math.min(...values);
  let hi = options.range ? options.range[1] : Math.max(...values);
  if (!Number.isFinite(lo) || !Number.isFinite(hi) || hi < lo) {
    throw new SpcInputError(`Histogram range must be two finite numbers with lo ≤ hi, got [${lo}, ${hi}].`);
  }
  let bins: number;
  let width: number;
  if (options.binWidth !== undefined) {
    if (!Number.isFinite(options.binWidth) || options.binWidth <= 0) {
      throw new SpcInputError(`Histogram bin width must be a positive number, got ${String(options.binWidth)}.`);
    }
    width = options.binWidth;
    if (options.anchor !== undefined) {
      const a = options.anchor;
      lo = a + Math.floor((lo - a) / width) * width;
      hi = Math.max(lo + width, a + Math.ceil((hi - a) / width) * width);
    } else if (hi === lo) {
      hi = lo + width;
    }
    bins = Math.max(1, Math.round((hi - lo) / width));
    hi = lo + bins * width;
  } else {
    bins = options.bins ?? Math.ceil(Math.log2(values.length)) + 1;
    if (!Number.isInteger(bins) || bins < 1) throw new SpcInputError(`Histogram needs a whole number of bins ≥ 1, got ${String(options.bins)}.`);
    if (hi === lo) {
      // NumPy widens an empty range by ±0.5 so the single value sits in a bin of width 1.
      lo -= 0.5;
      hi += 0.5;
    }
    width = (hi - lo) / bins;
  }
  const edges = Array.from({ length: bins + 1 }, (_, i) => (i === bins ? hi : lo + i * width));
  const counts = new Array<number>(bins).fill(0);
  let below = 0;
  let above = 0;
  for (const v of values) {
    if (v < lo) below++;
    else if (v > hi) above++;
    else {
      let k = Math.floor((v - lo) / width);
      if (k >= bins) k = bins - 1;
      // Guard against rounding putting a value just under an edge into the next bin.
      while (k > 0 && v < edges[k]) k--;
      while (k < bins - 1 && v >= edges[k + 1]) k++;
      counts[k]++;
    }
  }
  return { edges, counts, binWidth: width, below, above };
}
