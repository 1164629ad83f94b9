/**
 * One row per reported partial of a strike: its label (the spec's role, or "partial n"), its
 * ratio to the fundamental f₁ and, when the spec gives a target, its deviation in cents. Used by
 * the spectrum markers and the partials table so the two always name a partial the same way.
 * When the spec's fundamental is a strike note (a tube), ratios are taken to the strike note and
 * the partials it was read from carry their place in its 2 : 3 : 4 series.
 */
import { cents } from "@shared/physics";
import type { Partial } from "@shared/schemas/analysis";
import type { RequirementResult } from "@shared/schemas/evaluation";
import type { StrikeNoteReading } from "@shared/schemas/strike";

export type PartialRow = {
  index: number;
  /** The spec's label, or "partial n" (1-based, in frequency order) when unmatched. */
  label: string;
  /** True when the label came from the spec. */
  labelled: boolean;
  isFundamental: boolean;
  partial: Partial;
  /** f / f₁ of this strike (f₁: the fundamental, or the strike note), or null when none was found. */
  ratio: number | null;
  /** The spec's target: a frequency (Hz) or a ratio to the fundamental. */
  targetHz: number | null;
  targetRatio: number | null;
  /** Deviation of this strike's partial from the target, cents (not temperature-corrected). */
  deviationCents: number | null;
  toleranceCents: number | null;
  /** Its place (2, 3, 4) in the series the strike note was read from, or null. */
  strikeNoteHarmonic: number | null;
};

/** What the ratios are taken against: the spec's fundamental, the strike note, or (unmatched) the lowest partial. */
export function ratioReference(rows: readonly PartialRow[], strikeNote?: StrikeNoteReading | null, strikeNoteIsFundamental = false): "fundamental" | "strike_note" | "lowest" | null {
  if (!rows.length) return null;
  if (strikeNote && strikeNoteIsFundamental) return "strike_note";
  return rows.some((r) => r.isFundamental) ? "fundamental" : "lowest";
}

export const partialFallbackLabel = (index: number) => `partial ${index + 1}`;

/**
 * @param labels StrikeDetail.labels: index in partials → spec label.
 * @param requirements the unit evaluation's requirements (targets per label), when there is one.
 * @param strikeNote StrikeDetail.strikeNote, when the spec has a strike-note target.
 */
export function partialRows(partials: readonly Partial[], labels: Record<number, string>, requirements: readonly RequirementResult[] | null, strikeNote: StrikeNoteReading | null = null): PartialRow[] {
  const byLabel = new Map((requirements ?? []).map((r) => [r.label, r] as const));
  const fundamentalLabel = requirements?.find((r) => r.isFundamental)?.label;
  const noteIsFundamental = strikeNote !== null && strikeNote.label === fundamentalLabel;
  // The fundamental is the partial the spec calls fundamental. Without that match, ratios are
  // taken to the lowest partial (marked as such by `ratioReference`), which is what a maker
  // reads off an unlabelled spectrum anyway.
  let f0Index = -1;
  for (const [key, label] of Object.entries(labels)) if (label === fundamentalLabel) f0Index = Number(key);
  const refIndex = f0Index >= 0 ? f0Index : partials.length ? 0 : -1;
  const f0 = noteIsFundamental ? strikeNote.frequencyHz : refIndex >= 0 ? partials[refIndex]?.frequencyHz ?? null : null;
  const harmonics = new Map((strikeNote?.members ?? []).map((m) => [m.index, m.harmonic] as const));

  return partials.map((partial, index) => {
    const specLabel = labels[index];
    const requirement = specLabel ? byLabel.get(specLabel) : undefined;
    const isFundamental = index === f0Index;
    const ratio = f0 ? partial.frequencyHz / f0 : null;
    let deviationCents: number | null = null;
    const targetRatio = requirement?.targetRatio ?? null;
    // A ratio target is judged on the measured ratio (as the evaluation does); a frequency target on f.
    const targetHz = requirement && targetRatio === null ? requirement.targetHz : null;
    if (targetRatio !== null && ratio !== null && (f0Index >= 0 || noteIsFundamental) && !isFundamental) deviationCents = cents(ratio, targetRatio);
    else if (targetHz) deviationCents = cents(partial.frequencyHz, targetHz);
    return {
      index,
      label: specLabel ?? partialFallbackLabel(index),
      labelled: Boolean(specLabel),
      isFundamental,
      partial,
      ratio,
      targetHz,
      targetRatio,
      deviationCents,
      toleranceCents: requirement?.toleranceCents ?? null,
      strikeNoteHarmonic: harmonics.get(index) ?? null,
    };
  });
}
