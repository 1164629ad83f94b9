/**
 * Evaluation of a unit against its spec version: match measured partials to the
 * spec's requirements, correct to the reference temperature, combine the unit's strikes, apply
 * the decision rule and, for a fundamental out of tolerance, give tuning guidance.
 *
 * Pure functions: plain objects in, plain objects out; no I/O, no Node or DOM APIs.
 *
 * Sources:
 * - JCGM 100:2008 (GUM), "Evaluation of measurement data — Guide to the expression of uncertainty
 *   in measurement": type A evaluation §4.2, rectangular distribution §4.3.7, combined standard
 *   uncertainty as a root sum of squares for uncorrelated inputs §5.1.2, relative form for a product
 *   or quotient §5.1.6, expanded uncertainty U = k·u_c with k = 2 (about 95 %) §6.2–6.3.
 * - ILAC-G8:09/2019, "Guidelines on Decision Rules and Statements of Conformity", §4.2: simple
 *   acceptance (w = 0) and guarded acceptance with a guard band w = U.
 * - Cents: 1200·log2(f/fref) (an octave is 1200 cents; see shared/physics.ts).
 */
import type { Partial as MeasuredPartial } from "./schemas/analysis.ts";
import type { CheckResult, EvaluationView, RequirementResult, TuningGuidance, Verdict } from "./schemas/evaluation.ts";
import type { BudgetComponent, UncertaintyBudget } from "./schemas/instrument.ts";
import type { DecisionRule, SpecInput, SpecPartial } from "./schemas/spec.ts";
import { LN_1000, cents, correctToReferenceTemperature } from "./physics.ts";
import { correctForClock, twoSignificant, type InstrumentCorrection } from "./traceability.ts";
import { findStrikeNote, strikeNoteAsPartial, type StrikeNote } from "./strike-note.ts";

/** One analysed strike segment of a recording (a file may hold several strikes). */
export type EvaluationStrikeInput = {
  strikeId: string;
  /** Index of the strike segment within its recording, from 0. */
  segment: number;
  /** Ambient temperature at the strike, °C; null when not given (no correction then). */
  temperatureC: number | null;
  partials: MeasuredPartial[];
  /** The recorder's calibration in force: its offset is removed and its uncertainty used. Absent: the assumed tolerance. */
  clock?: InstrumentCorrection["clock"];
  /** The thermometer's calibration in force: its offset is removed from the reading and its uncertainty used. Absent: the assumed tolerance. */
  thermometer?: InstrumentCorrection["thermometer"];
};

/** Which measured partial (index into that strike's partials) carries which spec label. */
export type StrikeLabels = { strikeId: string; segment: number; labels: Record<number, string> };

/** What {@link evaluateUnit} returns: an evaluation row without its storage keys, plus labels. */
export type UnitEvaluation = Omit<EvaluationView, "id" | "unitId" | "specVersionId" | "createdAt"> & { labels: StrikeLabels[]; fundamentalBudget: UncertaintyBudget | null };

/** Coverage factor for the expanded uncertainty: k = 2, about 95 % for a normal distribution (GUM §6.3). */
export const COVERAGE_FACTOR = 2;

/**
 * Half-width of the thermometer's error, °C. ASSUMPTION: a workshop thermometer good to ±0.5 °C,
 * taken as a rectangular distribution (GUM §4.3.7), so its standard uncertainty is 0.5/√3 ≈ 0.29 °C.
 * Not a property of any particular instrument; change it if the workshop's thermometer is better or worse.
 */
export const THERMOMETER_HALF_WIDTH_C = 0.5;
export const THERMOMETER_STANDARD_UNCERTAINTY_C = THERMOMETER_HALF_WIDTH_C / Math.sqrt(3);

/**
 * Half-width of the recording device's sample-clock error, parts per million. ASSUMPTION (from
 * memory, common practice, no published source): the crystal of an uncalibrated audio interface is
 * good to about ±50 ppm; taken as rectangular (GUM §4.3.7). Every frequency scales with the clock, so
 * this term is added to absolute frequencies; ratios between partials of one recording cancel it.
 * A workshop that calibrates its interface against a reference tone can lower it.
 */
export const SAMPLE_CLOCK_HALF_WIDTH_PPM = 50;

export type EvaluationOptions = {
  /** Half-width of the sample-clock error, ppm (rectangular); 0 for a clock calibrated to negligible error. */
  clockHalfWidthPpm: number;
  /** Half-width of the thermometer's error, °C (rectangular). */
  thermometerHalfWidthC?: number;
  /** Half-width of the temperature coefficient's error as a fraction of it (rectangular); absent or 0: the coefficient is taken as exact. */
  tempCoefficientRelativeHalfWidth?: number;
};

/**
 * Half-width of the temperature coefficient's error, as a fraction of the coefficient. ASSUMPTION
 * (from memory, no published source): a coefficient taken from a handbook value for the alloy, not
 * measured on the workshop's own parts, is known to about ±20 %; taken as rectangular (GUM §4.3.7).
 */
export const TEMPERATURE_COEFFICIENT_RELATIVE_HALF_WIDTH = 0.2;
export const defaultEvaluationOptions: EvaluationOptions = {
  clockHalfWidthPpm: SAMPLE_CLOCK_HALF_WIDTH_PPM,
  thermometerHalfWidthC: THERMOMETER_HALF_WIDTH_C,
  tempCoefficientRelativeHalfWidth: TEMPERATURE_COEFFICIENT_RELATIVE_HALF_WIDTH,
};

/**
 * Search window for matching a measured partial to a requirement, cents either side of the
 * expected frequency: 3 × the tolerance, at least 150 cents, at most 600 cents.
 * - Wider than the tolerance, so a unit well out of tolerance is still matched and reported as
 *   out of tolerance with its deviation (and gets tuning guidance), instead of "not found".
 * - At least 150 cents (1.5 semitones), so tight tolerances still find a unit that is badly off.
 *   Neighbouring partials of these families are much further apart: a bar's 1 : 2.757 is
 *   1755 cents, a fork's ~6× is ~3100 cents, a bell's prime to minor third (1.2×) ~316 cents,
 *   so 150 cents stays below half of the closest spacing.
 * - At most 600 cents (half an octave): anything further is another partial, not this one off-pitch.
 */
