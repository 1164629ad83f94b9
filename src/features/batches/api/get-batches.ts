import { queryOptions, useQuery } from "@tanstack/react-query";
import type { BatchSummary } from "@shared/schemas/batch";
import { api } from "@/lib/api-client";

export async function getBatches(): Promise<BatchSummary[]> {
  return (await api.get<{ batches: BatchSummary[] }>("/api/batches")).batches;
}

/** Every batch query sits under this key, so an upload or a release can refresh them all at once. */
export const batchesKey = (workshopId: string) => ["workshops", workshopId, "batches"] as const;

export const getBatchesQueryOptions = (workshopId: string) => queryOptions({ queryKey: [...batchesKey(workshopId), "list"], queryFn: getBatches });

export function useBatches(workshopId: string) {
  return useQuery(getBatchesQueryOptions(workshopId));
}
