/** Uploaded strikes and the unit page (DESIGN.md §3, §9). */
import { z } from "zod";
import type { AnalysisResult } from "./analysis.ts";
import type { DispositionDecision, BatchState } from "./batch.ts";
import type { EvaluationView } from "./evaluation.ts";
import { supports, type Family, type Support } from "./spec.ts";

export const strikeStates = ["queued", "analysing", "done", "failed"] as const;
export type StrikeState = (typeof strikeStates)[number];
export const strikeStateLabels: Record<StrikeState, string> = {
  queued: "Queued",
  analysing: "Analysing",
  done: "Done",
  failed: "Failed",
};

/** Multipart fields are strings; blank (empty or spaces only) means "not given". */
const blankAsEmpty = (v: unknown) => (typeof v === "string" ? v.trim() : v);

/** The multipart fields beside the `audio` file (strings on the wire). A blank temperature is "not recorded", never 0 °C. */
export const strikeUploadFieldsSchema = z.object({
  temperatureC: z
    .preprocess(blankAsEmpty, z.union([z.literal(""), z.coerce.number({ error: "Temperature must be a number in °C" }).min(-30, "Temperature must be at least −30 °C").max(70, "Temperature must be at most 70 °C")]).optional())
    .transform((v) => (v === "" || v === undefined ? null : v)),
  support: z
    .preprocess(blankAsEmpty, z.union([z.literal(""), z.enum(supports, { error: "Support must be one of: hand, suspended, stand, other" })]).optional())
    .transform((v) => (v === "" || v === undefined ? null : v)),
});
export type StrikeUploadFields = z.infer<typeof strikeUploadFieldsSchema>;

export type StrikeSummary = {
  id: string;
  unitId: string;
  state: StrikeState;
  originalName: string;
  sha256: string;
  sizeBytes: number;
  uploadedAt: string;
  uploadedBy: { id: string; name: string } | null;
  temperatureC: number | null;
  support: Support | null;
  failureReason: string | null;
  sampleRate: number | null;
  channels: number | null;
  durationS: number | null;
  /** The fundamental found (lowest required partial matched), for lists. */
  fundamentalHz: number | null;
};

export type StrikeDetail = StrikeSummary & {
  analyserVersion: string | null;
  bitsPerSample: number | null;
  encoding: string | null;
  finishedAt: string | null;
  /** The analysis result, with plot series, when state is done. */
  result: AnalysisResult | null;
  /** DESIGN.md §9 fields at the top level (from `result`, without the plot series); empty until done. */
  warnings: AnalysisResult["warnings"];
  strikes: Omit<AnalysisResult["strikes"][number], "plot">[];
  unit: { id: string; serial: string; batchId: string; batchCode: string };
  /** Labels of the spec's partials matched to this strike's partials: index in result.strikes[0].partials → label. */
  labels: Record<number, string>;
};

export type UnitDetail = {
  id: string;
  serial: string;
  customerName: string | null;
  customerEmail: string | null;
  createdAt: string;
  batch: { id: string; code: string; state: BatchState };
  spec: { id: string; name: string; version: number; versionId: string; family: Family };
  strikes: StrikeSummary[];
  evaluation: EvaluationView | null;
  dispositions: { id: string; decision: DispositionDecision; reason: string; at: string; by: { id: string; name: string } | null; evaluationId: string | null }[];
  /** Serial of the next unit of the batch still to be measured, for the quick path. */
  nextUnit: { id: string; serial: string } | null;
};

export type UploadAccepted = { id: string; state: StrikeState; unitId: string; serial: string };
