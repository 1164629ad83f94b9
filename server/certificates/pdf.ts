/**
 * Renders a test certificate as PDF (issue 6 §2). Content follows ISO/IEC 17025:2017 §7.8 in our
 * own wording; the look is Tinelog's own (calm slate and teal, Inter embedded from
 * @expo-google-fonts/inter as TTF, which pdfkit can subset — STACK.md trap 7).
 *
 * Deterministic: the same CertificateData gives the same bytes (CreationDate/ModDate come from
 * issuedAt, pdfkit derives the file ID from the info dictionary, fonts and QR are generated without
 * randomness), so the stored SHA-256 can be recomputed.
 */
import { createRequire } from "node:module";
import PDFDocument from "pdfkit";
import QRCode from "qrcode";
import {
  certificateDataSchema,
  decisionRuleWords,
  verdictWords,
  type CertificateData,
  type CertificateResult,
  type LineResult,
} from "../../shared/schemas/certificate.ts";
import { useFallbackText } from "./fallback-text.ts";

const require = createRequire(import.meta.url);
const FONTS = {
  regular: require.resolve("@expo-google-fonts/inter/400Regular/Inter_400Regular.ttf"),
  medium: require.resolve("@expo-google-fonts/inter/500Medium/Inter_500Medium.ttf"),
  semibold: require.resolve("@expo-google-fonts/inter/600SemiBold/Inter_600SemiBold.ttf"),
};

/** Tinelog's certificate palette: slate ink, a deep teal accent, and muted signal colours. */
const COLOUR = {
  ink: "#1E2A32",
  muted: "#5B6B73",
  accent: "#2F6F6A",
  accentSoft: "#E7F0EE",
  rule: "#C8D5D2",
  zebra: "#F5F8F7",
  pass: "#2F6F4F",
  fail: "#9B3B2E",
  inconclusive: "#8A6D1F",
  amendSoft: "#F6F1E4",
};

const PAGE = { width: 595.28, height: 841.89 }; // A4 in points
const MARGIN = { left: 48, right: 48, top: 70, bottom: 62 };
const CONTENT_WIDTH = PAGE.width - MARGIN.left - MARGIN.right;
const BOTTOM = PAGE.height - MARGIN.bottom;

/** Thrown when the data cannot make a certificate; lists what is wrong. */
export class CertificateRenderError extends Error {
  override name = "CertificateRenderError";
}

// ---------------------------------------------------------------------------------------------
// Formatting: locale- and time-zone-independent so the bytes do not depend on the machine.

/** "2026-11-30T14:05:09Z" → "2026-11-30 14:05 UTC". */
export function formatDateTimeUtc(iso: string): string {
  const d = new Date(iso);
  const p = (n: number) => String(n).padStart(2, "0");
  return `${d.getUTCFullYear()}-${p(d.getUTCMonth() + 1)}-${p(d.getUTCDate())} ${p(d.getUTCHours())}:${p(d.getUTCMinutes())} UTC`;
}

/** A date or date-time → "2026-11-30" (UTC day). */
export function formatDateUtc(iso: string): string {
  if (/^\d{4}-\d{2}-\d{2}$/.test(iso)) return iso;
  return formatDateTimeUtc(iso).slice(0, 10);
}

const MINUS = "\u2212";
function signed(value: number, decimals: number): string {
  const s = Math.abs(value).toFixed(decimals);
  if (Number(s) === 0) return s;
  return value < 0 ? `${MINUS}${s}` : `+${s}`;
}

/**
 * Measured value and expanded uncertainty to matching decimals, the uncertainty to two
 * significant digits (JCGM 100:2008, GUM §7.2.6: "at most two significant digits").
 */
export function formatWithUncertainty(value: number, u: number): { value: string; u: string } {
  if (!(u > 0)) return { value: value.toFixed(3), u: "0" };
  const decimals = Math.min(6, Math.max(0, 1 - Math.floor(Math.log10(u))));
  return { value: value.toFixed(decimals), u: u.toFixed(decimals) };
}

function trimNumber(value: number, maxDecimals: number): string {
  return Number(value.toFixed(maxDecimals)).toString();
}

const SUPPORT_WORDS: Record<string, string> = {
  hand: "held in the hand",
  held_in_hand: "held in the hand",
  in_hand: "held in the hand",
  suspended: "suspended",
  stand: "on a stand or resonator",
  on_stand: "on a stand or resonator",
  resonator: "on a stand or resonator",
  stand_or_resonator: "on a stand or resonator",
  other: "other (see workshop records)",
};
function supportWords(support: string): string {
  return SUPPORT_WORDS[support] ?? support.replace(/_/g, " ");
}

