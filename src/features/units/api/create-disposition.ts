import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { DispositionInput } from "@shared/schemas/batch";
import type { UnitDetail } from "@shared/schemas/strike";
import { api } from "@/lib/api-client";
import { unitKey } from "./get-unit";

export function createDisposition(unitId: string, input: DispositionInput): Promise<UnitDetail> {
  return api.post<UnitDetail>(`/api/units/${encodeURIComponent(unitId)}/dispositions`, input);
}

export function useCreateDisposition(workshopId: string, unitId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: DispositionInput) => createDisposition(unitId, input),
    onSuccess: async (unit) => {
      queryClient.setQueryData(unitKey(workshopId, unitId), unit);
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "batches"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "dashboard"] });
    },
  });
}
