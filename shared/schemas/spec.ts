/**
 * Product specifications: partials with targets and tolerances, the decision rule and the references. A spec version is immutable: editing makes a new
 * version, and batches keep the version they were made under. The same schema validates the
 * editor form and the request.
 */
import { z } from "zod";
import { A4_HZ } from "../physics.ts";
import { MAX_REFERENCE_PITCH_HZ, MIN_REFERENCE_PITCH_HZ, normaliseNoteName, noteHz, parseNoteName, toleranceToCents, toleranceUnits } from "../tuning.ts";

export const families = ["tuning_fork", "free_bar", "tube", "handbell", "bowl", "other"] as const;
export type Family = (typeof families)[number];
export const familyLabels: Record<Family, string> = {
  tuning_fork: "Tuning fork",
  free_bar: "Free bar (metallophone, chime bar)",
  tube: "Tube (chime tube)",
  handbell: "Handbell or bell",
  bowl: "Singing bowl",
  other: "Other",
};

export const decisionRules = ["simple", "guarded"] as const;
export type DecisionRule = (typeof decisionRules)[number];
/** Short names, for a select that must fit a phone; decisionRuleLabels says what each means. */
export const decisionRuleShortLabels: Record<DecisionRule, string> = { simple: "Simple acceptance", guarded: "Guarded acceptance" };
export const decisionRuleLabels: Record<DecisionRule, string> = {
  simple: "Simple acceptance (the measured value alone decides)",
  guarded: "Guarded acceptance (ILAC-G8: the expanded uncertainty U, k = 2, must fit inside the tolerance)",
};

export const supports = ["hand", "suspended", "stand", "other"] as const;
export type Support = (typeof supports)[number];
export const supportLabels: Record<Support, string> = {
  hand: "Held in hand",
  suspended: "Suspended",
  stand: "On a stand or resonator",
  other: "Other",
};

const positive = (what: string) => z.number({ error: `${what} must be a number` }).positive(`${what} must be greater than 0`);
const optionalPositive = (what: string) => positive(what).nullable().optional().transform((v) => v ?? null);

/**
 * How a partial's target is given:
 * - absolute: a frequency in Hz, or a note name at the spec's reference pitch;
 * - ratio: a multiple of the fundamental's measured frequency;
 * - strike_note: the pitch heard from a tube — the common fundamental of the partials near
 *   2 : 3 : 4 (shared/strike-note.ts), targeted in Hz or by note name like an absolute target.
 */
export const targetKinds = ["absolute", "ratio", "strike_note"] as const;
export type TargetKind = (typeof targetKinds)[number];
export const targetKindLabels: Record<TargetKind, string> = {
  absolute: "Hz or note",
  ratio: "Ratio to f₁",
  strike_note: "Strike note",
};

const noteName = z
  .string()
  .nullable()
  .optional()
  .transform((v, ctx) => {
    if (v == null || v.trim() === "") return null;
    const normal = normaliseNoteName(v);
    if (normal === null) {
      ctx.issues.push({ code: "custom", input: v, message: "Write a note as a letter A–G, an optional # or b, and an octave: A4, C#5, Bb3" });
      return z.NEVER;
    }
    return normal;
  });

