/**
 * Modes of a design: the predicted mode lists a workshop imports from its modal analysis, and the
 * mode map that sets them against the measured partials. Frequencies in Hz, τ in s, E in GPa,
 * density in kg/m³; uncertainties are standard uncertainties (coverage factor 1).
 */
import { z } from "zod";
import type { Support } from "./spec.ts";

export const modeKinds = ["rigid_body", "balanced", "unbalanced", "support"] as const;
export type ModeKind = (typeof modeKinds)[number];
export const modeKindLabels: Record<ModeKind, string> = {
  rigid_body: "Rigid-body motion",
  balanced: "Balanced",
  unbalanced: "Unbalanced",
  support: "Mode of the support",
};

/** The model's boundary condition: the part floating free, or the part as held (hand, clamp, stand). */
export const modelConditions = ["free", "held"] as const;
export type ModelCondition = (typeof modelConditions)[number];
export const modelConditionLabels: Record<ModelCondition, string> = {
  free: "Free (unconstrained)",
  held: "As held",
};

/** Below this a predicted mode is rigid-body motion (a free part's first six modes sit near 0 Hz). */
export const RIGID_BODY_BELOW_HZ = 1;
export const MAX_MODES_PER_LIST = 2000;
export const MAX_MODE_FILE_BYTES = 1024 * 1024;
/** Highest predicted frequency accepted, Hz: far above any partial a microphone records of these parts. */
export const MAX_PREDICTED_HZ = 200_000;

const optionalNumber = (what: string, min: number, max: number, unit: string) =>
  z
    .number({ error: `${what} must be a number` })
    .min(min, `${what} must be at least ${min} ${unit}`)
    .max(max, `${what} must be at most ${max} ${unit}`)
    .nullable()
    .optional()
    .transform((v) => v ?? null);

/** Young's modulus the model assumed, GPa, and the density it used, kg/m³ (for E_eff = k²·E_model). */
export const modelMaterialSchema = z.object({
  youngsModulusGPa: optionalNumber("Young's modulus", 1, 1500, "GPa"),
  densityKgM3: optionalNumber("Density", 100, 30000, "kg/m³"),
});

/** One predicted mode as the API takes it in a JSON body (our own format; see README). */
export const predictedModeInputSchema = z.object({
  mode: z.number({ error: "mode must be a whole number" }).int("mode must be a whole number").min(0, "mode must be 0 or more").max(100_000, "mode must be at most 100000"),
  frequencyHz: z
    .number({ error: "frequencyHz must be a number in Hz" })
    .gt(-RIGID_BODY_BELOW_HZ, `frequencyHz below −${RIGID_BODY_BELOW_HZ} Hz is not a natural frequency`)
    .max(MAX_PREDICTED_HZ, `frequencyHz must be at most ${MAX_PREDICTED_HZ} Hz (check the unit: Hz, not rad/s)`),
  label: z.string().trim().max(80, "label: at most 80 characters").nullable().optional().transform((v) => v ?? ""),
  kind: z.enum(modeKinds, { error: `kind must be one of ${modeKinds.join(", ")}` }).nullable().optional().transform((v) => v ?? null),
  condition: z.enum(modelConditions, { error: "condition must be free or held" }).nullable().optional().transform((v) => v ?? null),
});
export type PredictedModeInput = z.input<typeof predictedModeInputSchema>;

export const modeListMetaSchema = modelMaterialSchema.extend({
  name: z.string().trim().max(120, "At most 120 characters").default(""),
  condition: z.enum(modelConditions, { error: "Choose free or held" }).default("free"),
});

/** `POST …/predicted-modes` with a JSON body. */
export const modeListJsonSchema = modeListMetaSchema.extend({
  modes: z.array(predictedModeInputSchema).min(1, "Give at least one mode").max(MAX_MODES_PER_LIST, `At most ${MAX_MODES_PER_LIST} modes`),
});
export type ModeListJson = z.input<typeof modeListJsonSchema>;

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

