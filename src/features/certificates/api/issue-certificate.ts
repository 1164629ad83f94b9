import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { IssueCertificateInput } from "@shared/schemas/certificate";
import { api } from "@/lib/api-client";
import { certificatesKey, type CertificateListItem } from "./get-certificates";

export type IssuedCertificate = { number: string; verifyUrl: string; certificate: CertificateListItem };

/** Issues (or, with amendsNumber and amendReason, amends) a certificate; the server mails it. */
export function issueCertificate(unitId: string, input: IssueCertificateInput): Promise<IssuedCertificate> {
  return api.post<IssuedCertificate>(`/api/units/${encodeURIComponent(unitId)}/certificates`, input);
}

export function useIssueCertificate(workshopId: string, unitId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: IssueCertificateInput) => issueCertificate(unitId, input),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: certificatesKey(workshopId, unitId) });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "mail"] });
    },
  });
}
