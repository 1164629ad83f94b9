import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { SupersedeDispositionInput } from "@shared/schemas/corrections";
import type { UnitDetail } from "@shared/schemas/strike";
import { api } from "@/lib/api-client";
import { unitKey } from "./get-unit";

/** Replaces the standing disposition with a new decision and its reason; both stay in the history. */
export function supersedeDisposition(dispositionId: string, input: SupersedeDispositionInput): Promise<UnitDetail> {
  return api.post<UnitDetail>(`/api/dispositions/${encodeURIComponent(dispositionId)}/supersede`, input);
}

export function useSupersedeDisposition(workshopId: string, unitId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ dispositionId, ...input }: SupersedeDispositionInput & { dispositionId: string }) => supersedeDisposition(dispositionId, input),
    onSuccess: async (unit) => {
      queryClient.setQueryData(unitKey(workshopId, unitId), unit);
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "batches"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "dashboard"] });
    },
  });
}