export const MATCH_WINDOW_TOLERANCE_FACTOR = 3;
export const MATCH_WINDOW_MIN_CENTS = 150;
export const MATCH_WINDOW_MAX_CENTS = 600;

/**
 * Two candidates whose distances from the expected frequency differ by less than this many cents
 * count as a tie, which the stronger (higher amplitudeDb) wins: at that spacing they are the same
 * pitch for any tolerance a workshop sets, and the stronger is the one heard.
 */
export const MATCH_TIE_CENTS = 1;

/** cents per unit of relative frequency change, for small changes: d(cents) = (1200/ln 2)·df/f. */
const CENTS_PER_RELATIVE = 1200 / Math.LN2;

/** A spec or strike that cannot be evaluated; `message` says what is wrong and what to do. */
export class EvaluationInputError extends Error {
  override name = "EvaluationInputError";
}

/** Search window, cents, for a requirement of tolerance `toleranceCents` (see {@link MATCH_WINDOW_MIN_CENTS}). */
export function matchWindowCents(toleranceCents: number): number {
  return Math.min(MATCH_WINDOW_MAX_CENTS, Math.max(MATCH_WINDOW_TOLERANCE_FACTOR * toleranceCents, MATCH_WINDOW_MIN_CENTS));
}

/**
 * Frequency corrected to the spec's reference temperature, Hz: f_ref = f / (1 + α·(T − T_ref)),
 * α = spec.tempCoefficientPerC (1/°C). With α < 0 (steel), a warm part rings flat, so its
 * corrected frequency is higher. No correction when `temperatureC` is null.
 */
export function temperatureCorrect(
  fHz: number,
  temperatureC: number | null,
  spec: Pick<SpecInput, "referenceTemperatureC" | "tempCoefficientPerC">,
): number {
  if (temperatureC === null) return fHz;
  return correctToReferenceTemperature(fHz, temperatureC, spec.referenceTemperatureC, spec.tempCoefficientPerC);
}

function usable(p: MeasuredPartial): boolean {
  return Number.isFinite(p.frequencyHz) && p.frequencyHz > 0;
}

function fundamentalIndex(spec: SpecInput): number {
  return spec.partials.findIndex((p) => p.isFundamental);
}

function checkSpec(spec: SpecInput): void {
  if (!spec.partials || spec.partials.length === 0) {
    throw new EvaluationInputError("The specification has no partial requirements; add at least the fundamental before evaluating units.");
  }
  const fi = fundamentalIndex(spec);
  spec.partials.forEach((p, i) => {
    if (!(p.toleranceCents > 0)) {
      throw new EvaluationInputError(`Partial "${p.label}" has a tolerance of ${p.toleranceCents} cents; the tolerance must be greater than 0 cents.`);
    }
    if (p.targetKind !== "ratio" && !(p.targetHz != null && p.targetHz > 0)) {
      throw new EvaluationInputError(`Partial "${p.label}" has no target frequency; give its target in Hz or as a note.`);
    }
    if (p.targetKind === "ratio") {
      if (!(p.ratio != null && p.ratio > 0)) throw new EvaluationInputError(`Partial "${p.label}" has no target ratio; give its ratio to the fundamental.`);
      if (fi < 0 || fi === i) throw new EvaluationInputError(`Partial "${p.label}" is a ratio to the fundamental, but no other partial is marked as the fundamental; mark one.`);
    }
  });
}

/** Index of the best unused candidate within `windowCents` of `expectedHz`, or null. */
function pickCandidate(partials: MeasuredPartial[], expectedHz: number, windowCents: number, used: Set<number>): { index: number; distance: number } | null {
  let bestDistance = Infinity;
  const inWindow: { index: number; distance: number }[] = [];
  partials.forEach((p, index) => {
    if (used.has(index) || !usable(p)) return;
    const distance = Math.abs(cents(p.frequencyHz, expectedHz));
    if (distance > windowCents) return;
    inWindow.push({ index, distance });
    bestDistance = Math.min(bestDistance, distance);
  });
  let best: { index: number; distance: number } | null = null;
  for (const c of inWindow) {
    if (c.distance > bestDistance + MATCH_TIE_CENTS) continue;
    if (best === null || partials[c.index].amplitudeDb > partials[best.index].amplitudeDb) best = c;
  }
  return best;
}

/** What one strike's partials were matched to: per spec partial (same order) a partial index or a strike note. */
export type StrikeMatch = {
  /** Index of the measured partial matched to each spec partial, or null (always null for a strike note). */
  indices: (number | null)[];
  /** The strike note read for each strike-note requirement, or null. */
  strikeNotes: (StrikeNote | null)[];
};

/**
 * Matches a strike's measured partials to the spec's requirements.
 * The fundamental first: the measured partial closest in cents to its target within
 * {@link matchWindowCents}, near-ties ({@link MATCH_TIE_CENTS}) to the stronger — or, for a strike
 * note, the reading of the 2 : 3 : 4 series nearest its target (shared/strike-note.ts). Then every
 * other requirement at once, closest pair first: a ratio requirement is expected at ratio × the
 * measured fundamental (ratio × the fundamental's target when the fundamental was not found), an
 * absolute one at its target Hz. A measured partial is used at most once; a strike note reads
 * partials without using them up, so they can carry their own requirements too.
 */
