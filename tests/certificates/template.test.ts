/**
 * Template test: renders certificates and reads them back with pdf-parse (pdf.js),
 * failing when any required item — the content ISO/IEC 17025:2017 §7.8 asks of a
 * report — is missing or empty. The PDF is also rasterised with poppler and its QR code scanned
 * with jsQR, so the code is checked as a reader would use it.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { CertificateRenderError, FINE_PRINT, formatWithUncertainty, renderCertificatePdf } from "../../server/certificates/pdf.ts";
import { decisionRuleWords, needsMeasurementOnlyCaution, verdictWords, type CertificateData } from "../../shared/schemas/certificate.ts";
import { buildCertificateData, buildResult } from "./builders.ts";
import { hasPdftoppm, parsePdf, scanQrOnPage, type ParsedPdf } from "./pdf-text.ts";

const squash = (s: string) => s.replace(/\s+/g, " ").trim();

/** Every item a certificate must carry (ISO/IEC 17025:2017 §7.8.2, in our wording) as [what, text that must appear]. Values come from the data, so none is empty. */
function requiredItems(d: CertificateData): [string, string][] {
  const items: [string, string][] = [
    ["title", "Test certificate"],
    ["workshop name", d.workshop.name],
    ...d.workshop.address.split("\n").map((line, i): [string, string] => [`workshop address line ${i + 1}`, line]),
    ["certificate number", d.number],
    ["customer name", d.customer.name],
    ["unit serial", d.unit.serial],
    ["product / spec name", d.product.specName],
    ["spec version", `version ${d.product.specVersion}`],
    ["method name", d.method.name],
    ["analyser version", d.method.analyserVersion],
    ["method summary", squash(d.method.summary)],
    ["ambient temperature with unit", `${d.conditions.temperatureC} °C`],
    ["support condition", d.conditions.support],
    ["number of strikes", `Strikes combined ${d.conditions.strikes}`],
    ["place of measurement", `Place of measurement ${d.conditions.location ?? "at the issuing workshop"}`],
    ["measurement date (from)", d.measuredFrom],
    ["measurement date (to)", d.measuredTo],
    ["date and time of issue", "Date of issue 2026-11-30 14:05 UTC"],
    // A frequency corrected to the reference temperature says so in its column header.
    ["results: measured value unit", d.conditions.referenceTemperatureC != null ? `Measured at ${d.conditions.referenceTemperatureC} °C (Hz)` : "Measured (Hz)"],
    ["results: expanded uncertainty with k", "U, k = 2 (Hz)"],
    ["results: target unit", "Target (Hz)"],
    ["results: tolerance unit", "Tolerance (cents)"],
    ["results: deviation unit", "Deviation (cents)"],
    ["results: T60 unit", "T60 (s)"],
    ["results: Q column", " Q "],
    ["results: per-line result column", "Result"],
    ["decision rule", squash(decisionRuleWords[d.decisionRule])],
    ["statement of conformity", squash(d.statementOfConformity)],
    ["verdict", verdictWords[d.verdict]],
    ["results relate only to the item tested", FINE_PRINT.itemOnly],
    ["reproduce only in full", FINE_PRINT.fullOnly],
    ["coverage statement for U", "coverage factor k = 2"],
    ["authoriser name and role", `${d.authorisedBy.name}, ${d.authorisedBy.role}`],
    ["authorisation date and time", "2026-11-30 14:02 UTC"],
    ["verification URL", d.verifyUrl],
    ["verification code", d.verificationCode],
    ["end mark", FINE_PRINT.endMark],
  ];
  for (const r of d.results) {
    const m = formatWithUncertainty(r.measuredHz, r.expandedUncertaintyHz);
    items.push([`result ${r.label}: label`, r.label], [`result ${r.label}: measured and U`, `${m.value} ${m.u}`]);
  }
  return items;
}

