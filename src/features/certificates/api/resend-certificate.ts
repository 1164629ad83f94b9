import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { certificatesKey, type CertificateMail } from "./get-certificates";

export function resendCertificate(number: string): Promise<{ mail: CertificateMail }> {
  return api.post<{ mail: CertificateMail }>(`/api/certificates/${encodeURIComponent(number)}/send`);
}

export function useResendCertificate(workshopId: string, unitId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resendCertificate,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: certificatesKey(workshopId, unitId) });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "mail"] });
    },
  });
}
