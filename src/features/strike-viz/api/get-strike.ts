import { queryOptions, useQuery } from "@tanstack/react-query";
import type { StrikeDetail } from "@shared/schemas/strike";
import { api } from "@/lib/api-client";

export function getStrike(strikeId: string, options: { signal?: AbortSignal } = {}) {
  return api.get<StrikeDetail>(`/api/strikes/${encodeURIComponent(strikeId)}`, options);
}

/** A strike belongs to the active workshop, so its key carries the workshop id. */
export const getStrikeQueryOptions = (workshopId: string, strikeId: string) =>
  queryOptions({
    queryKey: ["workshops", workshopId, "strikes", strikeId],
    queryFn: ({ signal }) => getStrike(strikeId, { signal }),
    // Queued and analysing strikes move on by themselves: ask again every second until done or failed.
    refetchInterval: (query) => {
      const state = query.state.data?.state;
      return state === "queued" || state === "analysing" ? 1000 : false;
    },
  });

export function useStrike(workshopId: string, strikeId: string) {
  return useQuery(getStrikeQueryOptions(workshopId, strikeId));
}
