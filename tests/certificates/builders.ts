/**
 * Builders of sample certificate data for unit, API and browser tests. The workshop, people and
 * addresses are invented (example.com / example.org are reserved for documentation, RFC 2606).
 */
import type { CertificateData, CertificateResult } from "../../shared/schemas/certificate.ts";
import { defaultStatementOfConformity } from "../../shared/schemas/certificate.ts";

/** Cents between two frequencies, 1200·log₂(f/f₀). */
const cents = (f: number, f0: number) => 1200 * Math.log2(f / f0);

export function buildResult(overrides: Partial<CertificateResult> = {}): CertificateResult {
  const measuredHz = overrides.measuredHz ?? 440.312;
  const targetHz = overrides.targetHz ?? 440;
  return {
    label: "Fundamental",
    measuredHz,
    expandedUncertaintyHz: 0.0234,
    targetHz,
    toleranceCents: 5,
    deviationCents: cents(measuredHz, targetHz),
    t60S: 38.4,
    minT60S: 20,
    q: 53120,
    result: "pass",
    ...overrides,
  };
}

export function buildCertificateData(overrides: Partial<CertificateData> = {}): CertificateData {
  const product = overrides.product ?? { specName: "Concert fork A4", specVersion: 3, family: "tuning_fork_musical" };
  const decisionRule = overrides.decisionRule ?? "guarded";
  const verdict = overrides.verdict ?? "within_tolerance";
  return {
    number: "HB-2026-000147",
    verificationCode: "q3Vb7xK2mNpR8sT1uW4yZ6aC",
    verifyUrl: "http://localhost:3000/verify/q3Vb7xK2mNpR8sT1uW4yZ6aC",
    issuedAt: "2026-11-30T14:05:00.000Z",
    amends: null,
    superseded: false,
    supersededBy: null,
    workshop: {
      name: "Harrowgate Bell & Fork Works",
      address: "Unit 4, Copperfield Yard\n12 Anvil Lane\nHarrowgate HG9 4ZZ",
      sendingEmail: "certificates@harrowgate.example.com",
      qualityEmail: "quality@harrowgate.example.com",
    },
    customer: { name: "Juniper Strings Ensemble" },
    unit: { serial: "A4-0147" },
    product,
    method: {
      name: "Tinelog strike analysis",
      analyserVersion: "0.4.1",
      summary:
        "Each strike is recorded as uncompressed audio; the partials are located in a windowed, zero-padded spectrum and refined with a damped-sinusoid fit that gives frequency and decay together. The unit's result is the median over its strikes, with the spread and the fit uncertainty combined into U.",
    },
    conditions: { temperatureC: 21.4, referenceTemperatureC: 20, support: "suspended", strikes: 3, location: "Test bench 2, Harrowgate works" },
    measuredFrom: "2026-11-28",
    measuredTo: "2026-11-29",
    results: [
      buildResult(),
      buildResult({ label: "First overtone", measuredHz: 2758.9, targetHz: 2759.0, expandedUncertaintyHz: 0.41, toleranceCents: 15, t60S: 4.12, minT60S: null, q: 5120 }),
    ],
    decisionRule,
    verdict,
    statementOfConformity: defaultStatementOfConformity(verdict, decisionRule, product.specName, product.specVersion),
    authorisedBy: { name: "Morwenna Ashdown", role: "Quality lead" },
    authorisedAt: "2026-11-30T14:02:37.000Z",
    flags: { measurementOnlyCaution: false },
    ...overrides,
  };
}
