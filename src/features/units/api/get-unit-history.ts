import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";

export type AuditEvent = { id: number | string; action: string; entity: string; entityId: string; before: unknown; after: unknown; at: string; actor: string };

/** The unit's audit trail (append-only on the server): evaluations, dispositions, customer changes. */
export async function getUnitHistory(unitId: string): Promise<AuditEvent[]> {
  return (await api.get<{ events: AuditEvent[] }>(`/api/audit?unitId=${encodeURIComponent(unitId)}`)).events;
}

/** `revision` changes whenever the unit page sees a new evaluation, disposition or customer, so the trail follows. */
export const getUnitHistoryQueryOptions = (workshopId: string, unitId: string, revision: string) =>
  queryOptions({ queryKey: ["workshops", workshopId, "units", unitId, "history", revision], queryFn: () => getUnitHistory(unitId) });

export function useUnitHistory(workshopId: string, unitId: string, revision: string) {
  return useQuery({ ...getUnitHistoryQueryOptions(workshopId, unitId, revision), placeholderData: (previous) => previous });
}