function expectItems(parsed: ParsedPdf, items: [string, string][]): void {
  const missing = items.filter(([, text]) => !text.trim() || !parsed.text.includes(squash(text))).map(([what, text]) => `${what} ("${text}")`);
  expect(missing, `missing from the PDF text: ${missing.join("; ")}`).toEqual([]);
}

function expectEveryPageMarked(parsed: ParsedPdf, number: string): void {
  expect(parsed.total).toBeGreaterThan(0);
  parsed.pages.forEach((page, i) => {
    expect(page, `page ${i + 1} lacks the certificate number`).toContain(number);
    expect(page, `page ${i + 1} lacks "Page ${i + 1} of ${parsed.total}"`).toContain(`Page ${i + 1} of ${parsed.total}`);
  });
}

describe("certificate PDF template (one page, guarded rule, musical fork)", () => {
  const data = buildCertificateData();
  let pdf: Buffer;
  let parsed: ParsedPdf;
  beforeAll(async () => {
    pdf = await renderCertificatePdf(data);
    parsed = await parsePdf(pdf);
  });

  it("is a PDF", () => {
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
  });

  it("contains every required item of a certificate with its value", () => {
    expectItems(parsed, requiredItems(data));
  });

  it("prints each result line's values with their units' columns", () => {
    for (const cell of ["440.312", "0.023", "440", "\u00B15", "+1.2", "38.40", "53120", "Pass", "2758.90", "0.41", "\u00B115", "\u22120.1", "4.12", "5120"]) {
      expect(parsed.text).toContain(cell);
    }
  });

  it("marks every page with the number and page n of N", () => {
    expectEveryPageMarked(parsed, data.number);
  });

  it("puts the end mark after all other content, on the last page", () => {
    const last = parsed.pages[parsed.pages.length - 1];
    const end = last.indexOf(FINE_PRINT.endMark);
    expect(end).toBeGreaterThan(-1);
    expect(last.indexOf(FINE_PRINT.signature)).toBeLessThan(end);
    parsed.pages.slice(0, -1).forEach((p) => expect(p).not.toContain(FINE_PRINT.endMark));
  });

  it("embeds the QR code as an image on page 1", () => {
    const qr = parsed.images.filter((im) => im.page === 1 && im.width === im.height && im.width >= 100);
    expect(qr.length).toBe(1);
  });

  it("the QR code scans (poppler raster + jsQR) to the verification URL", () => {
    expect(hasPdftoppm(), "pdftoppm is missing: install the Debian package poppler-utils").toBe(true);
    expect(scanQrOnPage(pdf, 1)).toBe(data.verifyUrl);
  });

  it("leaves out the clinical caution for a musical fork, amendment note and superseded mark", () => {
    expect(parsed.text).not.toContain("Measurement only.");
    expect(parsed.text).not.toContain("Amendment.");
    expect(parsed.text).not.toContain("SUPERSEDED");
  });

  it("embeds its fonts (no reliance on the reader's fonts)", () => {
    const raw = pdf.toString("latin1");
    expect(raw).toMatch(/\/FontFile2 \d+ 0 R/);
    expect(raw).toMatch(/Inter-Regular/);
    expect(raw).not.toMatch(/\/BaseFont \/Helvetica/);
  });
});

