/** Issues a batch certificate (signed, stored and mailed to the recipient). */
import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { IssueBatchCertificateInput } from "@shared/schemas/batch-certificate";
import { api } from "@/lib/api-client";
import type { BatchCertificateItem } from "./get-batch-certificates";
import { batchCertificatesKey } from "./get-unit-certificate-plan";

export function issueBatchCertificate(batchId: string, input: IssueBatchCertificateInput) {
  return api.post<{ number: string; verifyUrl: string; certificate: BatchCertificateItem }>(`/api/batches/${encodeURIComponent(batchId)}/certificates`, input);
}

export function useIssueBatchCertificate(workshopId: string, batchId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: IssueBatchCertificateInput) => issueBatchCertificate(batchId, input),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: batchCertificatesKey(workshopId, batchId) });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "mail"] });
    },
  });
}
