/**
 * Corrections of the quality record (a strike voided, a disposition superseded, a certificate
 * withdrawn) and the bulk steps of QA. Each correction is a new entry with its reason; the same
 * schemas check the forms and the routes.
 */
import { z } from "zod";
import { dispositionDecisions } from "./batch.ts";
import { reasonSchema } from "./reason.ts";

export { reasonSchema };

export const voidStrikeSchema = z.object({ reason: reasonSchema });
export type VoidStrikeInput = z.infer<typeof voidStrikeSchema>;

export const withdrawCertificateSchema = z.object({ reason: reasonSchema });
export type WithdrawCertificateInput = z.infer<typeof withdrawCertificateSchema>;

export const supersedeDispositionSchema = z.object({
  decision: z.enum(dispositionDecisions, { error: "Choose a decision" }),
  reason: reasonSchema,
});
export type SupersedeDispositionInput = z.infer<typeof supersedeDispositionSchema>;

/** One disposition recorded for several units of a batch at once (one transaction). */
export const bulkDispositionSchema = z.object({
  unitIds: z.array(z.string().min(1)).min(1, "Select at least one unit.").max(5000, "At most 5000 units at once."),
  decision: z.enum(dispositionDecisions, { error: "Choose a decision" }),
  reason: reasonSchema,
});
export type BulkDispositionInput = z.infer<typeof bulkDispositionSchema>;

/** `GET /api/search?q=`: what was typed in the shell's search box. */
export const searchQuerySchema = z.object({
  q: z.string({ error: "Type something to search for." }).trim().min(1, "Type something to search for.").max(100, "Search for at most 100 characters."),
});

export type SearchResults = {
  units: { id: string; serial: string; batchId: string; batchCode: string }[];
  batches: { id: string; code: string; state: "open" | "in_review" | "released"; specName: string }[];
  certificates: { number: string; kind: "unit" | "batch"; unitId: string | null; batchId: string; label: string; state: "current" | "superseded" | "withdrawn" }[];
  customers: { unitId: string; serial: string; name: string | null; email: string | null }[];
};
