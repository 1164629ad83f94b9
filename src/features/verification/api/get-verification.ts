import { queryOptions, useQuery } from "@tanstack/react-query";
import type { Concession, DecisionRule, LineResult, Verdict } from "@shared/schemas/certificate";
import { api } from "@/lib/api-client";

type ResultLine = { label: string; measuredHz: number; expandedUncertaintyHz: number; deviationCents: number; toleranceCents: number; result: LineResult };
type Common = {
  number: string;
  workshop: string;
  product: string;
  family: string;
  measuredFrom: string;
  measuredTo: string;
  issuedAt: string;
  decisionRule: DecisionRule;
  statementOfConformity: string;
  authorisedBy: { name: string; role: string };
  pdfSha256: string;
  signatureAlgorithm: string;
  signingKeyId: string;
  signatureValid: boolean;
  pdfIntact: boolean;
  /** When and why the workshop withdrew the certificate (no names). */
  withdrawn: { at: string; reason: string } | null;
};

/** A batch certificate: every unit it covers, with results, and the units it does not cover. */
export type BatchVerification = Common & {
  kind: "batch";
  batch: string;
  units: { serial: string; verdict: Verdict; concession: Concession | null; results: ResultLine[] }[];
  excluded: { serial: string; reason: string }[];
};

/** What the public verification look-up answers: only what the certificate shows, no contact data. */
export type Verification = UnitVerification | BatchVerification;

export type UnitVerification = Common & {
  kind: "unit";
  /** Set when the unit was released under a concession: what it departs from and why it was accepted. */
  concession: Concession | null;
  unit: string;
  verdict: Verdict;
  results: ResultLine[];
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
