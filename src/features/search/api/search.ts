import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import type { SearchResults } from "@shared/schemas/corrections";
import { api } from "@/lib/api-client";

export function search(q: string, options: { signal?: AbortSignal } = {}): Promise<SearchResults> {
  return api.get<SearchResults>(`/api/search?q=${encodeURIComponent(q)}`, options);
}

export const searchQueryOptions = (workshopId: string, q: string) =>
  queryOptions({ queryKey: ["workshops", workshopId, "search", q], queryFn: ({ signal }) => search(q, { signal }), staleTime: 10_000 });

/** Asks only once something is typed; keeps the last results on screen while the next ones come. */
export function useSearch(workshopId: string, q: string) {
  return useQuery({ ...searchQueryOptions(workshopId, q), enabled: q.trim().length > 0, placeholderData: keepPreviousData });
}
