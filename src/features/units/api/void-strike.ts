import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { VoidStrikeInput } from "@shared/schemas/corrections";
import type { UnitDetail } from "@shared/schemas/strike";
import { api } from "@/lib/api-client";
import { unitKey } from "./get-unit";

/** Takes a strike out of the record with a reason; the server answers with the unit evaluated again. */
export function voidStrike(strikeId: string, input: VoidStrikeInput): Promise<UnitDetail> {
  return api.post<UnitDetail>(`/api/strikes/${encodeURIComponent(strikeId)}/void`, input);
}

export function useVoidStrike(workshopId: string, unitId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ strikeId, ...input }: VoidStrikeInput & { strikeId: string }) => voidStrike(strikeId, input),
    onSuccess: async (unit) => {
      queryClient.setQueryData(unitKey(workshopId, unitId), unit);
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "batches"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "dashboard"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "strikes"] });
    },
  });
}
