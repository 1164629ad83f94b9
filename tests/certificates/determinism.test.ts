/**
 * The stored SHA-256 of a certificate PDF must be reproducible, or the hash cannot prove a PDF unaltered: the same data must give
 * the same bytes, whatever the machine's time zone, and different data different bytes.
 */
import { PDFParse } from "pdf-parse";
import { afterEach, describe, expect, it } from "vitest";
import { renderCertificatePdf } from "../../server/certificates/pdf.ts";
import { sha256Hex } from "../../server/certificates/signing.ts";
import { buildCertificateData } from "./builders.ts";

describe("certificate PDF determinism", () => {
  const originalTz = process.env.TZ;
  afterEach(() => {
    if (originalTz === undefined) delete process.env.TZ;
    else process.env.TZ = originalTz;
  });

  it("renders the same data to the same SHA-256", async () => {
    const a = await renderCertificatePdf(buildCertificateData());
    const b = await renderCertificatePdf(buildCertificateData());
    expect(sha256Hex(a)).toMatch(/^[0-9a-f]{64}$/);
    expect(sha256Hex(b)).toBe(sha256Hex(a));
  });

  it("does not depend on the machine's time zone", async () => {
    process.env.TZ = "UTC";
    const utc = await renderCertificatePdf(buildCertificateData());
    process.env.TZ = "Pacific/Chatham"; // UTC+13:45 in its summer: moves the local date
    const chatham = await renderCertificatePdf(buildCertificateData());
    expect(sha256Hex(chatham)).toBe(sha256Hex(utc));
  });

  it("records issuedAt as the PDF's creation date", async () => {
    const parser = new PDFParse({ data: new Uint8Array(await renderCertificatePdf(buildCertificateData())) });
    try {
      const info = await parser.getInfo();
      const dates = info.getDateNode();
      expect(dates.CreationDate?.toISOString()).toBe("2026-11-30T14:05:00.000Z");
      expect(dates.ModDate?.toISOString()).toBe("2026-11-30T14:05:00.000Z");
    } finally {
      await parser.destroy();
    }
  });

  it("changes when a printed value changes", async () => {
    const a = await renderCertificatePdf(buildCertificateData());
    const b = await renderCertificatePdf(buildCertificateData({ customer: { name: "Juniper Strings Ensemble Ltd" } }));
    const c = await renderCertificatePdf(buildCertificateData({ issuedAt: "2026-11-30T14:06:00.000Z" }));
    expect(sha256Hex(b)).not.toBe(sha256Hex(a));
    expect(sha256Hex(c)).not.toBe(sha256Hex(a));
  });
});
