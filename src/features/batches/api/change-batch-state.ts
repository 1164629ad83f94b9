/** "Mark in review" (open → in review) and "Release" (→ released); the server refuses a release with open units (409). */
import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { BatchDetail } from "@shared/schemas/batch";
import { api } from "@/lib/api-client";
import { batchesKey } from "./get-batches";
import { getBatchQueryOptions } from "./get-batch";

export function markInReview(batchId: string): Promise<BatchDetail> {
  return api.post<BatchDetail>(`/api/batches/${encodeURIComponent(batchId)}/review`);
}

export function releaseBatch(batchId: string): Promise<BatchDetail> {
  return api.post<BatchDetail>(`/api/batches/${encodeURIComponent(batchId)}/release`);
}

function useBatchStateMutation(workshopId: string, batchId: string, run: (batchId: string) => Promise<BatchDetail>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => run(batchId),
    onSuccess: async (detail) => {
      queryClient.setQueryData(getBatchQueryOptions(workshopId, batchId).queryKey, detail);
      await queryClient.invalidateQueries({ queryKey: [...batchesKey(workshopId), "list"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "dashboard"] });
      // Unit pages show the batch state (uploads close, certificates open on release).
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "units"] });
    },
  });
}

export const useMarkInReview = (workshopId: string, batchId: string) => useBatchStateMutation(workshopId, batchId, markInReview);
export const useReleaseBatch = (workshopId: string, batchId: string) => useBatchStateMutation(workshopId, batchId, releaseBatch);
