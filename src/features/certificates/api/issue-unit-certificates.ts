/** Issues every unit's certificate of a released batch, one JSON line per unit as it is done. */
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { CertificateMail } from "./get-certificates";
import { batchCertificatesKey } from "./get-unit-certificate-plan";

export type IssueOutcome = { unitId: string; serial: string; outcome: "issued" | "skipped" | "failed"; number: string | null; reason: string | null; mail: CertificateMail["state"] | null };
export type RunLine =
  | ({ type: "progress"; done: number; total: number } & IssueOutcome)
  | { type: "summary"; issued: number; skipped: number; failed: number; outcomes: IssueOutcome[] }
  | { type: "error"; message: string };

export function issueUnitCertificates(batchId: string, onLine: (line: RunLine) => void): Promise<void> {
  return api.postLines<RunLine>(`/api/batches/${encodeURIComponent(batchId)}/unit-certificates`, {}, onLine);
}

export function useIssueUnitCertificates(workshopId: string, batchId: string, onLine: (line: RunLine) => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => issueUnitCertificates(batchId, onLine),
    onSettled: async () => {
      await queryClient.invalidateQueries({ queryKey: batchCertificatesKey(workshopId, batchId) });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "units"] });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "mail"] });
    },
  });
}