describe("certificate PDF template (many lines, clinical fork, amendment, superseded)", () => {
  const results = Array.from({ length: 40 }, (_, i) =>
    buildResult({ label: `Partial ${i + 1}`, measuredHz: 128 * (i + 1) + 0.05, targetHz: 128 * (i + 1), result: i === 7 ? "fail" : i === 12 ? "inconclusive" : "pass" }),
  );
  const data = buildCertificateData({
    number: "HB-2026-000190",
    results,
    verdict: "out_of_tolerance",
    decisionRule: "simple",
    statementOfConformity: "At least one required partial lies outside its tolerance; the item does not conform to Clinical fork C128, version 2.",
    product: { specName: "Clinical fork C128", specVersion: 2, family: "tuning_fork_clinical" },
    flags: { measurementOnlyCaution: needsMeasurementOnlyCaution("tuning_fork_clinical") },
    amends: { number: "HB-2026-000147", reason: "The first overtone was matched to the wrong partial." },
    superseded: true,
    supersededBy: "HB-2026-000233",
    conditions: { temperatureC: null, referenceTemperatureC: null, support: "hand", strikes: 5 },
  });
  let pdf: Buffer;
  let parsed: ParsedPdf;
  beforeAll(async () => {
    pdf = await renderCertificatePdf(data);
    parsed = await parsePdf(pdf);
  });

  it("spans several pages, each with the number and page n of N", () => {
    expect(parsed.total).toBeGreaterThanOrEqual(2);
    expectEveryPageMarked(parsed, data.number);
  });

  it("still contains every required item, and every result line", () => {
    const items = requiredItems(data).filter(([what]) => what !== "ambient temperature with unit" && what !== "support condition");
    expectItems(parsed, items);
    expect(parsed.text).toContain("Ambient temperature not recorded");
    expect(parsed.text).toContain("held in the hand");
    expect(parsed.text).toContain("Fail");
    expect(parsed.text).toContain("Inconclusive");
  });

  it("repeats the table header on a continued page", () => {
    expect(parsed.pages[1]).toContain("Results, continued");
    expect(parsed.pages[1]).toContain("Measured (Hz)");
  });

  it("carries the measurement-only caution for a clinical fork", () => {
    expect(parsed.text).toContain(squash(FINE_PRINT.measurementOnly));
    expect(parsed.text).toMatch(/no claim that the fork is fit for diagnosis/);
  });

  it("says which certificate it amends and why", () => {
    expect(parsed.text).toContain("amends and replaces No. HB-2026-000147");
    expect(parsed.text).toContain(data.amends!.reason);
  });

  it("is marked SUPERSEDED, naming its successor, on every page", () => {
    expect(parsed.text).toContain("replaced by No. HB-2026-000233");
    parsed.pages.forEach((p, i) => expect(p, `page ${i + 1} lacks the SUPERSEDED mark`).toContain("SUPERSEDED"));
  });
});

describe("laboratory forks also get the caution", () => {
  it("needsMeasurementOnlyCaution recognises clinical and laboratory families only", () => {
    expect(needsMeasurementOnlyCaution("tuning_fork_laboratory")).toBe(true);
    expect(needsMeasurementOnlyCaution("tuning_fork_clinical")).toBe(true);
    expect(needsMeasurementOnlyCaution("tuning_fork_musical")).toBe(false);
    expect(needsMeasurementOnlyCaution("chime_bar")).toBe(false);
  });
  it("renders the caution for a laboratory fork", async () => {
    const data = buildCertificateData({ product: { specName: "Lab fork 512", specVersion: 1, family: "tuning_fork_laboratory" }, flags: { measurementOnlyCaution: true } });
    expect((await parsePdf(await renderCertificatePdf(data))).text).toContain("Measurement only.");
  });
});

describe("a T60 extrapolated from less than 60 dB of observed decay says so", () => {
  it("prints \u201Cfrom 18 dB\u201D under the T60 and the note explaining it; a result without the figure stays as it was", async () => {
    const data = buildCertificateData({ results: [buildResult({ t60ObservedDecayDb: 18 })] });
    const text = squash((await parsePdf(await renderCertificatePdf(data))).text);
    expect(text).toContain("38.40 from 18 dB");
    expect(text).toContain("T60 is extrapolated from it");
    const plain = squash((await parsePdf(await renderCertificatePdf(buildCertificateData()))).text);
    expect(plain).not.toContain("from 18 dB");
    expect(plain).not.toContain("T60 is extrapolated");
  });
});

