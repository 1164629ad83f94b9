import { queryOptions, useQuery } from "@tanstack/react-query";
import type { SpecSummary } from "@shared/schemas/spec";
import { api } from "@/lib/api-client";

export async function getSpecs(): Promise<SpecSummary[]> {
  return (await api.get<{ specs: SpecSummary[] }>("/api/specs")).specs;
}

export const specsKey = (workshopId: string) => ["workshops", workshopId, "specs"] as const;

export const getSpecsQueryOptions = (workshopId: string) => queryOptions({ queryKey: specsKey(workshopId), queryFn: getSpecs });

export function useSpecs(workshopId: string) {
  return useQuery(getSpecsQueryOptions(workshopId));
}
