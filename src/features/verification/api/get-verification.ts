import { queryOptions, useQuery } from "@tanstack/react-query";
import type { DecisionRule, LineResult, Verdict } from "@shared/schemas/certificate";
import { api } from "@/lib/api-client";

/** What the public verification look-up answers: only what the certificate shows, no contact data. */
export type Verification = {
  number: string;
  workshop: string;
  unit: string;
  product: string;
  family: string;
  measuredFrom: string;
  measuredTo: string;
  issuedAt: string;
  verdict: Verdict;
  decisionRule: DecisionRule;
  results: { label: string; measuredHz: number; expandedUncertaintyHz: number; deviationCents: number; toleranceCents: number; result: LineResult }[];
  authorisedBy: { name: string; role: string };
  pdfSha256: string;
  signatureAlgorithm: string;
  signingKeyId: string;
  signatureValid: boolean;
  pdfIntact: boolean;
  amends: { number: string; reason: string } | null;
  superseded: boolean;
  supersededBy: string | null;
};

/** `{ found: false }` for a code no certificate has: asked with ?notFound=ok, so no error status (and no console error). */
export type VerificationAnswer = ({ found: true } & Verification) | { found: false };

export function getVerification(code: string): Promise<VerificationAnswer> {
  return api.get<VerificationAnswer>(`/api/verify/${encodeURIComponent(code)}?notFound=ok`);
}

/** Not under a workshop: anyone holding the link sees the same answer. */
export const getVerificationQueryOptions = (code: string) =>
  queryOptions({ queryKey: ["verify", code], queryFn: () => getVerification(code), staleTime: 60_000 });

export function useVerification(code: string) {
  return useQuery(getVerificationQueryOptions(code));
}