describe("refuses data with a missing or empty item", () => {
  const cases: [string, Partial<CertificateData>, RegExp][] = [
    ["empty customer name", { customer: { name: "  " } }, /customer\.name: The customer's name must not be empty/],
    ["no results", { results: [] }, /results: A certificate needs at least one result line/],
    ["empty authoriser", { authorisedBy: { name: "", role: "Quality lead" } }, /authorisedBy\.name/],
    ["bad issue time", { issuedAt: "30/11/2026" }, /issuedAt: Use an ISO 8601 date and time/],
    ["short verification code", { verificationCode: "abc" }, /verificationCode: A verification code is 22 to 64/],
    ["non-http verify URL", { verifyUrl: "ftp://example.com/v/x" }, /verifyUrl/],
  ];
  for (const [what, override, message] of cases) {
    it(what, async () => {
      const p = renderCertificatePdf(buildCertificateData(override));
      await expect(p).rejects.toThrow(CertificateRenderError);
      await expect(renderCertificatePdf(buildCertificateData(override))).rejects.toThrow(message);
    });
  }
});

describe("formatWithUncertainty (JCGM 100:2008 GUM §7.2.6: U to at most two significant digits)", () => {
  it("rounds U to two significant digits and the value to the same decimal place", () => {
    expect(formatWithUncertainty(440.31234, 0.0234)).toEqual({ value: "440.312", u: "0.023" });
    expect(formatWithUncertainty(2758.9, 0.41)).toEqual({ value: "2758.90", u: "0.41" });
    expect(formatWithUncertainty(12345.6, 12)).toEqual({ value: "12346", u: "12" });
  });
});

describe("certificate layout: one page when the content fits, breaks between sections when it does not", () => {
  /** Which page (1-based) holds `text`, or 0. */
  const pageOf = (parsed: ParsedPdf, text: string) => parsed.pages.findIndex((p) => squash(p).includes(squash(text))) + 1;

  it("sets a two-partial fork certificate with the measurement-only caution on one page (it spilled its last note before)", async () => {
    const data = buildCertificateData({ flags: { measurementOnlyCaution: true } });
    const parsed = await parsePdf(await renderCertificatePdf(data));
    expect(parsed.total).toBe(1);
    expect(parsed.pages[0]).toContain(FINE_PRINT.endMark);
    expect(squash(parsed.pages[0])).toContain(squash(FINE_PRINT.signature));
  });

  it("keeps every section whole when it takes two pages: each heading on the page of its own text", async () => {
    const results = Array.from({ length: 7 }, (_, i) => buildResult({ label: `Partial ${i + 1}`, measuredHz: 440 * (i + 1) * 1.001, targetHz: 440 * (i + 1), minT60S: null }));
    const data = buildCertificateData({ results, flags: { measurementOnlyCaution: true }, amends: { number: "HB-2026-000146", reason: "The customer's name was misspelt on the earlier certificate; reissued with the name corrected and nothing else changed." } });
    const parsed = await parsePdf(await renderCertificatePdf(data));
    expect(parsed.total).toBe(2);
    // Heading → a sentence of that section's own text.
    const sections: [string, string][] = [
      ["Decision rule", decisionRuleWords[data.decisionRule].slice(0, 60)],
      ["Statement of conformity", data.statementOfConformity.slice(0, 60)],
      ["Authorisation", `${data.authorisedBy.name}, ${data.authorisedBy.role}`],
      ["Notes", FINE_PRINT.itemOnly],
      ["Notes", FINE_PRINT.signature.slice(0, 60)],
      ["Notes", FINE_PRINT.endMark],
      ["Method", data.method.summary.slice(0, 60)],
    ];
    for (const [heading, text] of sections) {
      expect(pageOf(parsed, text), `"${text}" is not on the page of its heading "${heading}"`).toBe(pageOf(parsed, heading === "Notes" ? FINE_PRINT.itemOnly : heading));
    }
    // The results table (shorter than a page) is whole on one page, not split with a "continued" header.
    expect(parsed.text).not.toContain("Results, continued");
    expect(pageOf(parsed, "Partial 1")).toBe(pageOf(parsed, "Partial 7"));
  });
});
