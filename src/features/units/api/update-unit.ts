import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { UpdateUnitInput } from "@shared/schemas/batch";
import type { UnitDetail } from "@shared/schemas/strike";
import { api } from "@/lib/api-client";
import { unitKey } from "./get-unit";

export function updateUnit(id: string, input: UpdateUnitInput): Promise<UnitDetail> {
  return api.patch<UnitDetail>(`/api/units/${encodeURIComponent(id)}`, input);
}

export function useUpdateUnit(workshopId: string, id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateUnitInput) => updateUnit(id, input),
    onSuccess: async (unit) => {
      queryClient.setQueryData(unitKey(workshopId, id), unit);
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "batches"] });
    },
  });
}
