/**
 * The batch certificate: one signed document for a consignment, listing every unit of a released
 * batch that may carry a certificate, each with its results and expanded uncertainties, the units
 * released under a concession with what they depart from, and the units it does not cover.
 */
import { z } from "zod";
import { certificateDataSchema, certificateResultSchema, concessionSchema, verdictSchema, withdrawnMarkSchema, type CertificateSummaryBase } from "./certificate.ts";

/** Body of `POST /api/batches/:id/certificates`. */
export const issueBatchCertificateSchema = z.object({
  recipientEmail: z
    .string()
    .trim()
    .min(1, "Enter the recipient's e-mail address.")
    .pipe(z.email("This is not an e-mail address; the recipient's e-mail address should look like name@example.com.")),
  recipientName: z.string().trim().min(1, "Leave the recipient's name out or enter at least one character.").max(120, "Keep the recipient's name under 120 characters.").optional(),
});
export type IssueBatchCertificateInput = z.infer<typeof issueBatchCertificateSchema>;

export const batchCertificateUnitSchema = z.object({
  serial: z.string().trim().min(1),
  verdict: verdictSchema,
  results: z.array(certificateResultSchema).min(1, "Each unit listed needs at least one result line."),
  /** Ambient temperature of the unit's strikes (mean), °C; null when not recorded. */
  temperatureC: z.number().nullable(),
  strikes: z.number().int().positive(),
  concession: concessionSchema.nullable(),
});
export type BatchCertificateUnit = z.infer<typeof batchCertificateUnitSchema>;

const base = certificateDataSchema.pick({
  number: true,
  verificationCode: true,
  verifyUrl: true,
  issuedAt: true,
  workshop: true,
  customer: true,
  product: true,
  method: true,
  decisionRule: true,
  authorisedBy: true,
  authorisedAt: true,
  flags: true,
  measuredFrom: true,
  measuredTo: true,
});

export const batchCertificateDataSchema = base.extend({
  batch: z.object({ code: z.string().trim().min(1), quantity: z.number().int().positive(), unitCount: z.number().int().nonnegative() }),
  conditions: z.object({
    /** Lowest and highest ambient temperature of the strikes, °C; null when none was recorded. */
    temperatureMinC: z.number().nullable(),
    temperatureMaxC: z.number().nullable(),
    referenceTemperatureC: z.number().nullable(),
    support: z.string().trim().min(1),
  }),
  units: z.array(batchCertificateUnitSchema).min(1, "A batch certificate lists at least one unit."),
  /** Units of the batch the certificate does not cover, with the reason in words (e.g. scrapped). */
  excluded: z.array(z.object({ serial: z.string().trim().min(1), reason: z.string().trim().min(1) })),
  statementOfConformity: z.string().trim().min(1),
  withdrawn: withdrawnMarkSchema.nullable().optional(),
});
export type BatchCertificateData = z.infer<typeof batchCertificateDataSchema>;

/** The statement of conformity of a batch certificate, in our own words. */
export function batchStatementOfConformity(d: Pick<BatchCertificateData, "units" | "excluded" | "product" | "decisionRule">): string {
  const conforming = d.units.filter((u) => !u.concession).length;
  const conceded = d.units.length - conforming;
  const rule = d.decisionRule === "guarded" ? "guarded" : "simple";
  const parts = [
    `${conforming} of the ${d.units.length} units listed ${conforming === 1 ? "was" : "were"} found with every required partial within the tolerance of ${d.product.specName}, version ${d.product.specVersion}, under the ${rule} acceptance rule stated above, and ${conforming === 1 ? "conforms" : "conform"} to the specification.`,
  ];
  if (conceded > 0) {
    parts.push(
      `${conceded} unit${conceded === 1 ? " does" : "s do"} not conform in the requirements named under "Concessions" and ${conceded === 1 ? "was" : "were"} released as ${conceded === 1 ? "it is" : "they are"} by a recorded decision of the workshop.`,
    );
  }
  if (d.excluded.length > 0) parts.push(`The ${d.excluded.length} unit${d.excluded.length === 1 ? "" : "s"} named under "Not covered" ${d.excluded.length === 1 ? "is" : "are"} not covered by this certificate.`);
  return parts.join(" ");
}

/** A batch certificate in the batch's list. */
export type BatchCertificateSummary = CertificateSummaryBase & {
  units: number;
  concessions: number;
  excluded: number;
  state: "current" | "withdrawn";
};
