import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { BatchDetail } from "@shared/schemas/batch";
import type { BulkDispositionInput } from "@shared/schemas/corrections";
import { api } from "@/lib/api-client";
import { batchesKey } from "./get-batches";
import { getBatchQueryOptions } from "./get-batch";

/** One disposition for several units of the batch, all or nothing. */
export function recordBulkDisposition(batchId: string, input: BulkDispositionInput): Promise<BatchDetail> {
  return api.post<BatchDetail>(`/api/batches/${encodeURIComponent(batchId)}/dispositions`, input);
}

export function useRecordBulkDisposition(workshopId: string, batchId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: BulkDispositionInput) => recordBulkDisposition(batchId, input),
    onSuccess: async (detail) => {
      queryClient.setQueryData(getBatchQueryOptions(workshopId, batchId).queryKey, detail);
      await queryClient.invalidateQueries({ queryKey: [...batchesKey(workshopId), "list"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "dashboard"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "units"] });
    },
  });
}
