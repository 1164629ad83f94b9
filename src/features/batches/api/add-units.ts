import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { AddUnitsInput, BatchDetail } from "@shared/schemas/batch";
import { api } from "@/lib/api-client";
import { batchesKey } from "./get-batches";
import { getBatchQueryOptions } from "./get-batch";

export function addUnits(batchId: string, input: AddUnitsInput): Promise<BatchDetail> {
  return api.post<BatchDetail>(`/api/batches/${encodeURIComponent(batchId)}/units`, input);
}

export function useAddUnits(workshopId: string, batchId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: AddUnitsInput) => addUnits(batchId, input),
    onSuccess: async (detail) => {
      queryClient.setQueryData(getBatchQueryOptions(workshopId, batchId).queryKey, detail);
      await queryClient.invalidateQueries({ queryKey: [...batchesKey(workshopId), "list"] });
    },
  });
}