function familyWords(family: string): string {
  return family.replace(/_/g, " ");
}

const RESULT_WORDS: Record<LineResult, string> = { pass: "Pass", fail: "Fail", inconclusive: "Inconclusive" };
const RESULT_COLOUR: Record<LineResult, string> = { pass: COLOUR.pass, fail: COLOUR.fail, inconclusive: COLOUR.inconclusive };
const VERDICT_COLOUR = { within_tolerance: COLOUR.pass, out_of_tolerance: COLOUR.fail, inconclusive: COLOUR.inconclusive } as const;

/** The fixed sentences of the fine print, exported so tests and the verification page use the same words. */
export const FINE_PRINT = {
  itemOnly: "The results relate only to the item tested, as it was when measured.",
  fullOnly: "This certificate may be reproduced only in full. Extracts need the written approval of the issuing workshop.",
  uncertainty:
    "U is the expanded uncertainty of the measured frequency, the standard uncertainty multiplied by a coverage factor k = 2, which for a normal distribution gives a coverage probability of about 95 %.",
  measurementOnly:
    "Measurement only. This certificate records what was measured on this fork and nothing more. It makes no claim that the fork is fit for diagnosis, clinical assessment or any laboratory procedure; whether it suits such a use is for the user to judge under the rules of their own profession and local regulations.",
  signature:
    "The data of this certificate are signed with the workshop's Ed25519 key. The verification page shows the certificate as issued, the SHA-256 of this PDF and whether the signature holds.",
  endMark: "End of certificate",
};

// ---------------------------------------------------------------------------------------------

type Doc = PDFKit.PDFDocument;

interface Column {
  key: string;
  title: string;
  width: number;
  align: "left" | "right" | "center";
}

const COLUMNS: Column[] = [
  { key: "label", title: "Partial", width: 73, align: "left" },
  { key: "measured", title: "Measured\n(Hz)", width: 56, align: "right" },
  { key: "u", title: "U, k = 2\n(Hz)", width: 42, align: "right" },
  { key: "target", title: "Target\n(Hz)", width: 54, align: "right" },
  { key: "tol", title: "Tolerance\n(cents)", width: 48, align: "right" },
  { key: "dev", title: "Deviation\n(cents)", width: 50, align: "right" },
  { key: "t60", title: "T60\n(s)", width: 40, align: "right" },
  { key: "t60min", title: "Min T60\n(s)", width: 44, align: "right" },
  { key: "q", title: "Q", width: 37, align: "right" },
  { key: "result", title: "Result", width: 55, align: "center" },
];

function cellsFor(r: CertificateResult): Record<string, string> {
  const m = formatWithUncertainty(r.measuredHz, r.expandedUncertaintyHz);
  return {
    label: r.label,
    measured: m.value,
    u: m.u,
    target: trimNumber(r.targetHz, 3),
    tol: `\u00B1${trimNumber(r.toleranceCents, 2)}`,
    dev: signed(r.deviationCents, 1),
    t60: r.t60S.toFixed(2),
    t60min: r.minT60S ? trimNumber(r.minT60S, 2) : "\u2014",
    q: Math.round(r.q).toString(),
    result: RESULT_WORDS[r.result],
  };
}

async function qrPng(url: string): Promise<Buffer> {
  // Error correction M survives a smudge or a fold; margin 4 is the quiet zone the QR standard asks for.
  return QRCode.toBuffer(url, { type: "png", errorCorrectionLevel: "M", margin: 4, scale: 6, color: { dark: "#1E2A32ff", light: "#ffffffff" } });
}

/**
 * Renders the certificate as a PDF (A4). Validates `data` against `certificateDataSchema` first.
 * @throws CertificateRenderError listing every field that is missing or invalid.
 */
