/** Batches, units and their ledger rows. */
import { z } from "zod";
import type { Family } from "./spec.ts";
import type { EvaluationView, Verdict } from "./evaluation.ts";
import { reasonSchema } from "./reason.ts";

export const batchStates = ["open", "in_review", "released"] as const;
export type BatchState = (typeof batchStates)[number];
export const batchStateLabels: Record<BatchState, string> = { open: "Open", in_review: "In review", released: "Released" };

const serial = z.string().trim().min(1, "A serial cannot be empty").max(64, "A serial has at most 64 characters").regex(/^[\w.\-/#]+$/, "Use letters, digits and - _ . / # only");

export const serialRangeSchema = z.object({
  from: serial,
  to: serial,
});

export const addUnitsSchema = z
  .object({
    serials: z.array(serial).max(5000, "At most 5000 units at once").optional(),
    range: serialRangeSchema.optional(),
    customerName: z.string().trim().max(200).optional(),
    customerEmail: z.email("Enter a valid e-mail address").optional(),
  })
  .refine((v) => (v.serials?.length ?? 0) > 0 || v.range, { message: "Give a list of serials or a serial range", path: ["serials"] });
export type AddUnitsInput = z.infer<typeof addUnitsSchema>;

export const createBatchSchema = z.object({
  code: z.string().trim().min(1, "Give the batch a code").max(64).regex(/^[\w.\-/#]+$/, "Use letters, digits and - _ . / # only"),
  specId: z.string().min(1, "Choose a specification"),
  /** Defaults to the spec's current version. */
  specVersion: z.number().int().positive().optional(),
  quantity: z.number({ error: "Quantity must be a number" }).int("Whole units only").min(1, "At least 1 unit").max(5000, "At most 5000 units"),
  range: serialRangeSchema.optional(),
  notes: z.string().trim().max(2000).default(""),
});
export type CreateBatchInput = z.infer<typeof createBatchSchema>;

export const updateUnitSchema = z
  .object({
    customerName: z.string().trim().max(200).nullable().optional(),
    customerEmail: z.email("Enter a valid e-mail address").nullable().optional().or(z.literal("").transform(() => null)),
  })
  .refine((v) => v.customerName !== undefined || v.customerEmail !== undefined, { message: "Send customerName or customerEmail (or both) to change.", path: ["customerName"] });
export type UpdateUnitInput = z.infer<typeof updateUnitSchema>;

export type BatchSummary = {
  id: string;
  code: string;
  state: BatchState;
  quantity: number;
  units: number;
  measured: number;
  withinTolerance: number;
  outOfTolerance: number;
  inconclusive: number;
  spec: { id: string; name: string; version: number; versionId: string; family: Family };
  createdAt: string;
  releasedAt: string | null;
  releasedBy: { id: string; name: string } | null;
};

/** One row of the batch ledger: a unit with its latest evaluation. */
export type LedgerRow = {
  id: string;
  serial: string;
  customerName: string | null;
  customerEmail: string | null;
  strikes: number;
  pendingStrikes: number;
  lastMeasuredAt: string | null;
  verdict: Verdict | null;
  /** The fundamental as evaluated (median of the strikes, corrected to the reference temperature when they had one), Hz. */
  fundamentalHz: number | null;
  /** True when fundamentalHz was corrected to the spec's reference temperature. */
  temperatureCorrected: boolean;
  deviationCents: number | null;
  overtoneRatio: number | null;
  t60S: number | null;
  /** Decay the recordings saw, dB: the fundamental's T60 is extrapolated from it. */
  t60ObservedDecayDb: number | null;
  /** The fundamental's T60 was marked unreliable in a strike (not exponential, too short, masked by the room). */
  t60Unreliable: boolean;
  q: number | null;
  disposition: { id: string; decision: DispositionDecision; reason: string; at: string; by: string } | null;
  /** True when the unit still needs measuring, a verdict or a disposition before release. */
  open: boolean;
  /** Why the verdict is not within tolerance, a few words per reason ("Fundamental T60 17.3 s < 20 s minimum"). */
  why: string[];
  /** Strikes taken out of the record (not counted in `strikes`, not evaluated). */
  voidedStrikes: number;
};

export type BatchStatistics = {
  measured: number;
  /** Mean and sample standard deviation of the fundamental's deviation over measured units, cents. */
  meanDeviationCents: number | null;
  sdDeviationCents: number | null;
  /** Median T60 of the fundamental over measured units, s. */
  medianT60S: number | null;
};

export type BatchDetail = BatchSummary & {
  notes: string;
  rows: LedgerRow[];
  statistics: BatchStatistics;
  /** Tolerance of the fundamental, cents, and minimum T60, s, from the spec version (for charts). */
  fundamentalToleranceCents: number | null;
  minT60S: number | null;
  /** The spec version's reference temperature, °C (corrected frequencies are at it). */
  referenceTemperatureC: number;
};

export const dispositionDecisions = ["use_as_is", "rework", "scrap", "retest"] as const;
export type DispositionDecision = (typeof dispositionDecisions)[number];
export const dispositionLabels: Record<DispositionDecision, string> = {
  use_as_is: "Use as is (concession)",
  rework: "Rework and measure again",
  scrap: "Scrap",
  retest: "Measure again",
};

export const dispositionInputSchema = z.object({
  decision: z.enum(dispositionDecisions, { error: "Choose a decision" }),
  reason: reasonSchema,
});
export type DispositionInput = z.infer<typeof dispositionInputSchema>;

export type { EvaluationView };
