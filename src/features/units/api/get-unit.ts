import { queryOptions, useQuery } from "@tanstack/react-query";
import type { UnitDetail } from "@shared/schemas/strike";
import { api } from "@/lib/api-client";

export function getUnit(id: string, options: { signal?: AbortSignal } = {}): Promise<UnitDetail> {
  return api.get<UnitDetail>(`/api/units/${encodeURIComponent(id)}`, options);
}

export const unitKey = (workshopId: string, id: string) => ["workshops", workshopId, "units", id] as const;

export const getUnitQueryOptions = (workshopId: string, id: string) =>
  queryOptions({ queryKey: unitKey(workshopId, id), queryFn: ({ signal }) => getUnit(id, { signal }) });

/** Polls every second while a strike is queued or analysing, so states move on screen without a reload. */
export function useUnit(workshopId: string, id: string) {
  return useQuery({
    ...getUnitQueryOptions(workshopId, id),
    refetchInterval: (query) => (query.state.data?.strikes.some((s) => s.state === "queued" || s.state === "analysing") ? 1000 : false),
  });
}
