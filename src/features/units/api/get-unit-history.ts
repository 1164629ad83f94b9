import { infiniteQueryOptions, useInfiniteQuery } from "@tanstack/react-query";
import type { AuditEvent, AuditPage } from "@shared/schemas/audit";
import { api } from "@/lib/api-client";

export type { AuditEvent };

/** One page of the unit's audit trail (append-only on the server), newest first. */
export async function getUnitHistory(unitId: string, cursor: string | null): Promise<AuditPage> {
  const params = new URLSearchParams({ unitId, limit: "50" });
  if (cursor) params.set("cursor", cursor);
  return api.get<AuditPage>(`/api/audit?${params}`);
}

/** `revision` changes whenever the unit page sees a new evaluation, disposition or customer, so the trail follows. */
export const getUnitHistoryQueryOptions = (workshopId: string, unitId: string, revision: string) =>
  infiniteQueryOptions({
    queryKey: ["workshops", workshopId, "units", unitId, "history", revision],
    queryFn: ({ pageParam }) => getUnitHistory(unitId, pageParam),
    initialPageParam: null as string | null,
    getNextPageParam: (last) => last.nextCursor,
  });

export function useUnitHistory(workshopId: string, unitId: string, revision: string) {
  return useInfiniteQuery({ ...getUnitHistoryQueryOptions(workshopId, unitId, revision), placeholderData: (previous) => previous });
}