export const specPartialSchema = z
  .object({
    label: z.string().trim().min(1, "Give the partial a label").max(40, "At most 40 characters"),
    /** The fundamental (f₁) is the reference the overtone ratios are taken against. */
    isFundamental: z.boolean().default(false),
    targetKind: z.enum(targetKinds, { error: "Choose how the target is given" }),
    /** Target, Hz (absolute and strike note). Derived from `targetNote` when one is given. */
    targetHz: optionalPositive("Target frequency"),
    /** Target as a note name ("A4", "C#5"), equal-tempered at the spec's reference pitch. */
    targetNote: noteName,
    /** Target as a ratio to the fundamental's measured frequency (targetKind = ratio). */
    ratio: optionalPositive("Ratio"),
    /** Symmetric tolerance, cents. Derived from `toleranceValue` when that is given in Hz or ppm. */
    toleranceCents: optionalPositive("Tolerance"),
    /** The unit the tolerance was given in; the evaluation always works in cents. */
    toleranceUnit: z.enum(toleranceUnits, { error: "Choose cents, Hz or ppm" }).default("cents"),
    /** The tolerance as given, in `toleranceUnit`. */
    toleranceValue: optionalPositive("Tolerance"),
    minT60S: optionalPositive("Minimum T60"),
    minQ: optionalPositive("Minimum Q"),
    maxBeatHz: z.number().nonnegative("Maximum beat must be 0 Hz or more").nullable().optional().transform((v) => v ?? null),
    required: z.boolean().default(true),
  })
  .superRefine((p, ctx) => {
    if (p.targetKind !== "ratio" && p.targetHz == null && p.targetNote == null) {
      ctx.addIssue({ code: "custom", path: ["targetHz"], message: "Give the target in Hz, or a note name" });
    }
    if (p.targetKind === "ratio" && p.ratio == null) ctx.addIssue({ code: "custom", path: ["ratio"], message: "Give the ratio to the fundamental" });
    if (p.isFundamental && p.targetKind === "ratio") ctx.addIssue({ code: "custom", path: ["targetKind"], message: "The fundamental needs a target in Hz, a note, or a strike note" });
    if (p.toleranceValue == null && (p.toleranceUnit !== "cents" || p.toleranceCents == null)) {
      ctx.addIssue({ code: "custom", path: ["toleranceValue"], message: "Give the tolerance" });
    }
  });

type ParsedPartial = z.infer<typeof specPartialSchema>;
/** A partial requirement after parsing: target in Hz and tolerance in cents always filled in. */
export type SpecPartial = Omit<ParsedPartial, "toleranceCents" | "toleranceValue"> & { toleranceCents: number; toleranceValue: number };
export type SpecPartialInput = z.input<typeof specPartialSchema>;

/** Reference pitch A4, Hz: 440 (ISO 16:1975) unless the customer orders another. */
const referencePitch = z
  .number({ error: "Reference pitch must be a number in Hz" })
  .min(MIN_REFERENCE_PITCH_HZ, `Reference pitch must be at least ${MIN_REFERENCE_PITCH_HZ} Hz`)
  .max(MAX_REFERENCE_PITCH_HZ, `Reference pitch must be at most ${MAX_REFERENCE_PITCH_HZ} Hz`)
  .default(A4_HZ);

/** The nominal frequency a partial's tolerance in Hz is taken at, Hz (a ratio: ratio × the fundamental's target). */
export function nominalTargetHz(p: { targetKind: TargetKind; targetHz: number | null; ratio: number | null }, fundamentalHz: number | null): number | null {
  if (p.targetKind !== "ratio") return p.targetHz;
  return p.ratio !== null && fundamentalHz !== null ? p.ratio * fundamentalHz : null;
}

