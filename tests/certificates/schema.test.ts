/** The issue request and the certificate data contract (shared/schemas/certificate.ts). */
import { describe, expect, it } from "vitest";
import { fieldMessages } from "../../shared/errors.ts";
import { certificateDataSchema, defaultStatementOfConformity, issueCertificateSchema } from "../../shared/schemas/certificate.ts";
import { buildCertificateData } from "./builders.ts";

describe("issueCertificateSchema", () => {
  it("accepts an e-mail alone, or with a name, and trims", () => {
    expect(issueCertificateSchema.parse({ recipientEmail: " buyer@example.org " })).toEqual({ recipientEmail: "buyer@example.org" });
    expect(issueCertificateSchema.parse({ recipientEmail: "buyer@example.org", recipientName: "Ada Buyer" }).recipientName).toBe("Ada Buyer");
  });

  it("says what is wrong with a bad e-mail", () => {
    const r = issueCertificateSchema.safeParse({ recipientEmail: "buyer-at-example.org" });
    expect(r.success).toBe(false);
    expect(fieldMessages(r.error!).recipientEmail).toMatch(/not an e-mail address.*name@example\.com/);
    expect(fieldMessages(issueCertificateSchema.safeParse({}).error!).recipientEmail).toBeTruthy();
  });

  it("needs a reason with an amendment, and a number with a reason", () => {
    expect(issueCertificateSchema.safeParse({ recipientEmail: "b@example.org", amendsNumber: "HB-1", amendReason: "Wrong serial printed." }).success).toBe(true);
    const noReason = issueCertificateSchema.safeParse({ recipientEmail: "b@example.org", amendsNumber: "HB-1" });
    expect(fieldMessages(noReason.error!).amendReason).toMatch(/needs a reason/);
    const noNumber = issueCertificateSchema.safeParse({ recipientEmail: "b@example.org", amendReason: "Wrong serial printed." });
    expect(fieldMessages(noNumber.error!).amendsNumber).toMatch(/no certificate to amend/);
  });
});

describe("certificateDataSchema", () => {
  it("accepts the sample builder's data", () => {
    expect(certificateDataSchema.safeParse(buildCertificateData()).success).toBe(true);
  });
  it("refuses a negative uncertainty and a non-positive tolerance", () => {
    const d = buildCertificateData();
    const bad = { ...d, results: [{ ...d.results[0], expandedUncertaintyHz: -0.1, toleranceCents: 0 }] };
    const fields = fieldMessages(certificateDataSchema.safeParse(bad).error!);
    expect(Object.keys(fields)).toEqual(expect.arrayContaining(["results.0.expandedUncertaintyHz", "results.0.toleranceCents"]));
  });
});

describe("defaultStatementOfConformity", () => {
  it("states conformity, non-conformity or that no decision is possible, naming the spec and rule", () => {
    expect(defaultStatementOfConformity("within_tolerance", "simple", "Bar F5", 2)).toMatch(/conforms to the specification/);
    expect(defaultStatementOfConformity("out_of_tolerance", "guarded", "Bar F5", 2)).toMatch(/does not conform/);
    expect(defaultStatementOfConformity("inconclusive", "guarded", "Bar F5", 2)).toMatch(/neither be confirmed nor ruled out/);
    expect(defaultStatementOfConformity("inconclusive", "guarded", "Bar F5", 2)).toContain("Bar F5, version 2, under the guarded acceptance rule");
  });
});
