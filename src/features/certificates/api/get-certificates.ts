import { queryOptions, useQuery } from "@tanstack/react-query";
import type { Verdict } from "@shared/schemas/evaluation";
import { api } from "@/lib/api-client";

export type CertificateMail = { id: string; state: "sending" | "sent" | "failed"; error: string | null; attempts: number };
export type CertificateListItem = {
  id: string;
  number: string;
  issuedAt: string;
  recipientEmail: string;
  recipientName: string | null;
  verdict: Verdict;
  /** Issued for a unit released under a concession (the certificate states it). */
  concession: boolean;
  verifyUrl: string;
  pdfSha256: string;
  amends: string | null;
  supersededBy: string | null;
  state: "current" | "superseded" | "withdrawn";
  withdrawn: { at: string; reason: string; by: string | null } | null;
  mail: CertificateMail | null;
};

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
