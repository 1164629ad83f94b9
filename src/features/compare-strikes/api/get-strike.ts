import { queryOptions, useQueries } from "@tanstack/react-query";
import type { StrikeDetail } from "@shared/schemas/strike";
import { api } from "@/lib/api-client";

export function getStrike(strikeId: string, options: { signal?: AbortSignal } = {}) {
  return api.get<StrikeDetail>(`/api/strikes/${encodeURIComponent(strikeId)}`, options);
}

/** Same key as the strike page's query, so a strike opened there is not fetched twice. */
export const getStrikeQueryOptions = (workshopId: string, strikeId: string) =>
  queryOptions({ queryKey: ["workshops", workshopId, "strikes", strikeId], queryFn: ({ signal }) => getStrike(strikeId, { signal }) });

export function useStrikes(workshopId: string, strikeIds: string[]) {
  return useQueries({ queries: strikeIds.map((id) => getStrikeQueryOptions(workshopId, id)) });
}
