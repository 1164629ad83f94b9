/**
 * The quick path: one WAV to the batch; the server matches the unit by the serial in the file
 * name, else takes the next unmeasured unit. One request per file, with upload progress.
 */
import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { Support } from "@shared/schemas/spec";
import type { StrikeState } from "@shared/schemas/strike";
import { uploadForm, type UploadProgress } from "@/lib/upload";
import { batchesKey } from "./get-batches";

export type BatchUploadAccepted = { id: string; state: StrikeState; unitId: string; serial: string; matchedBy: "file name" | "next unmeasured unit" };

export type BatchUploadInput = { file: File; temperatureC?: number | null; support?: Support | null; onProgress?: (progress: UploadProgress) => void };

export function uploadBatchStrike(batchId: string, { file, temperatureC, support, onProgress }: BatchUploadInput): Promise<BatchUploadAccepted> {
  const form = new FormData();
  if (temperatureC != null) form.append("temperatureC", String(temperatureC));
  if (support) form.append("support", support);
  form.append("audio", file, file.name);
  return uploadForm<BatchUploadAccepted>(`/api/batches/${encodeURIComponent(batchId)}/strikes`, form, onProgress);
}

export function useUploadBatchStrike(workshopId: string, batchId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: BatchUploadInput) => uploadBatchStrike(batchId, input),
    onSuccess: async (accepted) => {
      await queryClient.invalidateQueries({ queryKey: batchesKey(workshopId) });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "units", accepted.unitId] });
    },
  });
}
