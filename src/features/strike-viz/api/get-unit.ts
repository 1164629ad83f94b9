import { queryOptions, useQuery } from "@tanstack/react-query";
import type { UnitDetail } from "@shared/schemas/strike";
import { api } from "@/lib/api-client";

/** The strike's unit, for the spec targets of its evaluation (deviation in cents per label). */
export function getUnit(unitId: string, options: { signal?: AbortSignal } = {}) {
  return api.get<UnitDetail>(`/api/units/${encodeURIComponent(unitId)}`, options);
}

export const getUnitQueryOptions = (workshopId: string, unitId: string) =>
  queryOptions({ queryKey: ["workshops", workshopId, "units", unitId], queryFn: ({ signal }) => getUnit(unitId, { signal }) });

export function useUnit(workshopId: string, unitId: string | undefined) {
  return useQuery({ ...getUnitQueryOptions(workshopId, unitId ?? ""), enabled: Boolean(unitId) });
}
