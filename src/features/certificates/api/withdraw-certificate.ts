import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { WithdrawCertificateInput } from "@shared/schemas/corrections";
import { api } from "@/lib/api-client";
import type { CertificateMail } from "./get-certificates";

export type Withdrawn = { number: string; withdrawn: { at: string; reason: string }; notice: CertificateMail | null };

/** Withdraws a unit or batch certificate; the server tells the recipient by e-mail. */
export function withdrawCertificate(number: string, input: WithdrawCertificateInput): Promise<Withdrawn> {
  return api.post<Withdrawn>(`/api/certificates/${encodeURIComponent(number)}/withdraw`, input);
}

/** Refreshes every certificate list of the workshop (unit and batch) and the outbox after a withdrawal. */
export function useWithdrawCertificate(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ number, ...input }: WithdrawCertificateInput & { number: string }) => withdrawCertificate(number, input),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "units"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "batch-certificates"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "mail"] });
    },
  });
}
