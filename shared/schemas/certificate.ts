/**
 * Test certificates: the request that issues one, and `CertificateData`, everything the
 * PDF shows and the signature covers. Content follows ISO/IEC 17025:2017 §7.8 (reports of
 * results), in our own wording: identification on every page, method, conditions, results with
 * units and expanded uncertainty, decision rule, statement of conformity, authorisation, amendments.
 */
import { z } from "zod";

const email = (what: string) =>
  z
    .string()
    .trim()
    .min(1, `Enter ${what}.`)
    .pipe(z.email(`This is not an e-mail address; ${what} should look like name@example.com.`));

/** Body of `POST /api/units/:id/certificates`. Amending needs both the number amended and a reason. */
export const issueCertificateSchema = z
  .object({
    recipientEmail: email("the recipient's e-mail address"),
    recipientName: z.string().trim().min(1, "Leave the recipient's name out or enter at least one character.").max(120, "Keep the recipient's name under 120 characters.").optional(),
    amendsNumber: z.string().trim().min(1, "Give the number of the certificate this one amends.").max(64).optional(),
    amendReason: z.string().trim().min(3, "Say in a few words why the certificate is amended.").max(500, "Keep the reason under 500 characters.").optional(),
  })
  .superRefine((v, ctx) => {
    if (v.amendsNumber && !v.amendReason) {
      ctx.addIssue({ code: "custom", path: ["amendReason"], message: "An amendment needs a reason: say what was wrong in the earlier certificate." });
    }
    if (v.amendReason && !v.amendsNumber) {
      ctx.addIssue({ code: "custom", path: ["amendsNumber"], message: "A reason was given but no certificate to amend: give its number, or leave the reason out." });
    }
  });
export type IssueCertificateInput = z.infer<typeof issueCertificateSchema>;

/** `201` answer of the issue route. */
export const issuedCertificateSchema = z.object({ number: z.string(), verifyUrl: z.string() });
export type IssuedCertificate = z.infer<typeof issuedCertificateSchema>;

/** Random, URL-safe verification code (base64url, ≥ 128 bits: at least 22 characters). */
export const verificationCodeSchema = z.string().regex(/^[A-Za-z0-9_-]{22,64}$/, "A verification code is 22 to 64 letters, digits, '-' or '_'; check the link.");

const isoDateTime = z.iso.datetime({ offset: true, message: "Use an ISO 8601 date and time, e.g. 2026-11-30T14:05:00Z." });
const isoDate = z.iso.date("Use an ISO 8601 date, e.g. 2026-11-30.").or(isoDateTime);
const text = (what: string) => z.string().trim().min(1, `${what} must not be empty.`);

export const lineResultSchema = z.enum(["pass", "fail", "inconclusive"]);
export type LineResult = z.infer<typeof lineResultSchema>;
export const verdictSchema = z.enum(["within_tolerance", "out_of_tolerance", "inconclusive"]);
export type Verdict = z.infer<typeof verdictSchema>;
export const decisionRuleSchema = z.enum(["simple", "guarded"]);
export type DecisionRule = z.infer<typeof decisionRuleSchema>;

/** One results line: a required partial as measured on this unit. */
export const certificateResultSchema = z.object({
  /** The partial's role in the spec, e.g. "Fundamental", "First overtone". */
  label: text("A result's label"),
  /** Measured frequency (median of the unit's strikes, corrected to the reference temperature when the spec has one), Hz. */
  measuredHz: z.number().positive(),
  /** Expanded uncertainty of the measured frequency, coverage factor k = 2 (about 95 %), Hz. */
  expandedUncertaintyHz: z.number().nonnegative(),
  /** Target frequency, Hz (a ratio target already resolved against the measured fundamental). */
  targetHz: z.number().positive(),
  /** Tolerance, ± cents around the target. */
  toleranceCents: z.number().positive(),
  /** Deviation of the measured from the target frequency, cents (1200·log₂(measured/target)). */
  deviationCents: z.number(),
  /** Decay time to −60 dB, s. */
  t60S: z.number().positive(),
  /** Decay the recordings saw, dB: T60 is extrapolated from it to 60 dB. Absent on older certificates. */
  t60ObservedDecayDb: z.number().nonnegative().optional(),
  /** Minimum T60 the spec requires for this partial, s; null when it sets none. */
  minT60S: z.number().positive().nullable().optional(),
  /** Quality factor Q = π·f·τ (dimensionless). */
  q: z.number().positive(),
  result: lineResultSchema,
});
export type CertificateResult = z.infer<typeof certificateResultSchema>;

/**
 * A unit released as it is although it departs from the specification (a use-as-is disposition):
 * what it departs from, the reason QA recorded and when. ISO/IEC 17025:2017 §7.8.6 asks that the
 * statement of conformity says what it applies to, so the certificate names each departure.
 */
