import { useMutation } from "@tanstack/react-query";
import type { IssueCertificateInput } from "@shared/schemas/certificate";
import { api } from "@/lib/api-client";

/** The PDF the certificate would be, before anything is stored or sent. */
export function previewCertificate(unitId: string, input: IssueCertificateInput): Promise<Blob> {
  return api.postForBlob(`/api/units/${encodeURIComponent(unitId)}/certificates/preview`, input);
}

export function usePreviewCertificate(unitId: string) {
  return useMutation({ mutationFn: (input: IssueCertificateInput) => previewCertificate(unitId, input) });
}
