/** One WAV to one unit, with upload progress (XMLHttpRequest under a TanStack mutation). */
import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { Support } from "@shared/schemas/spec";
import type { UploadAccepted } from "@shared/schemas/strike";
import { uploadForm, type UploadProgress } from "@/lib/upload";
import { unitKey } from "./get-unit";

export type StrikeUploadInput = { file: File; temperatureC?: number | null; support?: Support | null; onProgress?: (progress: UploadProgress) => void };

export function uploadStrike(unitId: string, { file, temperatureC, support, onProgress }: StrikeUploadInput): Promise<UploadAccepted> {
  const form = new FormData();
  if (temperatureC != null) form.append("temperatureC", String(temperatureC));
  if (support) form.append("support", support);
  form.append("audio", file, file.name);
  return uploadForm<UploadAccepted>(`/api/units/${encodeURIComponent(unitId)}/strikes`, form, onProgress);
}

export function useUploadStrike(workshopId: string, unitId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: StrikeUploadInput) => uploadStrike(unitId, input),
    onSuccess: async () => {
      // The unit query starts polling once it sees the queued strike.
      await queryClient.invalidateQueries({ queryKey: unitKey(workshopId, unitId) });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "batches"] });
    },
  });
}