export async function renderCertificatePdf(input: CertificateData): Promise<Buffer> {
  const parsed = certificateDataSchema.safeParse(input);
  if (!parsed.success) {
    const list = parsed.error.issues.map((i) => `${i.path.join(".") || "(root)"}: ${i.message}`).join("; ");
    throw new CertificateRenderError(`Cannot render the certificate: ${list}`);
  }
  const data = parsed.data;
  const qr = await qrPng(data.verifyUrl);
  const issued = new Date(data.issuedAt);

  const doc = new PDFDocument({
    size: "A4",
    margins: MARGIN,
    bufferPages: true,
    autoFirstPage: false,
    pdfVersion: "1.7",
    subset: "PDF/A-2b",
    lang: "en-GB",
    displayTitle: true,
    info: {
      Title: `Test certificate ${data.number}`,
      Author: data.workshop.name,
      Subject: `Test certificate for unit ${data.unit.serial}, ${data.product.specName} v${data.product.specVersion}`,
      Creator: "Tinelog",
      Producer: "Tinelog (pdfkit)",
      CreationDate: issued,
      ModDate: issued,
    },
  });
  const chunks: Buffer[] = [];
  doc.on("data", (c: Buffer) => chunks.push(c));
  const finished = new Promise<Buffer>((resolve, reject) => {
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });

  doc.registerFont("regular", FONTS.regular);
  doc.registerFont("medium", FONTS.medium);
  doc.registerFont("semibold", FONTS.semibold);
  // Names in scripts Inter lacks (CJK, Arabic, Hebrew) get a Noto fallback, right-to-left in order.
  useFallbackText(doc);

  doc.on("pageAdded", () => drawHeader(doc, data));
  doc.addPage();

  drawTitleBlock(doc, data, qr);
  drawParticulars(doc, data);
  drawResults(doc, data);
  drawConformity(doc, data);
  drawAuthorisation(doc, data);
  drawFinePrint(doc, data);
  drawEndMark(doc);

  drawFooters(doc, data);
  doc.end();
  return finished;
}

function drawHeader(doc: Doc, data: CertificateData): void {
  const y = 30;
  doc.save();
  doc.font("semibold").fontSize(9).fillColor(COLOUR.ink).text(data.workshop.name, MARGIN.left, y, { width: CONTENT_WIDTH / 2 - 8, height: 11, ellipsis: true });
  doc
    .font("regular")
    .fontSize(8.5)
    .fillColor(COLOUR.muted)
    .text(`Test certificate No. ${data.number}`, MARGIN.left + CONTENT_WIDTH / 2, y, { width: CONTENT_WIDTH / 2, align: "right", lineBreak: false });
  doc.moveTo(MARGIN.left, 50).lineTo(PAGE.width - MARGIN.right, 50).lineWidth(1.2).strokeColor(COLOUR.accent).stroke();
  doc.restore();
  doc.x = MARGIN.left;
  doc.y = MARGIN.top;
}

function drawFooters(doc: Doc, data: CertificateData): void {
  const range = doc.bufferedPageRange();
  const total = range.count;
  for (let i = range.start; i < range.start + total; i++) {
    doc.switchToPage(i);
    // Writing below the bottom margin would make pdfkit start a new page: lift the margin for the footer.
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const y = PAGE.height - 44;
    doc.moveTo(MARGIN.left, y - 8).lineTo(PAGE.width - MARGIN.right, y - 8).lineWidth(0.5).strokeColor(COLOUR.rule).stroke();
    doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted);
    doc.text(`Certificate No. ${data.number}`, MARGIN.left, y, { width: CONTENT_WIDTH / 3, lineBreak: false });
    doc.text("Reproduce only in full", MARGIN.left + CONTENT_WIDTH / 3, y, { width: CONTENT_WIDTH / 3, align: "center", lineBreak: false });
    doc.font("medium").fillColor(COLOUR.ink);
    doc.text(`Page ${i - range.start + 1} of ${total}`, MARGIN.left + (2 * CONTENT_WIDTH) / 3, y, { width: CONTENT_WIDTH / 3, align: "right", lineBreak: false });
    if (data.superseded) drawSupersededWatermark(doc);
    doc.page.margins.bottom = bottom;
  }
}

function drawSupersededWatermark(doc: Doc): void {
  doc.save();
  const cx = PAGE.width / 2;
  const cy = PAGE.height / 2;
  doc.rotate(-35, { origin: [cx, cy] });
  doc.font("semibold").fontSize(84).fillColor(COLOUR.fail).fillOpacity(0.1);
  doc.text("SUPERSEDED", cx - 330, cy - 50, { width: 660, align: "center", lineBreak: false });
  doc.restore();
}

function ensureSpace(doc: Doc, height: number): void {
  if (doc.y + height > BOTTOM) doc.addPage();
}

function sectionHeading(doc: Doc, title: string, spaceAfterHeading = 40): void {
  ensureSpace(doc, 18 + spaceAfterHeading);
  doc.moveDown(0.5);
  doc.font("semibold").fontSize(10).fillColor(COLOUR.accent).text(title, MARGIN.left, doc.y, { width: CONTENT_WIDTH });
  doc.moveDown(0.25);
}

