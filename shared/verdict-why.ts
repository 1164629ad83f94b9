/**
 * Why a unit is not within tolerance, in a few words per requirement ("Fundamental T60 17.3 s <
 * 20 s minimum"), for every place a verdict is shown: the review queue, the ledger row, the unit
 * page, the CSV, and the departures a concession names on a certificate. Pure; both sides use it.
 */
import type { EvaluationView, RequirementResult } from "./schemas/evaluation.ts";

const MINUS = "\u2212";

/** Cents with their sign (true minus), one decimal: "+12.6", "−9.4". */
function signedCents(value: number): string {
  const rounded = Number(value.toFixed(1));
  const sign = rounded > 0 ? "+" : rounded < 0 ? MINUS : "";
  return `${sign}${Math.abs(rounded).toFixed(1)}`;
}

/** A limit as the spec states it (no trailing zeros): 20, 0.5, 5000. */
const limit = (value: number) => String(Number(value.toFixed(3)));

/** The short reasons of one requirement line that is not a pass (empty for a pass or an optional line). */
export function requirementWhy(r: RequirementResult): string[] {
  if (!r.required || r.result === "pass" || r.result === "not_checked") return [];
  const out: string[] = [];
  if (r.pitch === "not_found") out.push(`${r.label} not found`);
  if ((r.pitch === "fail" || r.pitch === "inconclusive") && r.deviationCents !== null) {
    const dev = `${signedCents(r.deviationCents)} ¢`;
    out.push(
      r.pitch === "fail"
        ? `${r.label} ${dev} outside ±${limit(r.toleranceCents)} ¢`
        : `${r.label} ${dev} ± ${(r.deviationUncertaintyCents ?? 0).toFixed(1)} ¢ too close to ±${limit(r.toleranceCents)} ¢ to decide`,
    );
  }
  if (r.t60S !== null && r.minT60S !== null) {
    if (r.t60 === "fail") out.push(`${r.label} T60 ${r.t60S.toFixed(1)} s < ${limit(r.minT60S)} s minimum`);
    if (r.t60 === "inconclusive") out.push(`${r.label} T60 ${r.t60S.toFixed(1)} s too close to the ${limit(r.minT60S)} s minimum to decide`);
  }
  if (r.q !== null && r.minQ !== null) {
    if (r.qResult === "fail") out.push(`${r.label} Q ${r.q.toFixed(0)} < ${limit(r.minQ)} minimum`);
    if (r.qResult === "inconclusive") out.push(`${r.label} Q ${r.q.toFixed(0)} too close to the ${limit(r.minQ)} minimum to decide`);
  }
  if (r.beatHz !== null && r.maxBeatHz !== null) {
    if (r.beat === "fail") out.push(`${r.label} beat ${r.beatHz.toFixed(2)} Hz > ${limit(r.maxBeatHz)} Hz maximum`);
    if (r.beat === "inconclusive") out.push(`${r.label} beat ${r.beatHz.toFixed(2)} Hz too close to the ${limit(r.maxBeatHz)} Hz maximum to decide`);
  }
  // A line can fail without a failed check: the partial was missing from some of the strikes.
  if (out.length === 0) out.push(`${r.label} not found in every strike`);
  return out;
}

/**
 * Every short reason the unit is not within tolerance; empty when it is. A unit with too few
 * strikes says so first.
 */
export function verdictWhy(ev: Pick<EvaluationView, "verdict" | "requirements" | "strikesUsed" | "strikesRequired">): string[] {
  if (ev.verdict === "within_tolerance") return [];
  const out: string[] = [];
  if (ev.strikesUsed < ev.strikesRequired) out.push(`${ev.strikesUsed} of ${ev.strikesRequired} strikes measured`);
  for (const r of ev.requirements) out.push(...requirementWhy(r));
  return out;
}
