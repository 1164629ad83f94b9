/**
 * The quick path: one WAV to the batch; the server matches the unit by the serial in the file
 * name, else takes the next unmeasured unit. One request per file, with upload progress.
 */
import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { StrikeState } from "@shared/schemas/strike";
import { strikeUploadForm, uploadForm, type StrikeUploadInput } from "@/lib/upload";
import { batchesKey } from "./get-batches";

export type BatchUploadAccepted = { id: string; state: StrikeState; unitId: string; serial: string; matchedBy: "file name" | "next unmeasured unit" };

export function uploadBatchStrike(batchId: string, input: StrikeUploadInput): Promise<BatchUploadAccepted> {
  return uploadForm<BatchUploadAccepted>(`/api/batches/${encodeURIComponent(batchId)}/strikes`, strikeUploadForm(input), input.onProgress);
}

export function useUploadBatchStrike(workshopId: string, batchId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: StrikeUploadInput) => uploadBatchStrike(batchId, input),
    onSuccess: async (accepted) => {
      await queryClient.invalidateQueries({ queryKey: batchesKey(workshopId) });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "units", accepted.unitId] });
    },
  });
}
