/** An explicit re-evaluation: appends a new evaluation with the instruments' calibrations as they stand now. */
import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { UnitDetail } from "@shared/schemas/strike";
import { api } from "@/lib/api-client";
import { unitKey } from "./get-unit";

export function reevaluateUnit(unitId: string): Promise<UnitDetail> {
  return api.post<UnitDetail>(`/api/units/${encodeURIComponent(unitId)}/evaluations`);
}

export function useReevaluateUnit(workshopId: string, unitId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => reevaluateUnit(unitId),
    onSuccess: async (unit) => {
      queryClient.setQueryData(unitKey(workshopId, unitId), unit);
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "batches"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "dashboard"] });
    },
  });
}