export function matchStrike(spec: SpecInput, partials: MeasuredPartial[]): StrikeMatch {
  checkSpec(spec);
  const indices: (number | null)[] = spec.partials.map(() => null);
  const strikeNotes: (StrikeNote | null)[] = spec.partials.map(() => null);
  const used = new Set<number>();
  const fi = fundamentalIndex(spec);
  let fundamentalHz: number | null = null;
  spec.partials.forEach((p, i) => {
    if (p.targetKind === "strike_note") strikeNotes[i] = findStrikeNote(partials, p.targetHz!, matchWindowCents(p.toleranceCents));
  });
  if (fi >= 0) {
    const f = spec.partials[fi];
    if (f.targetKind === "strike_note") fundamentalHz = strikeNotes[fi]?.frequencyHz ?? null;
    else {
      const hit = pickCandidate(partials, f.targetHz!, matchWindowCents(f.toleranceCents), used);
      if (hit) {
        indices[fi] = hit.index;
        used.add(hit.index);
        fundamentalHz = partials[hit.index].frequencyHz;
      }
    }
  }
  const expected = spec.partials.map((p, i) => {
    if (i === fi || p.targetKind === "strike_note") return null;
    if (p.targetKind === "absolute") return p.targetHz!;
    return p.ratio! * (fundamentalHz ?? spec.partials[fi].targetHz!);
  });
  const open = new Set(spec.partials.map((_, i) => i).filter((i) => expected[i] !== null));
  // Closest pair first, so two requirements never fight over a partial in spec order.
  while (open.size > 0) {
    let bestReq = -1;
    let bestHit: { index: number; distance: number } | null = null;
    for (const i of open) {
      const hit = pickCandidate(partials, expected[i]!, matchWindowCents(spec.partials[i].toleranceCents), used);
      if (hit && (bestHit === null || hit.distance < bestHit.distance)) {
        bestReq = i;
        bestHit = hit;
      }
    }
    if (bestHit === null) break;
    indices[bestReq] = bestHit.index;
    used.add(bestHit.index);
    open.delete(bestReq);
  }
  return { indices, strikeNotes };
}

/** For each spec partial (same order), the index of the measured partial matched to it, or null. See {@link matchStrike}. */
export function matchPartials(spec: SpecInput, partials: MeasuredPartial[]): (number | null)[] {
  return matchStrike(spec, partials).indices;
}

// ---------------------------------------------------------------------------------------------
// Statistics

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Sample standard deviation (n − 1 in the denominator; GUM §4.2.2). */
function sampleStdDev(xs: number[]): number {
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
  return Math.sqrt(xs.reduce((a, x) => a + (x - mean) ** 2, 0) / (xs.length - 1));
}

/**
 * Combined standard uncertainty of a median across strikes (GUM §5.1.2, uncorrelated inputs):
 * u_c² = u_fit² + s²/n (n ≥ 2) + u_other², with u_fit the median of the strikes' own standard
 * uncertainties and s the sample standard deviation across strikes (GUM §4.2.3). s²/n is the
 * variance of a mean; the median's is somewhat larger (≈ 1.57·s²/n for large normal samples),
 * kept at s²/n to match the type A evaluation of GUM §4.2.
 */
function combinedUncertainty(values: number[], ownUncertainties: number[], other = 0): number {
  const uFit = median(ownUncertainties);
  const scatter = values.length >= 2 ? sampleStdDev(values) ** 2 / values.length : 0;
  return Math.sqrt(uFit * uFit + scatter + other * other);
}

// ---------------------------------------------------------------------------------------------
// Decision rules (ILAC-G8:09/2019 §4.2). A value within 1e-9 (relative) of a limit counts as on
// it, so floating-point rounding never decides a result.

function edge(limit: number): number {
  return 1e-9 * Math.max(1, Math.abs(limit));
}

/** An upper limit: value ≤ limit. Guarded: pass if value + U ≤ limit, fail if value − U > limit. */
function decideUpper(value: number, expandedU: number, limit: number, rule: DecisionRule): CheckResult {
  const e = edge(limit);
  if (rule === "simple") return value <= limit + e ? "pass" : "fail";
  if (value + expandedU <= limit + e) return "pass";
  if (value - expandedU > limit + e) return "fail";
  return "inconclusive";
}

/** A lower limit: value ≥ limit. Guarded: pass if value − U ≥ limit, fail if value + U < limit. */
function decideLower(value: number, expandedU: number, limit: number, rule: DecisionRule): CheckResult {
  const e = edge(limit);
  if (rule === "simple") return value >= limit - e ? "pass" : "fail";
  if (value - expandedU >= limit - e) return "pass";
  if (value + expandedU < limit - e) return "fail";
  return "inconclusive";
}

function worst(results: CheckResult[]): CheckResult {
  if (results.includes("fail")) return "fail";
  if (results.includes("inconclusive")) return "inconclusive";
  if (results.includes("pass")) return "pass";
  if (results.includes("not_found")) return "not_found";
  return "not_checked";
}

// ---------------------------------------------------------------------------------------------
// Words

const hz = (f: number) => `${f.toFixed(2)} Hz`;
const c1 = (x: number) => x.toFixed(1);
const signed = (x: number) => `${x >= 0 ? "+" : "−"}${Math.abs(x).toFixed(1)}`;
const s2 = (x: number) => `${x.toFixed(2)} s`;
const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** Why τ was marked unreliable, in words, for the strikes' partials (most telling reason first). */
function unreliableReason(partials: MeasuredPartial[]): string {
  if (partials.some((q) => q.nonExponential)) return "its decay is not exponential (it does not fall along a straight line in dB), so no single T60 describes it. Let the unit ring freely, with nothing touching it, and strike it again.";
  if (partials.some((q) => q.roomMasked)) return "the room's reverberation lasts about as long as the partial, so the two cannot be told apart. Record closer to the unit, away from bare walls.";
  if (partials.some((q) => q.earlyStageOverlap)) return "an early, faster decay (the room's first reflections, or a hand damping the start) overlaps the whole measurable decay. Record closer to the unit and let it ring freely.";
  return "the partial decayed less than 3 dB within the recording. Record a longer strike and let it ring out.";
}