export const concessionSchema = z.object({
  departures: z.array(text("A departure")).min(1, "A concession names at least one departure from the specification."),
  reason: text("The concession's reason"),
  decidedAt: isoDateTime,
});
export type Concession = z.infer<typeof concessionSchema>;

/** Set only when a withdrawn certificate is shown again: the mark is not part of what was signed. */
export const withdrawnMarkSchema = z.object({ at: isoDateTime, reason: text("The withdrawal reason") });
export type WithdrawnMark = z.infer<typeof withdrawnMarkSchema>;
/** One measuring instrument behind the results, with the calibration in force when they were measured. */
export const certificateInstrumentSchema = z.object({
  role: z.enum(["recorder", "thermometer"]),
  name: text("The instrument's name"),
  model: z.string(),
  serial: z.string(),
  /** calibrated: in calibration when used; expired / uncalibrated: the assumed tolerance was used; not_named: no instrument was recorded. */
  status: z.enum(["calibrated", "expired", "uncalibrated", "not_named"]),
  calibration: z
    .object({
      number: text("The calibration's record number"),
      calibratedOn: isoDate,
      validUntil: isoDate,
      /** What the calibration found and how it was used, e.g. "clock offset +18.40 ppm, U = 1.20 ppm (k = 2), corrected". */
      result: text("The calibration result"),
      /** What it was calibrated against: reference, its certificate and uncertainty. */
      reference: text("The calibration reference"),
    })
    .nullable(),
});
export type CertificateInstrument = z.infer<typeof certificateInstrumentSchema>;

/** One line of the fundamental's uncertainty budget, as printed (values already in words and units). */
export const budgetLineSchema = z.object({
  component: text("A budget component"),
  basis: text("A budget line's basis"),
  distribution: z.enum(["normal", "rectangular"]),
  standardUncertainty: text("A standard uncertainty"),
  sensitivity: text("A sensitivity coefficient"),
  /** Contribution to the combined standard uncertainty, Hz. */
  contributionHz: z.number().nonnegative(),
});

/** The chain behind the results: instruments, their calibrations and references, and the fundamental's budget. */
export const certificateTraceabilitySchema = z.object({
  /** True only when every instrument was within a valid calibration when the unit was measured. */
  traceable: z.boolean(),
  statement: text("The traceability statement"),
  instruments: z.array(certificateInstrumentSchema),
  budget: z
    .object({
      label: text("The budget's partial"),
      measuredHz: z.number().positive(),
      lines: z.array(budgetLineSchema).min(1),
      combinedHz: z.number().nonnegative(),
      coverageFactor: z.number().positive(),
      expandedHz: z.number().nonnegative(),
    })
    .nullable(),
});
export type CertificateTraceability = z.infer<typeof certificateTraceabilitySchema>;

export const certificateDataSchema = z.object({
  /** The certificate's unique number, printed on every page. */
  number: text("The certificate number").max(64),
  verificationCode: verificationCodeSchema,
  /** Public verification link, also encoded in the QR code. */
  verifyUrl: z.url({ protocol: /^https?$/, message: "The verification URL must be an http(s) address." }),
  issuedAt: isoDateTime,
  /** Set when this certificate amends (replaces) an earlier one. */
  amends: z.object({ number: text("The amended certificate's number"), reason: text("The amendment reason") }).nullable(),
  /** True when a later certificate replaced this one; the PDF then carries a SUPERSEDED mark. */
  superseded: z.boolean(),
  /** Number of the certificate that replaced this one, when known. */
  supersededBy: z.string().min(1).nullable().optional(),
  workshop: z.object({
    name: text("The workshop name"),
    /** Postal address, lines separated by "\n". */
    address: text("The workshop address"),
    sendingEmail: email("the workshop's sending address"),
    qualityEmail: email("the workshop's quality contact"),
  }),
  customer: z.object({ name: text("The customer's name") }),
  unit: z.object({ serial: text("The unit's serial") }),
  product: z.object({
    specName: text("The specification name"),
    specVersion: z.number().int().positive(),
    /** Product family, e.g. "tuning_fork_clinical", "chime_bar". */
    family: text("The product family"),
  }),
  method: z.object({
    name: text("The method name"),
    analyserVersion: text("The analyser version"),
    /** One or two sentences on how the partials were measured. */
    summary: text("The method summary"),
  }),
  conditions: z.object({
    /** Ambient temperature at measurement, °C; null when not recorded. */
    temperatureC: z.number().min(-50).max(80).nullable(),
    /** Reference temperature the results are corrected to, °C; null when no correction was applied. */
    referenceTemperatureC: z.number().nullable().optional(),
    /** How the unit was supported while struck, e.g. "suspended", "hand". */
    support: text("The support condition"),
    /** Number of strikes combined into the results. */
    strikes: z.number().int().positive(),
    /** Where the unit was measured (ISO/IEC 17025 §7.8.2.1 asks for it); absent: at the issuing workshop. */
    location: z.string().trim().min(1).max(200).nullable().optional(),
  }),
  measuredFrom: isoDate,
  measuredTo: isoDate,
  results: z.array(certificateResultSchema).min(1, "A certificate needs at least one result line."),
  decisionRule: decisionRuleSchema,
  verdict: verdictSchema,
  statementOfConformity: text("The statement of conformity"),
  /** Set for a unit released under a concession (use as is); the statement of conformity says so too. */
  concession: concessionSchema.nullable().optional(),
  authorisedBy: z.object({ name: text("The authoriser's name"), role: text("The authoriser's role") }),
  authorisedAt: isoDateTime,
  flags: z.object({
    /** Clinical or laboratory fork: the certificate adds that it states measurements only, no fitness for diagnosis. */
    measurementOnlyCaution: z.boolean(),
  }),
  /** When and why the certificate was withdrawn; the PDF then carries a WITHDRAWN mark. Never signed. */
  withdrawn: withdrawnMarkSchema.nullable().optional(),
  /** The measurement chain; absent on certificates issued before instruments were recorded. */
  traceability: certificateTraceabilitySchema.optional(),
});
export type CertificateData = z.infer<typeof certificateDataSchema>;

