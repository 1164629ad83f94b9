import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { BatchDetail, CreateBatchInput } from "@shared/schemas/batch";
import { api } from "@/lib/api-client";
import { batchesKey } from "./get-batches";

export function createBatch(input: CreateBatchInput): Promise<BatchDetail> {
  return api.post<BatchDetail>("/api/batches", input);
}

export function useCreateBatch(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createBatch,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: batchesKey(workshopId) });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "dashboard"] });
      // The spec's batch count changed.
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "specs"] });
    },
  });
}