function strikeList(missing: number[], total: number): string {
  const names = missing.map((i) => String(i + 1));
  const list = names.length <= 1 ? names.join("") : `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
  return `${names.length === 1 ? "strike" : "strikes"} ${list} of ${total}`;
}

// ---------------------------------------------------------------------------------------------
// One requirement

type Observation = {
  strike: number;
  partial: MeasuredPartial;
  /** Frequency corrected to the reference temperature, Hz. */
  fHz: number;
  /** Standard uncertainty of fHz from the fit, Hz. */
  uHz: number;
  hasTemperature: boolean;
  /** The recording clock's standard uncertainty, ppm, and whether it is the assumed tolerance. */
  uClockPpm: number;
  clockAssumed: boolean;
  /** The temperature's standard uncertainty, °C, whether assumed, and T − T_ref (°C); null without a temperature. */
  uTemperatureC: number | null;
  temperatureAssumed: boolean;
  deltaTC: number | null;
};

function requireFinite(strike: EvaluationStrikeInput, p: MeasuredPartial, field: keyof MeasuredPartial): number {
  const v = p[field];
  if (typeof v !== "number" || !Number.isFinite(v)) {
    throw new EvaluationInputError(
      `Strike ${strike.strikeId} (segment ${strike.segment}): the partial at ${p.frequencyHz} Hz has ${String(field)} = ${String(v)}; every measured value must be a finite number — analyse the recording again.`,
    );
  }
  return v;
}

function observe(spec: SpecInput, strikes: EvaluationStrikeInput[], matches: StrikeMatch[], req: number, opts: EvaluationOptions): (Observation | null)[] {
  return strikes.map((s, strike) => {
    const idx = matches[strike].indices[req];
    const note = matches[strike].strikeNotes[req];
    if (idx === null && note === null) return null;
    const partial = note ? strikeNoteAsPartial(s.partials, note) : s.partials[idx!];
    const f = requireFinite(s, partial, "frequencyHz");
    const u = Math.abs(requireFinite(s, partial, "frequencyUncertaintyHz"));
    return { strike, partial, ...correctedFrequency(spec, s, f, u, opts) };
  });
}

/**
 * One measured frequency through its corrections: the recorder's clock offset first (a calibrated
 * recorder; f / (1 + offset·10⁻⁶)), then the temperature, read on the thermometer and corrected for
 * its offset (a calibrated thermometer), to the reference temperature. Without a calibration the
 * value stays as recorded and the workshop's assumed tolerances (rectangular) enter the budget.
 */
function correctedFrequency(spec: SpecInput, s: EvaluationStrikeInput, f: number, u: number, opts: EvaluationOptions): Omit<Observation, "strike" | "partial"> {
  const clocked = s.clock ? correctForClock(f, s.clock.offsetPpm) : f;
  const temperatureC = s.temperatureC === null ? null : s.temperatureC - (s.thermometer?.offsetC ?? 0);
  const fHz = temperatureCorrect(clocked, temperatureC, spec);
  const assumedClockPpm = opts.clockHalfWidthPpm / Math.sqrt(3);
  const assumedTemperatureC = (opts.thermometerHalfWidthC ?? THERMOMETER_HALF_WIDTH_C) / Math.sqrt(3);
  return {
    fHz,
    // The corrections are factors; the fit uncertainty scales with them.
    uHz: (u * fHz) / f,
    hasTemperature: temperatureC !== null,
    uClockPpm: s.clock ? s.clock.standardUncertaintyPpm : assumedClockPpm,
    clockAssumed: !s.clock,
    uTemperatureC: temperatureC === null ? null : s.thermometer ? s.thermometer.standardUncertaintyC : assumedTemperatureC,
    temperatureAssumed: temperatureC !== null && !s.thermometer,
    deltaTC: temperatureC === null ? null : temperatureC - spec.referenceTemperatureC,
  };
}

type Frequency = { measuredHz: number; spreadCents: number; uncertaintyHz: number; expandedHz: number };

function combineFrequency(spec: SpecInput, obs: Observation[], opts: EvaluationOptions): Frequency {
  const budget = frequencyBudget(spec, "", obs, opts);
  const fs = obs.map((o) => o.fHz);
  return { measuredHz: budget.measuredHz, spreadCents: cents(Math.max(...fs), Math.min(...fs)), uncertaintyHz: budget.combinedHz, expandedHz: budget.expandedHz };
}

const ppmWords = (x: number) => `${Number(x.toFixed(3))} ppm`;

/**
 * The uncertainty budget of a frequency combined across strikes (the median), one component per
 * input (GUM §5.1.2, uncorrelated inputs, root sum of squares; sensitivities as partial derivatives,
 * §5.1.3):
 * - fit: the median of the strikes' own standard uncertainties (the Cramér–Rao bound of the fit);
 * - scatter: s/√n across n ≥ 2 strikes (type A, §4.2.3);
 * - clock: the recorder's standard uncertainty in ppm, sensitivity f·10⁻⁶ Hz/ppm — the calibration's
 *   own, or the assumed half-width/√3 (§4.3.7); the largest among the strikes (a recorder's error is
 *   shared by all its strikes, so it does not average out);
 * - thermometer: the reading's standard uncertainty, sensitivity |α|·f Hz/°C, when a temperature
 *   corrected the frequency; the largest among the strikes;
 * - temperature coefficient: u(α) = |α|·r/√3 for an assumed relative half-width r, sensitivity
 *   f·|T − T_ref| (the median over the strikes) in Hz per (1/°C).
 */
function frequencyBudget(spec: SpecInput, label: string, obs: Observation[], opts: EvaluationOptions): UncertaintyBudget {
  const fs = obs.map((o) => o.fHz);
  const measuredHz = median(fs);
  const n = obs.length;
  const components: BudgetComponent[] = [];
  const uFit = median(obs.map((o) => o.uHz));
  components.push({ source: "fit", basis: n === 1 ? "decay fit of the strike (its standard uncertainty)" : `decay fit of each strike, median of the ${n} standard uncertainties`, distribution: "normal", standardUncertainty: uFit, unit: "Hz", sensitivity: 1, contributionHz: uFit });
  const sScatter = n >= 2 ? sampleStdDev(fs) / Math.sqrt(n) : 0;
  components.push({
    source: "scatter",
    basis: n >= 2 ? `standard deviation ${sampleStdDev(fs).toPrecision(3)} Hz over ${n} strikes, divided by √${n}` : "one strike: no scatter between strikes to evaluate",
    distribution: "normal",
    standardUncertainty: sScatter,
    unit: "Hz",
    sensitivity: 1,
    contributionHz: sScatter,
  });
  const worstClock = obs.reduce((w, o) => (o.uClockPpm > w.uClockPpm ? o : w), obs[0]);
  components.push({
    source: "clock",
    basis: worstClock.clockAssumed
      ? `assumed ±${ppmWords(opts.clockHalfWidthPpm)} (no valid calibration), half-width/√3`
      : `recorder calibration, offset corrected; its standard uncertainty ${ppmWords(worstClock.uClockPpm)}`,
    distribution: worstClock.clockAssumed ? "rectangular" : "normal",
    standardUncertainty: worstClock.uClockPpm,
    unit: "ppm",
    sensitivity: measuredHz * 1e-6,
    contributionHz: measuredHz * 1e-6 * worstClock.uClockPpm,
  });
  const withT = obs.filter((o) => o.uTemperatureC !== null);
  if (withT.length > 0) {
    const worstT = withT.reduce((w, o) => (o.uTemperatureC! > w.uTemperatureC! ? o : w), withT[0]);
    const alpha = Math.abs(spec.tempCoefficientPerC);
    components.push({
      source: "thermometer",
      basis: worstT.temperatureAssumed
        ? `assumed ±${Number((opts.thermometerHalfWidthC ?? THERMOMETER_HALF_WIDTH_C).toFixed(3))} °C (no valid calibration), half-width/√3`
        : `thermometer calibration, offset corrected; its standard uncertainty ${Number(worstT.uTemperatureC!.toFixed(4))} °C`,
      distribution: worstT.temperatureAssumed ? "rectangular" : "normal",
      standardUncertainty: worstT.uTemperatureC!,
      unit: "°C",
      sensitivity: alpha * measuredHz,
      contributionHz: alpha * measuredHz * worstT.uTemperatureC!,
    });
    const rel = opts.tempCoefficientRelativeHalfWidth ?? 0;
    const uAlpha = (alpha * rel) / Math.sqrt(3);
    const dT = Math.abs(median(withT.map((o) => o.deltaTC!)));
    components.push({
      source: "temperature_coefficient",
      basis: `${spec.tempCoefficientPerC < 0 ? "−" : ""}${twoSignificant(alpha)} per °C from the specification, ${rel > 0 ? `assumed known to ±${Math.round(rel * 100)} %, half-width/√3` : "taken as exact"}; correction over ${dT.toFixed(2)} °C`,
      distribution: "rectangular",
      standardUncertainty: uAlpha,
      unit: "1/°C",
      sensitivity: measuredHz * dT,
      contributionHz: measuredHz * dT * uAlpha,
    });
  }
  const combinedHz = Math.sqrt(components.reduce((s, c) => s + c.contributionHz ** 2, 0));
  return { label, measuredHz, components, combinedHz, coverageFactor: COVERAGE_FACTOR, expandedHz: COVERAGE_FACTOR * combinedHz };
}

type Line = RequirementResult & { missingStrikes: number[] };

function emptyLine(p: SpecPartial): Line {
  return {
    label: p.label,
    isFundamental: p.isFundamental,
    required: p.required,
    measuredHz: null,
    spreadCents: null,
    uncertaintyHz: null,
    expandedUncertaintyHz: null,
    targetHz: p.targetKind !== "ratio" ? p.targetHz : null,
    targetRatio: p.targetKind === "ratio" ? p.ratio : null,
    measuredRatio: null,
    toleranceCents: p.toleranceCents,
    deviationCents: null,
    deviationUncertaintyCents: null,
    pitch: "not_checked",
    t60S: null,
    t60UncertaintyS: null,
    t60ObservedDecayDb: null,
    t60Unreliable: false,
    minT60S: p.minT60S,
    t60: "not_checked",
    q: null,
    minQ: p.minQ,
    qResult: "not_checked",
    beatHz: null,
    maxBeatHz: p.maxBeatHz,
    beat: "not_checked",
    result: "not_checked",
    note: null,
    missingStrikes: [],
  };
}

function evaluateLine(
  spec: SpecInput,
  p: SpecPartial,
  all: (Observation | null)[],
  fundamental: { line: Line; obs: (Observation | null)[] } | null,
  opts: EvaluationOptions,
): Line {
  const line = emptyLine(p);
  const n = all.length;
  const obs = all.filter((o): o is Observation => o !== null);
  line.missingStrikes = all.flatMap((o, i) => (o === null ? [i] : []));
  const notes: string[] = [];

  if (n === 0) {
    line.note = "No strike measured yet.";
    return line;
  }
  if (obs.length === 0) {
    line.pitch = "not_found";
    line.result = p.required ? "fail" : "not_found";
    const searched = `±${c1(matchWindowCents(p.toleranceCents))} cents around the target`;
    line.note = !p.required
      ? "Not found; optional, so it does not affect the verdict."
      : p.targetKind === "strike_note"
        ? `No strike note found in any strike: no three partials stand near 2 : 3 : 4 of a pitch within ${searched}. Strike the tube again, nearer its end and a little harder, or check the spec's target.`
        : `Not found in any strike (searched ${searched}). Strike the unit again where this partial sounds, or check the spec's target.`;
    return line;
  }

  // Frequency, temperature-corrected and combined across strikes.
  const freq = combineFrequency(spec, obs, opts);
  line.measuredHz = freq.measuredHz;
  line.spreadCents = freq.spreadCents;
  line.uncertaintyHz = freq.uncertaintyHz;
  line.expandedUncertaintyHz = freq.expandedHz;
  const fundamentalHz = fundamental?.line.measuredHz ?? null;

  if (p.targetKind !== "ratio") {
    const target = p.targetHz!;
    line.deviationCents = cents(freq.measuredHz, target);
    line.deviationUncertaintyCents = (CENTS_PER_RELATIVE * freq.expandedHz) / freq.measuredHz;
    if (!p.isFundamental && fundamentalHz !== null) line.measuredRatio = freq.measuredHz / fundamentalHz;
  } else {
    const ratio = p.ratio!;
    if (fundamentalHz !== null) line.targetHz = ratio * fundamentalHz;
    // Per strike ratio f/f_fund, so what both partials share in a strike (temperature, the strike
    // itself) cancels; the two fits' relative uncertainties add in quadrature (GUM §5.1.6).
    const pairs = obs.flatMap((o) => {
      const f = fundamental?.obs[o.strike];
      return f ? [{ r: o.fHz / f.fHz, uRel: Math.hypot(o.uHz / o.fHz, f.uHz / f.fHz) }] : [];
    });
    if (pairs.length > 0) {
      const rs = pairs.map((x) => x.r);
      const r = median(rs);
      const scatterRel = pairs.length >= 2 ? sampleStdDev(rs) / r : 0;
      const uRel = Math.sqrt(median(pairs.map((x) => x.uRel)) ** 2 + scatterRel ** 2 / pairs.length);
      line.measuredRatio = r;
      line.deviationCents = cents(r, ratio);
      line.deviationUncertaintyCents = CENTS_PER_RELATIVE * COVERAGE_FACTOR * uRel;
    } else {
      notes.push("The fundamental was not found in the same strikes, so the ratio cannot be checked.");
    }
  }

  if (line.deviationCents !== null) {
    const dev = line.deviationCents;
    const U = line.deviationUncertaintyCents!;
    line.pitch = decideUpper(Math.abs(dev), U, p.toleranceCents, spec.decisionRule);
    const what =
      p.targetKind === "ratio"
        ? `Ratio ${line.measuredRatio!.toFixed(4)} is ${c1(Math.abs(dev))} cents ${dev >= 0 ? "above" : "below"} the target ${p.ratio}`
        : `${hz(freq.measuredHz)} is ${c1(Math.abs(dev))} cents ${dev >= 0 ? "sharp" : "flat"} of ${hz(p.targetHz!)}`;
    if (line.pitch === "fail") {
      notes.push(`${what} (tolerance ±${p.toleranceCents} cents${spec.decisionRule === "guarded" ? `, even allowing for U = ${c1(U)} cents` : ""}).`);
    } else if (line.pitch === "inconclusive") {
      notes.push(
        `Deviation ${signed(dev)} ± ${c1(U)} cents (U, k = 2) overlaps the ±${p.toleranceCents} cents limit: measure more strikes, in a quieter place, to narrow the uncertainty.`,
      );
    }
  }

  // Decay: T60 and Q, combined across strikes like the frequency (no temperature term).
  const t60s = obs.map((o) => o.partial.t60S);
  // The fit's bound and the model error the envelope check found (a T60 extrapolated from a decay
  // that is not quite a straight line in dB), added in quadrature (GUM §5.1.2).
  const uT60 = obs.map((o) => Math.hypot(o.partial.tauUncertaintyS, o.partial.tauModelUncertaintyS ?? 0) * LN_1000);
  const t60U = COVERAGE_FACTOR * combinedUncertainty(t60s, uT60);
  line.t60S = median(t60s);
  line.t60UncertaintyS = t60U;
  // How much of the 60 dB the recordings saw: T60 is extrapolated from that.
  const seen = obs.map((o) => o.partial.observedDecayDb).filter((d): d is number => typeof d === "number");
  line.t60ObservedDecayDb = seen.length ? median(seen) : null;
  const from = line.t60ObservedDecayDb !== null && line.t60ObservedDecayDb < 60 ? ` (extrapolated from ${line.t60ObservedDecayDb.toFixed(0)} dB of decay)` : "";
  const qs = obs.map((o) => o.partial.q);
  // Q = π·f·τ: relative uncertainties of f and τ add in quadrature (GUM §5.1.6).
  const uQ = obs.map((o) => Math.abs(o.partial.q) * Math.hypot(o.partial.tauS > 0 ? Math.hypot(o.partial.tauUncertaintyS, o.partial.tauModelUncertaintyS ?? 0) / o.partial.tauS : 0, o.uHz / o.fHz));
  const qU = COVERAGE_FACTOR * combinedUncertainty(qs, uQ);
  line.q = median(qs);
  const unreliable = obs.filter((o) => o.partial.tauUnreliable).map((o) => o.strike);
  line.t60Unreliable = unreliable.length > 0;
  if (p.minT60S !== null || p.minQ !== null) {
    if (unreliable.length > 0) {
      if (p.minT60S !== null) line.t60 = "inconclusive";
      if (p.minQ !== null) line.qResult = "inconclusive";
      const why = unreliableReason(obs.filter((o) => o.partial.tauUnreliable).map((o) => o.partial));
      notes.push(`${p.minT60S !== null ? "T60" : "Q"}${p.minT60S !== null && p.minQ !== null ? " and Q" : ""} could not be measured reliably in ${strikeList(unreliable, n)}: ${why}`);
    } else {
      if (p.minT60S !== null) {
        line.t60 = decideLower(line.t60S, t60U, p.minT60S, spec.decisionRule);
        if (line.t60 === "fail") notes.push(`T60 ${s2(line.t60S)}${from} is below the minimum ${s2(p.minT60S)}.`);
        if (line.t60 === "inconclusive") notes.push(`T60 ${s2(line.t60S)} ± ${s2(t60U)} (U, k = 2)${from} overlaps the minimum ${s2(p.minT60S)}: measure more strikes, recorded longer so more of the decay is seen.`);
      }
      if (p.minQ !== null) {
        line.qResult = decideLower(line.q, qU, p.minQ, spec.decisionRule);
        if (line.qResult === "fail") notes.push(`Q ${line.q.toFixed(0)} is below the minimum ${p.minQ}.`);
        if (line.qResult === "inconclusive") notes.push(`Q ${line.q.toFixed(0)} ± ${qU.toFixed(0)} (U, k = 2) overlaps the minimum ${p.minQ}: measure more strikes.`);
      }
    }
  }

  // Beat of a doublet; a single mode (beatHz null) counts as 0 Hz.
  const beats = obs.map((o) => o.partial.beatHz ?? 0);
  const uBeat = obs.map((o) => {
    if (o.partial.beatHz === null) return 0;
    const modes = o.partial.modes;
    // beat = |f₁ − f₂|: the two modes' frequency uncertainties add in quadrature (GUM §5.1.2);
    // without the modes, both are taken as the partial's own.
    return modes && modes.length >= 2 ? Math.hypot(modes[0].frequencyUncertaintyHz, modes[1].frequencyUncertaintyHz) : Math.SQRT2 * o.uHz;
  });
  const beatU = COVERAGE_FACTOR * combinedUncertainty(beats, uBeat);
  line.beatHz = obs.some((o) => o.partial.beatHz !== null) ? median(beats) : null;
  if (p.maxBeatHz !== null) {
    const b = median(beats);
    line.beat = decideUpper(b, beatU, p.maxBeatHz, spec.decisionRule);
    if (line.beat === "fail") notes.push(`Beat ${b.toFixed(2)} Hz exceeds the maximum ${p.maxBeatHz} Hz.`);
    if (line.beat === "inconclusive") notes.push(`Beat ${b.toFixed(2)} ± ${beatU.toFixed(2)} Hz (U, k = 2) overlaps the maximum ${p.maxBeatHz} Hz: measure more strikes.`);
  }

  let result = worst([line.pitch, line.t60, line.qResult, line.beat]);
  if (line.missingStrikes.length > 0) {
    if (p.required) {
      result = "fail";
      notes.unshift(`Not found in ${strikeList(line.missingStrikes, n)}; strike the unit again where this partial sounds.`);
    } else {
      notes.unshift(`Not found in ${strikeList(line.missingStrikes, n)} (optional); the values come from the other strikes.`);
    }
  }
  line.result = result;
  if (!p.required && result !== "pass" && result !== "not_checked") notes.push("Optional, so it does not affect the verdict.");
  line.note = notes.length > 0 ? notes.join(" ") : null;
  return line;
}