function drawTitleBlock(doc: Doc, data: CertificateData, qr: Buffer): void {
  const top = doc.y;
  const qrSize = 84;
  const qrX = PAGE.width - MARGIN.right - qrSize;
  doc.image(qr, qrX, top - 4, { width: qrSize, height: qrSize });
  doc.font("regular").fontSize(6.5).fillColor(COLOUR.muted).text("Scan to verify", qrX, top + qrSize - 2, { width: qrSize, align: "center" });

  const textWidth = CONTENT_WIDTH - qrSize - 16;
  doc.font("semibold").fontSize(22).fillColor(COLOUR.ink).text("Test certificate", MARGIN.left, top, { width: textWidth });
  doc.font("medium").fontSize(11).fillColor(COLOUR.accent).text(`No. ${data.number}`, { width: textWidth });
  doc.moveDown(0.3);
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.muted).text("Measured partial frequencies and decay of a tuned metal item", { width: textWidth });
  doc.moveDown(0.5);

  // Verdict badge.
  const verdict = verdictWords[data.verdict];
  doc.font("semibold").fontSize(10);
  const badgeW = doc.widthOfString(verdict) + 20;
  const badgeY = doc.y;
  doc.roundedRect(MARGIN.left, badgeY, badgeW, 20, 4).fillColor(VERDICT_COLOUR[data.verdict]).fill();
  doc.fillColor("#FFFFFF").text(verdict, MARGIN.left, badgeY + 5, { width: badgeW, align: "center", lineBreak: false });
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.muted).text(`Verdict against ${data.product.specName}, version ${data.product.specVersion}`, MARGIN.left + badgeW + 10, badgeY + 5.5, {
    width: textWidth - badgeW - 10,
    lineBreak: false,
  });
  doc.y = Math.max(badgeY + 28, top + qrSize + 10);
  doc.x = MARGIN.left;

  doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text(`Verify at ${data.verifyUrl} \u00B7 code ${data.verificationCode}`, MARGIN.left, doc.y, { width: CONTENT_WIDTH, align: "right", link: data.verifyUrl });
  doc.moveDown(0.4);

  if (data.superseded) {
    const msg = data.supersededBy
      ? `SUPERSEDED. This certificate has been replaced by No. ${data.supersededBy}; it stays on record as issued but is no longer valid.`
      : "SUPERSEDED. This certificate has been replaced by a later one; it stays on record as issued but is no longer valid.";
    noticeBox(doc, msg, COLOUR.fail, "#FFFFFF", true);
  }
  if (data.amends) {
    noticeBox(
      doc,
      `Amendment. This certificate amends and replaces No. ${data.amends.number}, which stays on record marked superseded. Reason: ${data.amends.reason}`,
      COLOUR.amendSoft,
      COLOUR.ink,
      false,
    );
  }
}

function noticeBox(doc: Doc, message: string, fill: string, ink: string, strong: boolean): void {
  doc.font(strong ? "semibold" : "regular").fontSize(9);
  const h = doc.heightOfString(message, { width: CONTENT_WIDTH - 20 }) + 14;
  ensureSpace(doc, h + 6);
  const y = doc.y;
  doc.roundedRect(MARGIN.left, y, CONTENT_WIDTH, h, 4).fillColor(fill).fill();
  doc.fillColor(ink).text(message, MARGIN.left + 10, y + 7, { width: CONTENT_WIDTH - 20 });
  doc.x = MARGIN.left;
  doc.y = y + h + 6;
}

