/** A unit's evaluation against its spec version. */
import type { EvaluationTraceability } from "./instrument.ts";
import type { DecisionRule } from "./spec.ts";

export const verdicts = ["within_tolerance", "out_of_tolerance", "inconclusive"] as const;
export type Verdict = (typeof verdicts)[number];
export const verdictLabels: Record<Verdict, string> = {
  within_tolerance: "Within tolerance",
  out_of_tolerance: "Out of tolerance",
  inconclusive: "Inconclusive",
};

export type CheckResult = "pass" | "fail" | "inconclusive" | "not_found" | "not_checked";

/** One requirement of the spec, as measured on the unit (strikes combined). */
export type RequirementResult = {
  label: string;
  isFundamental: boolean;
  required: boolean;
  /** Median measured frequency across strikes, corrected to the reference temperature, Hz. */
  measuredHz: number | null;
  /** Spread (max − min) of the strikes' frequencies, cents. */
  spreadCents: number | null;
  /** Combined standard uncertainty of measuredHz (k = 1), Hz. */
  uncertaintyHz: number | null;
  /** Expanded uncertainty U (k = 2, about 95 %), Hz. */
  expandedUncertaintyHz: number | null;
  /** Target frequency, Hz (for a ratio target: ratio × the measured fundamental). */
  targetHz: number | null;
  /** Target ratio to the fundamental, when the spec gives one. */
  targetRatio: number | null;
  measuredRatio: number | null;
  toleranceCents: number;
  /** Deviation from target, cents (a ratio target: of the measured ratio from the target ratio). */
  deviationCents: number | null;
  /** Expanded uncertainty of the deviation (k = 2), cents. */
  deviationUncertaintyCents: number | null;
  pitch: CheckResult;
  t60S: number | null;
  t60UncertaintyS: number | null;
  /** Median decay the strikes' recordings saw, dB: T60 (60 dB) is extrapolated from it. Absent on evaluations made before it was recorded. */
  t60ObservedDecayDb?: number | null;
  /** True when τ (so T60 and Q) was marked unreliable in at least one of the strikes combined. */
  t60Unreliable?: boolean;
  minT60S: number | null;
  t60: CheckResult;
  q: number | null;
  minQ: number | null;
  qResult: CheckResult;
  beatHz: number | null;
  maxBeatHz: number | null;
  beat: CheckResult;
  /** The line's overall result. */
  result: CheckResult;
  /** Plain words on why, when it is not a pass. */
  note: string | null;
};

/** The trade's direction for one partial of a bell out of tolerance. */
export type PartialGuidance = { label: string; direction: "raise" | "lower"; cents: number; remedy: string };

export type TuningGuidance = {
  /** Which way `label` (the fundamental, or for a bell the first partial out of tolerance) must move. */
  direction: "raise" | "lower";
  cents: number;
  remedy: string;
  estimate: string | null;
  caution: string;
  /** The partial the guidance is about (older evaluations: the fundamental, not named). */
  label?: string;
  /** Bells: a direction for each named partial out of tolerance. */
  partials?: PartialGuidance[];
};

export type EvaluationView = {
  id: string;
  unitId: string;
  specVersionId: string;
  verdict: Verdict;
  decisionRule: DecisionRule;
  strikesUsed: number;
  strikesRequired: number;
  temperatureCorrected: boolean;
  requirements: RequirementResult[];
  /** Plain-words reasons for the verdict (what failed, why inconclusive). */
  reasons: string[];
  guidance: TuningGuidance | null;
  /** Instrument tolerances (half-widths, rectangular) assumed where an instrument had no valid calibration. */
  assumptions?: { clockHalfWidthPpm: number; thermometerHalfWidthC?: number; tempCoefficientRelativeHalfWidth?: number };
  /** The strikes this evaluation was made from (absent in evaluations recorded before voids existed). */
  strikeIds?: string[];
  /** The instruments of each strike, the calibrations applied, and the fundamental's uncertainty budget. */
  traceability?: EvaluationTraceability;
  createdAt: string;
};
