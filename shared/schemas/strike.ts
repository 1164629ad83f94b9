/** Uploaded strikes and the unit page. */
import { z } from "zod";
import type { AnalysisResult } from "./analysis.ts";
import type { DispositionDecision, BatchState } from "./batch.ts";
import type { EvaluationView } from "./evaluation.ts";
import type { Concession } from "./certificate.ts";
import type { StrikeCorrection } from "./instrument.ts";
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

const instrumentId = (what: string) =>
  z
    .preprocess(blankAsEmpty, z.union([z.literal(""), z.string().max(64, `That is not a ${what} id.`)]).optional())
    .transform((v) => (v === "" || v === undefined ? null : v));

/** The instruments a strike was measured with: the recorder, and the thermometer its temperature was read on. */
export const strikeInstrumentFields = { recorderId: instrumentId("recorder"), thermometerId: instrumentId("thermometer") };

/** The multipart fields beside the `audio` file (strings on the wire). A blank temperature is "not recorded", never 0 °C. */
export const strikeUploadFieldsSchema = z.object({
  temperatureC: z
    .preprocess(blankAsEmpty, z.union([z.literal(""), z.coerce.number({ error: "Temperature must be a number in °C" }).min(-30, "Temperature must be at least −30 °C").max(70, "Temperature must be at most 70 °C")]).optional())
    .transform((v) => (v === "" || v === undefined ? null : v)),
  support: z
    .preprocess(blankAsEmpty, z.union([z.literal(""), z.enum(supports, { error: "Support must be one of: hand, suspended, stand, other" })]).optional())
    .transform((v) => (v === "" || v === undefined ? null : v)),
  ...strikeInstrumentFields,
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
  /** Set when the strike was taken out of the record: it stays listed, struck through, and is not evaluated. */
  voided: { at: string; reason: string; by: { id: string; name: string } | null } | null;
  /** The instruments named at upload. */
  recorder: { id: string; name: string } | null;
  thermometer: { id: string; name: string } | null;
};

export type StrikeDetail = StrikeSummary & {
  analyserVersion: string | null;
  bitsPerSample: number | null;
  encoding: string | null;
  finishedAt: string | null;
  /** The analysis result, with plot series, when state is done. */
  result: AnalysisResult | null;
  /** The headline analysis fields at the top level (from `result`, without the plot series); empty until done. */
  warnings: AnalysisResult["warnings"];
  strikes: Omit<AnalysisResult["strikes"][number], "plot">[];
  unit: { id: string; serial: string; batchId: string; batchCode: string };
  /** Labels of the spec's partials matched to this strike's partials: index in result.strikes[0].partials → label. */
  labels: Record<number, string>;
  /**
   * The correction of this strike's frequencies and temperature: as applied in the unit's latest
   * evaluation (`appliedIn`), or, before any evaluation used it, as it will be applied (`appliedIn` null).
   * The partials above stay as recorded.
   */
  correction: StrikeCorrection;
  appliedIn: { evaluationId: string; at: string } | null;
  /** The strike note read from result.strikes[0] when the spec targets one, with the partials it was read from. */
  strikeNote: StrikeNoteReading | null;
  /** The spec's reference pitch (A4, Hz), for naming notes. */
  referencePitchHz: number;
};

/** A strike note as read from one strike: the heard pitch and the partials (indices, harmonic numbers) it came from. */
export type StrikeNoteReading = {
  label: string;
  frequencyHz: number;
  /** Standard uncertainty (k = 1) from the partials' fits, Hz. */
  uncertaintyHz: number;
  targetHz: number | null;
  /** RMS misfit of the partials from the 2 : 3 : 4 series, cents. */
  misfitCents: number;
  members: { index: number; harmonic: number; deviationCents: number }[];
};

export type UnitDetail = {
  id: string;
  serial: string;
  customerName: string | null;
  customerEmail: string | null;
  createdAt: string;
  batch: { id: string; code: string; state: BatchState };
  spec: { id: string; name: string; version: number; versionId: string; family: Family; referenceTemperatureC: number };
  strikes: StrikeSummary[];
  evaluation: EvaluationView | null;
  dispositions: {
    id: string;
    decision: DispositionDecision;
    reason: string;
    at: string;
    by: { id: string; name: string } | null;
    evaluationId: string | null;
    /** The disposition this one replaced, and the one that replaced this (null when it still stands). */
    supersedesId: string | null;
    supersededById: string | null;
  }[];
  /** The disposition that decides the unit now: on its latest evaluation and not superseded. */
  standingDispositionId: string | null;
  /** Whether a certificate may be issued for the unit now, and if not, why (in words). */
  certification: UnitCertification;
  /** Serial of the next unit of the batch still to be measured, for the quick path. */
  nextUnit: { id: string; serial: string } | null;
};

export type UnitCertification = { eligible: true; reason: null; concession: Concession | null } | { eligible: false; reason: string; concession: null };

export type UploadAccepted = { id: string; state: StrikeState; unitId: string; serial: string };
