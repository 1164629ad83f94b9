import { queryOptions, useQuery } from "@tanstack/react-query";
import type { BatchDetail } from "@shared/schemas/batch";
import { api } from "@/lib/api-client";
import { batchesKey } from "./get-batches";

export function getBatch(id: string): Promise<BatchDetail> {
  return api.get<BatchDetail>(`/api/batches/${encodeURIComponent(id)}`);
}

export const getBatchQueryOptions = (workshopId: string, id: string) =>
  queryOptions({ queryKey: [...batchesKey(workshopId), "detail", id], queryFn: () => getBatch(id) });

/**
 * While any unit has a strike queued or analysing, ask again every second so the ledger fills in
 * as the analyses finish, without a reload.
 */
export function useBatch(workshopId: string, id: string) {
  return useQuery({
    ...getBatchQueryOptions(workshopId, id),
    refetchInterval: (query) => (query.state.data?.rows.some((row) => row.pendingStrikes > 0) ? 1000 : false),
  });
}
