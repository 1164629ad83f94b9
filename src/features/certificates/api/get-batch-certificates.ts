/** The batch certificates of one batch (documents for a consignment), newest first. */
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { BatchCertificateSummary } from "@shared/schemas/batch-certificate";
import { batchCertificatesKey } from "./get-unit-certificate-plan";

export type BatchCertificateItem = BatchCertificateSummary;

export async function getBatchCertificates(batchId: string): Promise<BatchCertificateItem[]> {
  return (await api.get<{ certificates: BatchCertificateItem[] }>(`/api/batches/${encodeURIComponent(batchId)}/certificates`)).certificates;
}

export const getBatchCertificatesQueryOptions = (workshopId: string, batchId: string) =>
  queryOptions({ queryKey: [...batchCertificatesKey(workshopId, batchId), "list"], queryFn: () => getBatchCertificates(batchId) });

export const useBatchCertificates = (workshopId: string, batchId: string) => useQuery(getBatchCertificatesQueryOptions(workshopId, batchId));