/**
 * The multipart fields beside the `modes` file (strings on the wire). `mapping` is the column
 * mapping chosen in the preview, as JSON: `{ "mode": "Mode No.", "frequencyHz": "Freq (kHz)",
 * "label": null, "kind": null, "condition": null, "frequencyUnit": "kHz" }`.
 */
export const modeListFieldsSchema = z.object({
  name: z.preprocess(blankToUndefined, z.string().trim().max(120, "At most 120 characters").optional()),
  condition: z.preprocess(blankToUndefined, z.enum(modelConditions, { error: "Choose free or held" }).optional()),
  youngsModulusGPa: z.preprocess(blankToUndefined, z.coerce.number({ error: "Young's modulus must be a number in GPa" }).min(1, "Young's modulus must be at least 1 GPa").max(1500, "Young's modulus must be at most 1500 GPa").optional()),
  densityKgM3: z.preprocess(blankToUndefined, z.coerce.number({ error: "Density must be a number in kg/m³" }).min(100, "Density must be at least 100 kg/m³").max(30000, "Density must be at most 30000 kg/m³").optional()),
  mapping: z.preprocess(
    (v) => {
      if (typeof v !== "string" || !v.trim()) return undefined;
      try {
        return JSON.parse(v);
      } catch {
        return "not json";
      }
    },
    z
      .object({
        mode: z.string().max(200).nullable().optional(),
        frequencyHz: z.string().max(200).nullable().optional(),
        label: z.string().max(200).nullable().optional(),
        kind: z.string().max(200).nullable().optional(),
        condition: z.string().max(200).nullable().optional(),
        frequencyUnit: z.enum(["Hz", "kHz", "rad/s"], { error: "frequencyUnit must be Hz, kHz or rad/s" }).optional(),
      }, { error: "mapping must be a JSON object naming the columns" })
      .optional(),
  ),
});
export type ModeListFields = z.infer<typeof modeListFieldsSchema>;

/** A predicted mode as stored: kind is null when the model did not say. */
export type PredictedMode = { mode: number; frequencyHz: number; label: string; kind: ModeKind | null };

export type ModeList = {
  id: string;
  specId: string;
  specVersionId: string;
  version: number;
  condition: ModelCondition;
  name: string;
  sourceName: string | null;
  youngsModulusGPa: number | null;
  densityKgM3: number | null;
  createdAt: string;
  createdBy: { id: string; name: string } | null;
  modes: PredictedMode[];
};

// ---------------------------------------------------------------------------------------------
// The mode map

export const beamTemplates = ["cantilever", "free_free"] as const;
export type BeamTemplateName = (typeof beamTemplates)[number];
export const beamSections = ["rectangular", "round"] as const;

/** Query of `GET /api/specs/:id/mode-map` (strings on the wire). */
export const modeMapQuerySchema = z.object({
  batch: z.string().trim().min(1).max(80).optional(),
  /** Comma-separated unit ids: restrict to these units of the batch (or of the specification). */
  units: z
    .string()
    .max(40_000)
    .optional()
    .transform((v) => (v ? v.split(",").map((s) => s.trim()).filter(Boolean) : [])),
  /** Beam-template geometry, for E from the measured fundamental when there is no model. */
  template: z.enum(beamTemplates, { error: "template must be cantilever or free_free" }).optional(),
  section: z.enum(beamSections, { error: "section must be rectangular or round" }).default("rectangular"),
  lengthMm: z.coerce.number({ error: "lengthMm must be a number" }).positive("lengthMm must be greater than 0").max(5000).optional(),
  thicknessMm: z.coerce.number({ error: "thicknessMm must be a number" }).positive("thicknessMm must be greater than 0").max(1000).optional(),
  densityKgM3: z.coerce.number({ error: "densityKgM3 must be a number" }).min(100).max(30000).optional(),
  lengthUncertaintyMm: z.coerce.number().nonnegative().max(100).optional(),
  thicknessUncertaintyMm: z.coerce.number().nonnegative().max(100).optional(),
  densityUncertaintyKgM3: z.coerce.number().nonnegative().max(5000).optional(),
});
export type ModeMapQuery = z.infer<typeof modeMapQuerySchema>;

export type TauBySupport = { hand: number | null; suspended: number | null; stand: number | null };

