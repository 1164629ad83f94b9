/**
 * Product specifications (DESIGN.md §3, §5). A spec version is immutable: editing makes a new
 * version, and batches keep the version they were made under. The same schema validates the
 * editor form and the request.
 */
import { z } from "zod";

export const families = ["tuning_fork", "free_bar", "tube", "handbell", "bowl", "other"] as const;
export type Family = (typeof families)[number];
export const familyLabels: Record<Family, string> = {
  tuning_fork: "Tuning fork",
  free_bar: "Free bar (metallophone, chime bar)",
  tube: "Tube (chime tube)",
  handbell: "Handbell",
  bowl: "Singing bowl",
  other: "Other",
};

export const decisionRules = ["simple", "guarded"] as const;
export type DecisionRule = (typeof decisionRules)[number];
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

export const specPartialSchema = z
  .object({
    label: z.string().trim().min(1, "Give the partial a label").max(40, "At most 40 characters"),
    /** The fundamental is the reference the overtone ratios are taken against. */
    isFundamental: z.boolean().default(false),
    targetKind: z.enum(["absolute", "ratio"]),
    /** Absolute target, Hz (targetKind = absolute). */
    targetHz: optionalPositive("Target frequency"),
    /** Target as a ratio to the fundamental's measured frequency (targetKind = ratio). */
    ratio: optionalPositive("Ratio"),
    toleranceCents: positive("Tolerance"),
    minT60S: optionalPositive("Minimum T60"),
    minQ: optionalPositive("Minimum Q"),
    maxBeatHz: z.number().nonnegative("Maximum beat must be 0 Hz or more").nullable().optional().transform((v) => v ?? null),
    required: z.boolean().default(true),
  })
  .superRefine((p, ctx) => {
    if (p.targetKind === "absolute" && p.targetHz == null) ctx.addIssue({ code: "custom", path: ["targetHz"], message: "Give the target frequency in Hz" });
    if (p.targetKind === "ratio" && p.ratio == null) ctx.addIssue({ code: "custom", path: ["ratio"], message: "Give the ratio to the fundamental" });
    if (p.isFundamental && p.targetKind !== "absolute") ctx.addIssue({ code: "custom", path: ["targetKind"], message: "The fundamental needs an absolute target in Hz" });
  });
export type SpecPartial = z.infer<typeof specPartialSchema>;
export type SpecPartialInput = z.input<typeof specPartialSchema>;

export const specInputSchema = z
  .object({
    name: z.string().trim().min(1, "Give the specification a name").max(120, "At most 120 characters"),
    family: z.enum(families, { error: "Choose a product family" }),
    description: z.string().trim().max(2000).default(""),
    referenceTemperatureC: z.number({ error: "Reference temperature must be a number" }).min(-20).max(60).default(20),
    /** Relative change of frequency per °C (e.g. −1.0e-4 for steel, from memory — confirm for your alloy). */
    tempCoefficientPerC: z.number({ error: "Temperature coefficient must be a number" }).min(-0.01).max(0.01).default(-1e-4),
    decisionRule: z.enum(decisionRules).default("simple"),
    strikesRequired: z.number().int("Whole strikes only").min(1, "At least 1 strike").max(20, "At most 20 strikes").default(1),
    /** Vibrating length of a tine or bar, mm, for the proportional tuning estimate (optional). */
    lengthMm: optionalPositive("Length"),
    partials: z.array(specPartialSchema).min(1, "Add at least one partial").max(16, "At most 16 partials"),
    changeNote: z.string().trim().max(500).default(""),
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
    const seen = new Map<string, number>();
    s.partials.forEach((p, i) => {
      const key = p.label.toLowerCase();
      if (seen.has(key)) ctx.addIssue({ code: "custom", path: ["partials", i, "label"], message: `Label "${p.label}" is used twice` });
      seen.set(key, i);
    });
  });
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