// ---------------------------------------------------------------------------------------------
// The unit

/**
 * Evaluates a unit against its spec version from all its analysed strike segments.
 * Frequencies are corrected to the reference temperature, combined across strikes (median, spread
 * max − min in cents, combined standard uncertainty u_c and U = 2·u_c), and judged by the spec's
 * decision rule. Only required lines decide the verdict; optional ones are reported.
 * `t60UncertaintyS` in each line is the expanded uncertainty U (k = 2) of T60, s.
 *
 * @throws EvaluationInputError for a spec that cannot be evaluated or a non-finite measured value.
 */
export function evaluateUnit(spec: SpecInput, strikes: EvaluationStrikeInput[], opts: EvaluationOptions = defaultEvaluationOptions): UnitEvaluation {
  checkSpec(spec);
  strikes.forEach((s) => {
    if (s.temperatureC !== null && !Number.isFinite(s.temperatureC)) {
      throw new EvaluationInputError(`Strike ${s.strikeId} (segment ${s.segment}) has temperature ${String(s.temperatureC)}; give the temperature in °C, or leave it empty.`);
    }
  });
  const matches = strikes.map((s) => matchStrike(spec, s.partials));
  const fi = fundamentalIndex(spec);
  const observations = spec.partials.map((_, i) => observe(spec, strikes, matches, i, opts));
  const lines: Line[] = new Array(spec.partials.length);
  let fundamental: { line: Line; obs: (Observation | null)[] } | null = null;
  if (fi >= 0) {
    lines[fi] = evaluateLine(spec, spec.partials[fi], observations[fi], null, opts);
    fundamental = { line: lines[fi], obs: observations[fi] };
  }
  spec.partials.forEach((p, i) => {
    if (i !== fi) lines[i] = evaluateLine(spec, p, observations[i], fundamental, opts);
  });

  const reasons: string[] = [];
  const n = strikes.length;
  const tooFew = n < spec.strikesRequired;
  if (tooFew) {
    const more = spec.strikesRequired - n;
    reasons.push(`${n} of ${spec.strikesRequired} strikes measured: record ${plural(more, "more strike", "more strikes")} of this unit.`);
  }
  const required = lines.filter((l) => l.required);
  const failed = required.filter((l) => l.result === "fail");
  const unsure = required.filter((l) => l.result === "inconclusive");
  let verdict: Verdict;
  if (tooFew) verdict = "inconclusive";
  else if (failed.length > 0) verdict = "out_of_tolerance";
  else if (unsure.length > 0) verdict = "inconclusive";
  else verdict = "within_tolerance";
  if (n > 0) {
    for (const l of [...failed, ...unsure]) reasons.push(`${l.label}: ${l.note}`);
    if (verdict === "within_tolerance") reasons.push("Every required partial is within its limits.");
    for (const l of lines) if (!l.required && (l.result === "fail" || l.result === "inconclusive")) reasons.push(`${l.label}: ${l.note}`);
  }

  const fundamentalLine = fi >= 0 ? lines[fi] : null;
  const guidance = tuningGuidance(spec, fundamentalLine, lines);

  const labels: StrikeLabels[] = strikes.map((s, k) => {
    const map: Record<number, string> = {};
    matches[k].indices.forEach((idx, i) => {
      if (idx !== null) map[idx] = spec.partials[i].label;
    });
    return { strikeId: s.strikeId, segment: s.segment, labels: map };
  });

  const fundamentalObs = fi >= 0 ? observations[fi].filter((o): o is Observation => o !== null) : [];
  const fundamentalBudget = fundamentalObs.length > 0 ? frequencyBudget(spec, spec.partials[fi].label, fundamentalObs, opts) : null;

  return {
    fundamentalBudget,
    verdict,
    decisionRule: spec.decisionRule,
    strikesUsed: n,
    strikesRequired: spec.strikesRequired,
    temperatureCorrected: strikes.some((s) => s.temperatureC !== null),
    requirements: lines.map(({ missingStrikes: _missing, ...r }) => r),
    reasons,
    guidance,
    labels,
  };
}

