import { queryOptions, useQuery } from "@tanstack/react-query";
import type { SpecDetail } from "@shared/schemas/spec";
import { api } from "@/lib/api-client";
import { specsKey } from "./get-specs";

export function getSpec(id: string): Promise<SpecDetail> {
  return api.get<SpecDetail>(`/api/specs/${encodeURIComponent(id)}`);
}

export const getSpecQueryOptions = (workshopId: string, id: string) =>
  queryOptions({ queryKey: [...specsKey(workshopId), id], queryFn: () => getSpec(id) });

export function useSpec(workshopId: string, id: string) {
  return useQuery(getSpecQueryOptions(workshopId, id));
}
