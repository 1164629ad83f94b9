/**
 * A specification as a file, so a workshop can copy a design to its second site: JSON with a
 * format name and a version, checked with this schema on both sides (the editor's import and
 * POST /api/specs/import). A file that is not right gets one message per field.
 */
import { z } from "zod";
import { specInputSchema, type SpecFormValues, type SpecVersion } from "./spec.ts";

export const SPEC_FILE_FORMAT = "tinelog-specification";
/** Version 1: the fields of specInputSchema under `specification`. Raise it when a field changes meaning. */
export const SPEC_FILE_VERSION = 1;

export const specFileSchema = z.object({
  format: z.literal(SPEC_FILE_FORMAT, { error: `Not a Tinelog specification file (its "format" must be "${SPEC_FILE_FORMAT}")` }),
  version: z
    .number({ error: "The file has no version number" })
    .int("The version must be a whole number")
    .refine((v) => v === SPEC_FILE_VERSION, { message: `This file is of another version; this Tinelog reads version ${SPEC_FILE_VERSION}` }),
  exportedAt: z.string().optional(),
  /** Where it came from: shown on import, never trusted for anything. */
  source: z.object({ workshop: z.string().max(200), version: z.number().int().positive() }).partial().optional(),
  specification: specInputSchema,
});
export type SpecFile = z.input<typeof specFileSchema>;

/** The file of one version, as GET /api/specs/:id/export gives it. */
export function toSpecFile(v: SpecVersion, workshop: string, now: Date = new Date()): SpecFile {
  const specification: SpecFormValues = {
    name: v.name,
    family: v.family,
    description: v.description,
    referenceTemperatureC: v.referenceTemperatureC,
    tempCoefficientPerC: v.tempCoefficientPerC,
    referencePitchHz: v.referencePitchHz,
    decisionRule: v.decisionRule,
    strikesRequired: v.strikesRequired,
    lengthMm: v.lengthMm,
    partials: v.partials.map((p) => ({
      label: p.label,
      isFundamental: p.isFundamental,
      targetKind: p.targetKind,
      targetHz: p.targetHz,
      targetNote: p.targetNote,
      ratio: p.ratio,
      toleranceCents: p.toleranceCents,
      toleranceUnit: p.toleranceUnit,
      toleranceValue: p.toleranceValue,
      minT60S: p.minT60S,
      minQ: p.minQ,
      maxBeatHz: p.maxBeatHz,
      required: p.required,
    })),
    changeNote: "",
  };
  return { format: SPEC_FILE_FORMAT, version: SPEC_FILE_VERSION, exportedAt: now.toISOString(), source: { workshop, version: v.version }, specification };
}

const FIELD_WORDS: Record<string, string> = {
  format: "format",
  version: "version",
  name: "name",
  family: "product family",
  description: "description",
  referenceTemperatureC: "reference temperature",
  tempCoefficientPerC: "temperature coefficient",
  referencePitchHz: "reference pitch",
  decisionRule: "decision rule",
  strikesRequired: "strikes required",
  lengthMm: "vibrating length",
  partials: "partials",
  label: "label",
  isFundamental: "fundamental",
  targetKind: "target kind",
  targetHz: "target (Hz)",
  targetNote: "target note",
  ratio: "ratio",
  toleranceCents: "tolerance",
  toleranceUnit: "tolerance unit",
  toleranceValue: "tolerance",
  minT60S: "minimum T60",
  minQ: "minimum Q",
  maxBeatHz: "maximum beat",
  required: "required",
};

/** "specification.partials.0.ratio" → "partial 1, ratio" — where in the file, in words. */
export function specFileFieldName(path: string): string {
  const parts = path.split(".").filter((p) => p !== "specification");
  const words: string[] = [];
  for (let i = 0; i < parts.length; i++) {
    if (parts[i] === "partials" && /^\d+$/.test(parts[i + 1] ?? "")) {
      words.push(`partial ${Number(parts[i + 1]) + 1}`);
      i++;
    } else words.push(FIELD_WORDS[parts[i]] ?? parts[i]);
  }
  return words.join(", ") || "the file";
}