/** True for families whose users may rely on the pitch for a clinical or laboratory purpose. */
export function needsMeasurementOnlyCaution(family: string): boolean {
  return /clinic|medical|laborator|\blab\b|_lab\b/i.test(family);
}

/** Plain words for the verdict, used on the certificate and the verification page. */
export const verdictWords: Record<Verdict, string> = {
  within_tolerance: "Within tolerance",
  out_of_tolerance: "Out of tolerance",
  inconclusive: "Inconclusive",
};

/** Plain words for each decision rule (ISO/IEC 17025:2017 §7.8.6 asks for the rule to be stated). */
export const decisionRuleWords: Record<DecisionRule, string> = {
  simple:
    "Simple acceptance: a line passes when its measured deviation lies within the tolerance. The measurement uncertainty is reported but not subtracted from the tolerance, so a result close to a limit carries a higher risk of a wrong decision.",
  guarded:
    "Guarded acceptance: a line passes only when |deviation| + U ≤ tolerance, fails when |deviation| − U > tolerance, and is inconclusive otherwise (U = expanded uncertainty, k = 2).",
};

/** The sentence a concession adds to the statement of conformity: what it departs from, and why it was accepted. */
export function concessionStatement(c: Concession): string {
  return `The item was released as it is under a concession recorded by the workshop on ${c.decidedAt.slice(0, 10)}. It departs from the specification in: ${c.departures.join("; ")}. Reason recorded: ${c.reason}`;
}

/**
 * A default statement of conformity for the verdict, in our own words; the issuing service may
 * store its own text, which the certificate then prints as given.
 */
export function defaultStatementOfConformity(verdict: Verdict, rule: DecisionRule, specName: string, specVersion: number): string {
  const under = `${specName}, version ${specVersion}, under the ${rule === "guarded" ? "guarded" : "simple"} acceptance rule stated above`;
  switch (verdict) {
    case "within_tolerance":
      return `Every required partial of the item was found within the tolerance of ${under}. The item conforms to the specification.`;
    case "out_of_tolerance":
      return `At least one required partial of the item was found outside the tolerance of ${under}. The item does not conform to the specification.`;
    case "inconclusive":
      return `No required partial was found outside the tolerance of ${under}, but for at least one the measurement uncertainty does not allow a decision. Conformity can neither be confirmed nor ruled out.`;
  }
}

/** The state of a certificate's e-mail, as the lists show it. */
export type CertificateMailSummary = { id: string; state: "sending" | "sent" | "failed"; error: string | null; attempts: number };

/** What every certificate list shows of a certificate, unit or batch. */
export type CertificateSummaryBase = {
  id: string;
  number: string;
  issuedAt: string;
  recipientEmail: string;
  recipientName: string | null;
  verifyUrl: string;
  pdfSha256: string;
  /** When, why and by whom it was withdrawn (the workshop's own lists name the person). */
  withdrawn: { at: string; reason: string; by: string | null } | null;
  mail: CertificateMailSummary | null;
};

/** A unit's certificate in the unit's list. */
export type CertificateSummary = CertificateSummaryBase & {
  verdict: Verdict;
  /** Issued for a unit released under a concession (the certificate states it). */
  concession: boolean;
  amends: string | null;
  supersededBy: string | null;
  state: "current" | "superseded" | "withdrawn";
};
/** A certificate number: the workshop's prefix, the year of issue and a five-digit sequence (BTW-2026-00001). */
export function certificateNumber(prefix: string, year: number, sequence: number): string {
  return `${prefix}-${year}-${String(sequence).padStart(5, "0")}`;
}