export type HoldVerdict = "damped" | "partly_damped" | "rings" | "support_mode";
export const holdVerdictLabels: Record<HoldVerdict, string> = {
  damped: "damped by the hold",
  partly_damped: "partly damped",
  rings: "rings when held",
  support_mode: "mode of the support",
};

export type HoldEffect = {
  /** The holding support compared with suspended strikes of the same units. */
  support: Extract<Support, "hand" | "stand">;
  /** τ_held / τ_free, geometric mean over the units measured both ways; null when no unit had it both ways. */
  ratio: number | null;
  /** Standard uncertainty of the ratio (coverage factor 1). */
  ratioUncertainty: number | null;
  /** Units measured both ways in which this mode was found at least one way. */
  units: number;
  /** Of those, units where it rang suspended but was not found held. */
  goneWhenHeld: number;
  verdict: HoldVerdict;
  /** The model's label for this mode, where a matched model says. */
  modelKind: ModeKind | null;
  /** Whether the measurement agrees with the model's balanced/unbalanced (or support) label. */
  agreement: "agrees" | "disagrees" | null;
};

/** A partial found across the units: one measured mode of the design. */
export type MeasuredModeView = {
  id: number;
  /** Median over units (each unit's median over its strikes), Hz, at the reference temperature. */
  measuredHz: number;
  /** Standard deviation over units, Hz (null for one unit). */
  measuredSpreadHz: number | null;
  /** Standard uncertainty of the median, Hz. */
  measuredUncertaintyHz: number;
  /** Medians from suspended strikes and from held (hand or stand) strikes, Hz. */
  freeHz: number | null;
  heldHz: number | null;
  units: number;
  tauBySupport: TauBySupport;
  holdEffect: HoldEffect | null;
  /** True: found only when held or on a stand; null when no unit was measured both ways. */
  supportMode: boolean | null;
};

export type ModeMapRow = {
  mode: number;
  label: string;
  kind: ModeKind | null;
  condition: ModelCondition;
  listId: string;
  predictedHz: number;
  /** Predicted × the stiffness factor, Hz. */
  calibratedHz: number | null;
  measuredHz: number | null;
  measuredSpreadHz: number | null;
  /** measured / predicted. */
  ratio: number | null;
  /** Measured against predicted × k, cents. */
  residualCents: number | null;
  /** False for a matched mode left out of the stiffness fit (far off after calibration: geometry, not material). */
  inFit: boolean | null;
  units: number;
  tauBySupport: TauBySupport;
  holdEffect: HoldEffect | null;
  /** Id of the measured mode matched (into measuredModes), or null. */
  measuredModeId: number | null;
};

export type GeometryEstimate = {
  template: BeamTemplateName;
  section: (typeof beamSections)[number];
  lengthMm: number;
  thicknessMm: number;
  densityKgM3: number;
  fundamentalHz: number;
  youngsModulusGPa: number;
  youngsModulusUncertaintyGPa: number;
};

export type ModeMap = {
  /** k = f_measured / f_predicted, fitted over the matched modes (least squares in log-frequency). */
  stiffnessFactor: number | null;
  stiffnessFactorUncertainty: number | null;
  /** E_eff = k²·E_model (or from geometry when there is no model), GPa. */
  youngsModulusGPa: number | null;
  youngsModulusUncertaintyGPa: number | null;
  youngsModulusSource: "model" | "geometry" | null;
  modelYoungsModulusGPa: number | null;
  modelDensityKgM3: number | null;
  /** Modes in the stiffness fit. */
  fitModes: number;
  modes: ModeMapRow[];
  unmatchedPartials: MeasuredModeView[];
  measuredModes: MeasuredModeView[];
  models: Omit<ModeList, "modes">[];
  geometry: GeometryEstimate | null;
  scope: {
    batch: { id: string; code: string } | null;
    specVersion: number;
    units: { id: string; serial: string; batchCode: string; supports: Support[] }[];
    unitsMeasured: number;
    unitsBothWays: number;
    strikes: Record<Support | "unknown", number>;
    referenceTemperatureC: number;
  };
};
