/**
 * The review queue: units out of tolerance or inconclusive, still open, across the open batches.
 * The dashboard answer gives only the count, so the queue reads each batch that has any; the key
 * is the batch detail's own (features/batches), so the ledger page and this list share one cache.
 */
import { useQueries } from "@tanstack/react-query";
import type { BatchDetail, BatchSummary, LedgerRow } from "@shared/schemas/batch";
import { api } from "@/lib/api-client";

export type ReviewItem = { batch: Pick<BatchSummary, "id" | "code">; row: LedgerRow };

const batchDetailKey = (workshopId: string, id: string) => ["workshops", workshopId, "batches", "detail", id] as const;

export function useReviewQueue(workshopId: string, openBatches: BatchSummary[]) {
  const needing = openBatches.filter((b) => b.outOfTolerance + b.inconclusive > 0);
  return useQueries({
    queries: needing.map((b) => ({
      queryKey: batchDetailKey(workshopId, b.id),
      queryFn: () => api.get<BatchDetail>(`/api/batches/${encodeURIComponent(b.id)}`),
      // Same pace as the dashboard counts, so the list follows them as analyses finish.
      refetchInterval: 10_000,
    })),
    combine: (results) => ({
      pending: results.some((r) => r.isPending),
      error: results.find((r) => r.error)?.error ?? null,
      items: results.flatMap((r): ReviewItem[] =>
        r.data ? r.data.rows.filter((row) => row.open && (row.verdict === "out_of_tolerance" || row.verdict === "inconclusive")).map((row) => ({ batch: { id: r.data.id, code: r.data.code }, row })) : [],
      ),
    }),
  });
}
