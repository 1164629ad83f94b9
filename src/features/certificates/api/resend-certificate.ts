import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { CertificateMail } from "./get-certificates";

export function resendCertificate(number: string): Promise<{ mail: CertificateMail }> {
  return api.post<{ mail: CertificateMail }>(`/api/certificates/${encodeURIComponent(number)}/send`);
}

/** `listKey`: the query of the list the certificate is shown in (a unit's, or a batch's). */
export function useResendCertificate(workshopId: string, listKey: readonly unknown[]) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resendCertificate,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: listKey });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "mail"] });
    },
  });
}
