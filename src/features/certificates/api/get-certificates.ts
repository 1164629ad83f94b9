import { queryOptions, useQuery } from "@tanstack/react-query";
import type { CertificateMailSummary, CertificateSummary } from "@shared/schemas/certificate";
import { api } from "@/lib/api-client";

export type CertificateMail = CertificateMailSummary;
export type CertificateListItem = CertificateSummary;

export async function getCertificates(unitId: string): Promise<CertificateListItem[]> {
  return (await api.get<{ certificates: CertificateListItem[] }>(`/api/units/${encodeURIComponent(unitId)}/certificates`)).certificates;
}

export const certificatesKey = (workshopId: string, unitId: string) => ["workshops", workshopId, "units", unitId, "certificates"] as const;

export const getCertificatesQueryOptions = (workshopId: string, unitId: string) =>
  queryOptions({ queryKey: certificatesKey(workshopId, unitId), queryFn: () => getCertificates(unitId) });

/** A mail still "sending" is asked about again every two seconds until it is sent or failed. */
export function useCertificates(workshopId: string, unitId: string) {
  return useQuery({
    ...getCertificatesQueryOptions(workshopId, unitId),
    refetchInterval: (query) => (query.state.data?.some((c) => c.mail?.state === "sending") ? 2000 : false),
  });
}

export const certificatePdfHref = (number: string) => `/api/certificates/${encodeURIComponent(number)}/pdf`;