/** Label/value pairs in two columns. */
function drawParticulars(doc: Doc, data: CertificateData): void {
  const c = data.conditions;
  const left: [string, string][] = [
    ["Issued by", `${data.workshop.name}\n${data.workshop.address}`],
    ["Quality contact", data.workshop.qualityEmail],
    ["Customer", data.customer.name],
    ["Item tested", `Serial ${data.unit.serial}`],
    ["Product", `${data.product.specName}, version ${data.product.specVersion}`],
    ["Product family", familyWords(data.product.family)],
  ];
  const measured =
    formatDateUtc(data.measuredFrom) === formatDateUtc(data.measuredTo)
      ? formatDateUtc(data.measuredFrom)
      : `${formatDateUtc(data.measuredFrom)} to ${formatDateUtc(data.measuredTo)}`;
  const right: [string, string][] = [
    ["Date of measurement", measured],
    ["Date of issue", formatDateTimeUtc(data.issuedAt)],
    ["Ambient temperature", c.temperatureC === null ? "not recorded" : `${trimNumber(c.temperatureC, 1)} \u00B0C`],
    [
      "Temperature correction",
      c.referenceTemperatureC === null || c.referenceTemperatureC === undefined ? "none applied" : `frequencies corrected to ${trimNumber(c.referenceTemperatureC, 1)} \u00B0C`,
    ],
    ["Support while struck", supportWords(c.support)],
    ["Strikes combined", `${c.strikes} (median of the strikes)`],
    ["Place of measurement", c.location ?? "at the issuing workshop"],
  ];
  sectionHeading(doc, "Particulars", 150);
  const colW = (CONTENT_WIDTH - 24) / 2;
  const top = doc.y;
  const leftEnd = labelledColumn(doc, left, MARGIN.left, top, colW);
  const rightEnd = labelledColumn(doc, right, MARGIN.left + colW + 24, top, colW);
  doc.x = MARGIN.left;
  doc.y = Math.max(leftEnd, rightEnd);

  sectionHeading(doc, "Method", 40);
  doc.font("medium").fontSize(9).fillColor(COLOUR.ink).text(`${data.method.name}, analyser version ${data.method.analyserVersion}`, MARGIN.left, doc.y, { width: CONTENT_WIDTH });
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.ink).text(data.method.summary, { width: CONTENT_WIDTH, lineGap: 1 });
}

function labelledColumn(doc: Doc, rows: [string, string][], x: number, y: number, width: number): number {
  const labelW = 92;
  for (const [label, value] of rows) {
    doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text(label, x, y + 1, { width: labelW });
    doc.font("regular").fontSize(9).fillColor(COLOUR.ink).text(value, x + labelW, y, { width: width - labelW, lineGap: 0.5 });
    y = doc.y + 3;
  }
  return y;
}

function drawTableHeader(doc: Doc): void {
  const y = doc.y;
  doc.font("medium").fontSize(7.5);
  const h = Math.max(...COLUMNS.map((c) => doc.heightOfString(c.title, { width: c.width - 6 }))) + 8;
  doc.rect(MARGIN.left, y, CONTENT_WIDTH, h).fillColor(COLOUR.accentSoft).fill();
  let x = MARGIN.left;
  doc.fillColor(COLOUR.ink);
  for (const col of COLUMNS) {
    doc.text(col.title, x + 3, y + 4, { width: col.width - 6, align: col.align });
    x += col.width;
  }
  doc.y = y + h;
}

function drawResults(doc: Doc, data: CertificateData): void {
  sectionHeading(doc, "Results", 70);
  drawTableHeader(doc);
  data.results.forEach((r, i) => {
    const cells = cellsFor(r);
    doc.font("regular").fontSize(8);
    const h = Math.max(...COLUMNS.map((c) => doc.heightOfString(cells[c.key], { width: c.width - 6 }))) + 8;
    if (doc.y + h > BOTTOM) {
      doc.addPage();
      doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text("Results, continued", MARGIN.left, doc.y);
      doc.moveDown(0.3);
      drawTableHeader(doc);
    }
    const y = doc.y;
    if (i % 2 === 1) doc.rect(MARGIN.left, y, CONTENT_WIDTH, h).fillColor(COLOUR.zebra).fill();
    let x = MARGIN.left;
    for (const col of COLUMNS) {
      const isResult = col.key === "result";
      doc.font(isResult ? "semibold" : col.key === "label" ? "medium" : "regular").fontSize(8).fillColor(isResult ? RESULT_COLOUR[r.result] : COLOUR.ink);
      // Tabular figures keep the digits of a column aligned.
      doc.text(cells[col.key], x + 3, y + 4, { width: col.width - 6, align: col.align, features: col.align === "right" ? ["tnum"] : [] });
      x += col.width;
    }
    doc.moveTo(MARGIN.left, y + h).lineTo(PAGE.width - MARGIN.right, y + h).lineWidth(0.4).strokeColor(COLOUR.rule).stroke();
    doc.y = y + h;
  });
  doc.x = MARGIN.left;
  doc.moveDown(0.4);
  doc
    .font("regular")
    .fontSize(7.5)
    .fillColor(COLOUR.muted)
    .text(
      "Deviation = 1200 \u00B7 log\u2082(measured / target). T60: time for the partial to decay by 60 dB; min T60: the least the specification accepts (\u2014: none set). Q = \u03C0 \u00B7 f \u00B7 \u03C4 (dimensionless).",
      MARGIN.left,
      doc.y,
      { width: CONTENT_WIDTH },
    );
}

