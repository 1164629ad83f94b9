/** One WAV to one unit, with upload progress (XMLHttpRequest under a TanStack mutation). */
import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { UploadAccepted } from "@shared/schemas/strike";
import { strikeUploadForm, uploadForm, type StrikeUploadInput } from "@/lib/upload";
import { unitKey } from "./get-unit";

export function uploadStrike(unitId: string, input: StrikeUploadInput): Promise<UploadAccepted> {
  return uploadForm<UploadAccepted>(`/api/units/${encodeURIComponent(unitId)}/strikes`, strikeUploadForm(input), input.onProgress);
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