export const specInputSchema = z
  .object({
    name: z.string().trim().min(1, "Give the specification a name").max(120, "At most 120 characters"),
    family: z.enum(families, { error: "Choose a product family" }),
    description: z.string().trim().max(2000, "At most 2000 characters").default(""),
    referenceTemperatureC: z.number({ error: "Reference temperature must be a number" }).min(-20, "At least −20 °C").max(60, "At most 60 °C").default(20),
    /** Relative change of frequency per °C (about −1.0e-4 for steel — confirm for the alloy). */
    tempCoefficientPerC: z.number({ error: "Temperature coefficient must be a number" }).min(-0.01, "At least −0.01 per °C").max(0.01, "At most 0.01 per °C").default(-1e-4),
    /** A4, Hz, for targets given as note names. */
    referencePitchHz: referencePitch,
    decisionRule: z.enum(decisionRules).default("simple"),
    strikesRequired: z.number({ error: "Strikes required must be a number" }).int("Whole strikes only").min(1, "At least 1 strike").max(20, "At most 20 strikes").default(1),
    /** Vibrating length of a tine or bar, mm, for the proportional tuning estimate (optional). */
    lengthMm: optionalPositive("Length"),
    partials: z.array(specPartialSchema).min(1, "Add at least one partial").max(16, "At most 16 partials"),
    changeNote: z.string().trim().max(500, "At most 500 characters").default(""),
  })
  .superRefine((s, ctx) => {
    const fundamentals = s.partials.filter((p) => p.isFundamental).length;
    const hasRatio = s.partials.some((p) => p.targetKind === "ratio");
    if (fundamentals > 1) ctx.addIssue({ code: "custom", path: ["partials"], message: "Mark only one partial as the fundamental" });
    if (hasRatio && fundamentals === 0) {
      s.partials.forEach((p, i) => {
        if (p.targetKind === "ratio") ctx.addIssue({ code: "custom", path: ["partials", i, "ratio"], message: "A ratio target needs a partial marked as the fundamental" });
      });
    }
    s.partials.forEach((p, i) => {
      if (p.targetKind === "strike_note" && s.partials.findIndex((q) => q.targetKind === "strike_note") !== i) {
        ctx.addIssue({ code: "custom", path: ["partials", i, "targetKind"], message: "One strike note per specification" });
      }
    });
    const fundamental = s.partials.find((p) => p.isFundamental);
    const fundamentalHz = fundamental ? targetHzOf(fundamental, s.referencePitchHz) : null;
    s.partials.forEach((p, i) => {
      if (p.toleranceUnit === "hz" && nominalTargetHz({ ...p, targetHz: targetHzOf(p, s.referencePitchHz) }, fundamentalHz) === null) {
        ctx.addIssue({ code: "custom", path: ["partials", i, "toleranceUnit"], message: "A tolerance in Hz needs a target in Hz; give this one in cents or ppm" });
      }
    });
    const seen = new Map<string, number>();
    s.partials.forEach((p, i) => {
      const key = p.label.toLowerCase();
      if (seen.has(key)) ctx.addIssue({ code: "custom", path: ["partials", i, "label"], message: `Label "${p.label}" is used twice` });
      seen.set(key, i);
    });
  })
  .transform((s) => {
    // Targets by note name become Hz at the reference pitch; tolerances in Hz or ppm become cents.
    const withHz = s.partials.map((p) => ({ ...p, targetHz: p.targetKind === "ratio" ? p.targetHz : targetHzOf(p, s.referencePitchHz) }));
    const fundamental = withHz.find((p) => p.isFundamental);
    const fundamentalHz = fundamental?.targetHz ?? null;
    const partials: SpecPartial[] = withHz.map((p) => {
      // In cents, toleranceCents is the value when given (older clients send only it); in Hz or ppm, toleranceValue.
      const value = (p.toleranceUnit === "cents" ? (p.toleranceCents ?? p.toleranceValue) : p.toleranceValue) ?? 0;
      const atHz = nominalTargetHz(p, fundamentalHz);
      const toleranceCents = p.toleranceUnit === "hz" && atHz === null ? value : toleranceToCents(value, p.toleranceUnit, atHz);
      return { ...p, toleranceCents, toleranceValue: value };
    });
    return { ...s, partials };
  });

/** A partial's target in Hz: its note at the reference pitch when it has one, else its targetHz. */
function targetHzOf(p: { targetHz: number | null; targetNote: string | null }, referencePitchHz: number): number | null {
  if (p.targetNote) {
    const midi = parseNoteName(p.targetNote);
    if (midi !== null) return noteHz(midi, referencePitchHz);
  }
  return p.targetHz;
}

export type SpecInput = z.infer<typeof specInputSchema>;
export type SpecFormValues = z.input<typeof specInputSchema>;

export type SpecVersion = SpecInput & {
  id: string;
  specId: string;
  version: number;
  createdAt: string;
  createdBy: { id: string; name: string } | null;
};

export type SpecSummary = {
  id: string;
  name: string;
  family: Family;
  currentVersion: number;
  currentVersionId: string;
  updatedAt: string;
  batches: number;
};

export type SpecDetail = SpecSummary & { versions: SpecVersion[] };
