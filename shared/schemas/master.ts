/** The fields sent with a master unit's recording (multipart strings), and the draft that comes back. */
import { z } from "zod";
import type { AnalysisWarning } from "./analysis.ts";
import { families, type SpecFormValues } from "./spec.ts";

export const MAX_MASTER_PARTIALS = 12;

const optionalNumber = (what: string, min: number, max: number) =>
  z
    .union([z.literal(""), z.coerce.number({ error: `${what} must be a number` }).min(min, `${what} must be at least ${min}`).max(max, `${what} must be at most ${max}`)])
    .optional()
    .transform((v) => (v === "" || v === undefined ? null : v));

export const masterDraftFieldsSchema = z.object({
  family: z.enum(families, { error: "Choose the product family of the master" }),
  maxPartials: optionalNumber("The number of partials", 1, MAX_MASTER_PARTIALS).transform((v) => (v === null ? 6 : Math.round(v))),
  fundamentalToleranceCents: optionalNumber("The tolerance on the fundamental", 0.01, 600).transform((v) => v ?? 5),
  partialToleranceCents: optionalNumber("The tolerance on the other partials", 0.01, 600).transform((v) => v ?? 15),
  temperatureC: optionalNumber("The temperature", -30, 70),
});
export type MasterDraftFields = z.input<typeof masterDraftFieldsSchema>;

export type MasterDraftResponse = {
  draft: SpecFormValues;
  strikeNoteHz: number | null;
  master: {
    fileName: string;
    sha256: string;
    sampleRate: number;
    durationS: number;
    warnings: AnalysisWarning[];
    /** Every partial found in the master's first strike; `label` is the requirement it became, or null. */
    partials: { frequencyHz: number; amplitudeDb: number; t60S: number; beatHz: number | null; label: string | null }[];
  };
};
