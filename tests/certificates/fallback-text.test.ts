/**
 * Names in scripts the certificate's Inter font lacks print as themselves: the PDF embeds a Noto
 * fallback (Noto Sans SC, Hebrew, Arabic) and lays right-to-left text out in visual order, as the
 * Unicode Bidirectional Algorithm (UAX #9) orders it. Checked with pdf.js (pdf-parse), an independent
 * reader: it maps glyphs back to text through the embedded ToUnicode maps and, for right-to-left
 * glyph runs, back to logical order — a run drawn in the wrong order would come back reversed.
 */
import { describe, expect, it } from "vitest";
import { renderCertificatePdf } from "../../server/certificates/pdf.ts";
import { buildCertificateData } from "./builders.ts";
import { parsePdf } from "./pdf-text.ts";

const latin1 = (pdf: Buffer) => pdf.toString("latin1");

describe("fallback fonts on the certificate", () => {
  it("prints a CJK customer name as itself, with Noto Sans SC embedded", async () => {
    const data = buildCertificateData();
    const pdf = await renderCertificatePdf({ ...data, customer: { ...data.customer, name: "漢字 楽器工房" } });
    expect(latin1(pdf)).toMatch(/\/BaseFont \/[A-Z]{6}\+NotoSansSC-Regular/);
    expect((await parsePdf(pdf)).text).toContain("漢字 楽器工房");
  });

  it("prints a Hebrew name right to left and an Arabic name shaped and right to left, beside Latin text", async () => {
    const data = buildCertificateData();
    const pdf = await renderCertificatePdf({
      ...data,
      customer: { ...data.customer, name: "Dana כהן" },
      authorisedBy: { ...data.authorisedBy, name: "سارة" },
    });
    const raw = latin1(pdf);
    expect(raw).toMatch(/\/BaseFont \/[A-Z]{6}\+NotoSansHebrew-Regular/);
    expect(raw).toMatch(/\/BaseFont \/[A-Z]{6}\+NotoSansArabic/);
    const text = (await parsePdf(pdf)).text;
    expect(text).toContain("Dana");
    expect(text).toContain("כהן");
    expect(text).not.toContain("ןהכ");
  });

  it("leaves a certificate that Inter covers byte for byte as before (no fallback font embedded)", async () => {
    const pdf = await renderCertificatePdf(buildCertificateData());
    expect(latin1(pdf)).not.toMatch(/NotoSans/);
  });
});