function drawConformity(doc: Doc, data: CertificateData): void {
  sectionHeading(doc, "Decision rule", 30);
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.ink).text(decisionRuleWords[data.decisionRule], MARGIN.left, doc.y, { width: CONTENT_WIDTH, lineGap: 1 });

  sectionHeading(doc, "Statement of conformity", 50);
  const colour = VERDICT_COLOUR[data.verdict];
  doc.font("semibold").fontSize(10);
  const head = verdictWords[data.verdict];
  doc.font("regular").fontSize(9);
  const bodyH = doc.heightOfString(data.statementOfConformity, { width: CONTENT_WIDTH - 24, lineGap: 1 });
  const h = bodyH + 34;
  ensureSpace(doc, h);
  const y = doc.y;
  doc.rect(MARGIN.left, y, 3, h).fillColor(colour).fill();
  doc.rect(MARGIN.left + 3, y, CONTENT_WIDTH - 3, h).fillColor(COLOUR.zebra).fill();
  doc.font("semibold").fontSize(10).fillColor(colour).text(head, MARGIN.left + 14, y + 8, { width: CONTENT_WIDTH - 24 });
  doc.font("regular").fontSize(9).fillColor(COLOUR.ink).text(data.statementOfConformity, MARGIN.left + 14, doc.y + 2, { width: CONTENT_WIDTH - 24, lineGap: 1 });
  doc.x = MARGIN.left;
  doc.y = y + h;
}

function drawAuthorisation(doc: Doc, data: CertificateData): void {
  sectionHeading(doc, "Authorisation", 40);
  const y = doc.y;
  doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text("Authorised by", MARGIN.left, y + 1, { width: 92 });
  doc.font("medium").fontSize(9.5).fillColor(COLOUR.ink).text(`${data.authorisedBy.name}, ${data.authorisedBy.role}`, MARGIN.left + 92, y, { width: CONTENT_WIDTH - 92 });
  const y2 = doc.y + 3;
  doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text("Date and time", MARGIN.left, y2 + 1, { width: 92 });
  doc.font("regular").fontSize(9).fillColor(COLOUR.ink).text(formatDateTimeUtc(data.authorisedAt), MARGIN.left + 92, y2, { width: CONTENT_WIDTH - 92 });
  doc.x = MARGIN.left;
}

function drawFinePrint(doc: Doc, data: CertificateData): void {
  const notes = [FINE_PRINT.itemOnly, FINE_PRINT.fullOnly, FINE_PRINT.uncertainty];
  if (data.flags.measurementOnlyCaution) notes.push(FINE_PRINT.measurementOnly);
  notes.push(FINE_PRINT.signature);
  sectionHeading(doc, "Notes", 40);
  doc.font("regular").fontSize(7.5);
  notes.forEach((note, i) => {
    const strong = note === FINE_PRINT.measurementOnly;
    doc.font(strong ? "medium" : "regular");
    const h = doc.heightOfString(note, { width: CONTENT_WIDTH - 14, lineGap: 0.5 });
    ensureSpace(doc, h + 3);
    const y = doc.y;
    doc.fillColor(COLOUR.muted).text(`${i + 1}.`, MARGIN.left, y, { width: 12 });
    doc.fillColor(strong ? COLOUR.ink : COLOUR.muted).text(note, MARGIN.left + 14, y, { width: CONTENT_WIDTH - 14, lineGap: 0.5 });
    doc.y += 2.5;
  });
  doc.x = MARGIN.left;
}

function drawEndMark(doc: Doc): void {
  ensureSpace(doc, 30);
  doc.moveDown(1);
  const y = doc.y + 5;
  const label = FINE_PRINT.endMark;
  doc.font("medium").fontSize(8.5).fillColor(COLOUR.accent);
  const w = doc.widthOfString(label) + 24;
  const cx = PAGE.width / 2;
  doc.moveTo(MARGIN.left + 60, y).lineTo(cx - w / 2, y).lineWidth(0.6).strokeColor(COLOUR.accent).stroke();
  doc.moveTo(cx + w / 2, y).lineTo(PAGE.width - MARGIN.right - 60, y).stroke();
  doc.text(label, cx - w / 2, y - 5, { width: w, align: "center", lineBreak: false });
}