// ---------------------------------------------------------------------------------------------
// Tuning guidance

const REMEDIES: Record<SpecInput["family"], Record<TuningGuidance["direction"], string>> = {
  tuning_fork: {
    raise: "Shorten the tines: grinding the tine ends raises the pitch. Take the same amount from both tines so they stay matched.",
    lower: "Thin the tines near the crotch, where they meet the stem: this lowers the pitch. Take the same amount from both tines so they stay matched.",
  },
  free_bar: {
    raise: "Remove metal at the ends of the bar (shorten it or thin the ends): this raises the pitch.",
    lower: "Thin the underside of the bar at its middle: this lowers the pitch.",
  },
  tube: {
    raise: "Shorten the tube: this raises the pitch. Cut square and deburr the end.",
    lower:
      "Shortening only raises the pitch, so a tube that rings too high cannot be cut down to pitch. Follow the workshop's practice for this (added end mass lowers it a little), or make a new tube.",
  },
  handbell: {
    raise: "Removing metal lowers a bell's partials, so a flat bell is not brought up by thinning it; taking metal off the lip edge (a smaller mouth) raises the whole bell a little. Follow the workshop's own tuning practice for this design.",
    lower: "Removing metal from the inside lowers the bell; where it is taken decides which partials move most (see each partial below). Follow the workshop's own tuning practice for this design.",
  },
  bowl: {
    raise: "Removing metal lowers most partials of a bowl, so raising the pitch needs the workshop's own method for this design; where metal is removed decides which partials move most.",
    lower: "Removing metal lowers most partials of a bowl; where it is removed decides which partials move most. Follow the workshop's own tuning practice for this design.",
  },
  other: {
    raise: "Follow the workshop's own tuning practice for this part. For a bar- or tine-like part, shortening it raises the pitch.",
    lower: "Follow the workshop's own tuning practice for this part. For a bar- or tine-like part, thinning it where it bends most (near a clamp, or at the middle of a free bar) lowers the pitch.",
  },
};

