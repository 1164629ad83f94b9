/** What issuing every unit's certificate of a released batch would do: issue or skip, and why. */
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";

export type PlanItem = { unitId: string; serial: string; action: "issue" | "skip"; reason: string | null; recipientEmail: string | null };

/** Every query about a batch's certificates sits under this key (plan and batch certificates). */
export const batchCertificatesKey = (workshopId: string, batchId: string) => ["workshops", workshopId, "batch-certificates", batchId] as const;

export async function getUnitCertificatePlan(batchId: string): Promise<PlanItem[]> {
  return (await api.get<{ plan: PlanItem[] }>(`/api/batches/${encodeURIComponent(batchId)}/unit-certificates`)).plan;
}

export const getUnitCertificatePlanQueryOptions = (workshopId: string, batchId: string) =>
  queryOptions({ queryKey: [...batchCertificatesKey(workshopId, batchId), "plan"], queryFn: () => getUnitCertificatePlan(batchId) });

export const useUnitCertificatePlan = (workshopId: string, batchId: string) => useQuery(getUnitCertificatePlanQueryOptions(workshopId, batchId));