const CAUTION =
  "Material removal follows the workshop's own procedures and safety rules: wear eye and hearing protection, use dust extraction for metal dust, keep the guards on grinders, and keep the part cool — heat changes the temper and the pitch. Measure again after each removal.";
const CLINICAL_CAUTION =
  " A fork for clinical or laboratory use must be measured again and released before it is used after any re-tuning; local regulations for such instruments apply.";

/** Families that behave as beams, for which f ∝ 1/L² at constant section. */
const BEAM_FAMILIES: SpecInput["family"][] = ["tuning_fork", "free_bar", "tube", "other"];

/**
 * Where the bell trade takes metal from the inside of a bell to lower each named partial, as a
 * direction only: the hum high toward the shoulder, the prime at the waist, the tierce low in the
 * waist above the sound bow, the nominal at the sound bow near the lip; the quint follows the others.
 */
const BELL_PARTIAL_PLACES: { match: RegExp; name: string; place: string | null }[] = [
  { match: /\bhum\b/i, name: "hum", place: "from the inside, high up toward the shoulder" },
  { match: /\b(prime|fundamental|strike)\b/i, name: "prime", place: "from the inside at the waist, about halfway up" },
  { match: /\btierce\b/i, name: "tierce", place: "from the inside, low in the waist just above the sound bow" },
  { match: /\bquint\b/i, name: "quint", place: null },
  { match: /\bnominal\b/i, name: "nominal", place: "from the inside at the sound bow, near the lip" },
];

/** The trade's direction for one named partial of a bell out of tolerance, or null for a name it does not know. */
function bellPartialRemedy(label: string, direction: TuningGuidance["direction"]): string | null {
  const known = BELL_PARTIAL_PLACES.find((b) => b.match.test(label));
  if (!known) return null;
  if (known.place === null) {
    return "The quint moves with the tierce and the nominal and is seldom tuned on its own: tune those, then measure again.";
  }
  return direction === "lower"
    ? `Take metal ${known.place}: that lowers the ${known.name} most, the other partials less.`
    : `Removing metal lowers bell partials, so a flat ${known.name} is met by lowering the partials around it to it (each where it is most affected), or by taking a little off the lip edge, which raises the whole bell.`;
}

const BELL_CAUTION = " On a tuning lathe, clamp the bell true and secure, and keep hands and tools clear while it turns.";

/**
 * Tuning guidance for a unit out of tolerance, or null when no pitch check failed: which way the
 * pitch must move and by how many cents, the usual remedy of the family, and — where
 * spec.lengthMm is known and the pitch must rise — the proportional length estimate from
 * Euler–Bernoulli beam theory, f ∝ 1/L² at constant section, so L_new = L·√(f_measured/f_target).
 * A bell also gets a direction for each named partial out of tolerance (hum, prime, tierce, quint,
 * nominal), and guidance even when only those fail; it gets no length estimate (a shell is no beam).
 */
export function tuningGuidance(spec: SpecInput, fundamentalResult: RequirementResult | null, all: readonly RequirementResult[] = []): TuningGuidance | null {
  const failed = (r: RequirementResult) => r.pitch === "fail" && r.measuredHz !== null && r.deviationCents !== null;
  const bell = spec.family === "handbell";
  const partials = bell
    ? all.filter((r) => failed(r) && r.required).flatMap((r) => {
        const direction: TuningGuidance["direction"] = r.deviationCents! < 0 ? "raise" : "lower";
        const remedy = bellPartialRemedy(r.label, direction);
        return remedy ? [{ label: r.label, direction, cents: Math.round(Math.abs(r.deviationCents!) * 10) / 10, remedy }] : [];
      })
    : [];
  const lead = fundamentalResult && failed(fundamentalResult) && fundamentalResult.targetHz !== null ? fundamentalResult : bell ? all.find((r) => failed(r) && r.required) ?? null : null;
  if (!lead) return null;
  const deviationCents = lead.deviationCents!;
  const direction: TuningGuidance["direction"] = deviationCents < 0 ? "raise" : "lower";
  let estimate: string | null = null;
  const isFundamental = lead === fundamentalResult;
  if (isFundamental && direction === "raise" && spec.lengthMm !== null && spec.lengthMm > 0 && BEAM_FAMILIES.includes(spec.family)) {
    const L = spec.lengthMm;
    const newL = L * Math.sqrt(lead.measuredHz! / lead.targetHz!);
    const where = spec.family === "tuning_fork" ? " from each tine end" : spec.family === "free_bar" ? ", shared between the two ends" : "";
    estimate =
      `Estimate from beam theory (Euler–Bernoulli, f ∝ 1/L² at constant section): ${L.toFixed(2)} mm becomes ${newL.toFixed(2)} mm, ` +
      `about ${(L - newL).toFixed(2)} mm to remove${where}. It is an estimate: remove less, then measure again.`;
  }
  return {
    direction,
    cents: Math.round(Math.abs(deviationCents) * 10) / 10,
    remedy: isFundamental ? REMEDIES[spec.family][direction] : bellPartialRemedy(lead.label, direction) ?? REMEDIES[spec.family][direction],
    estimate,
    caution: CAUTION + (spec.family === "tuning_fork" ? CLINICAL_CAUTION : bell ? BELL_CAUTION : ""),
    label: lead.label,
    ...(bell ? { partials } : {}),
  };
}
