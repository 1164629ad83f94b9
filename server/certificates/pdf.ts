/**
 * Renders a test certificate as PDF: every item a customer's report needs. Content follows ISO/IEC 17025:2017 §7.8 in our
 * own wording; the look is Tinelog's own (calm slate and teal, Inter embedded from
 * @expo-google-fonts/inter as TTF, which pdfkit can subset; pdfkit cannot subset the WOFF2 files most font packages ship).
 *
 * Deterministic: the same CertificateData gives the same bytes (CreationDate/ModDate come from
 * issuedAt, pdfkit derives the file ID from the info dictionary, fonts and QR are generated without
 * randomness), so the stored SHA-256 can be recomputed.
 *
 * Layout: each section is measured first on a scratch page. A certificate whose content fits one
 * page is set on one page (with its spacing tightened a little if that is what it takes); a
 * longer one breaks between sections, never inside one — except a table longer than a page,
 * which continues on the next page with its header repeated.
 */
import { createRequire } from "node:module";
import PDFDocument from "pdfkit";
import QRCode from "qrcode";
import { t60ExtrapolatedFrom } from "../../shared/physics.ts";
import {
  certificateDataSchema,
  decisionRuleWords,
  verdictWords,
  type CertificateData,
  type CertificateResult,
  type CertificateTraceability,
  type LineResult,
} from "../../shared/schemas/certificate.ts";
import { twoSignificant } from "../../shared/traceability.ts";
import { useFallbackText } from "./fallback-text.ts";

const require = createRequire(import.meta.url);
const FONTS = {
  regular: require.resolve("@expo-google-fonts/inter/400Regular/Inter_400Regular.ttf"),
  medium: require.resolve("@expo-google-fonts/inter/500Medium/Inter_500Medium.ttf"),
  semibold: require.resolve("@expo-google-fonts/inter/600SemiBold/Inter_600SemiBold.ttf"),
};

/** Tinelog's certificate palette: slate ink, a deep teal accent, and muted signal colours. */
export const COLOUR = {
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

export const PAGE = { width: 595.28, height: 841.89 }; // A4 in points
export const MARGIN = { left: 48, right: 48, top: 70, bottom: 62 };
export const CONTENT_WIDTH = PAGE.width - MARGIN.left - MARGIN.right;
export const BOTTOM = PAGE.height - MARGIN.bottom;

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
export function signed(value: number, decimals: number): string {
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

export function trimNumber(value: number, maxDecimals: number): string {
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
export function supportWords(support: string): string {
  return SUPPORT_WORDS[support] ?? support.replace(/_/g, " ");
}

export function familyWords(family: string): string {
  return family.replace(/_/g, " ");
}

export const RESULT_WORDS: Record<LineResult, string> = { pass: "Pass", fail: "Fail", inconclusive: "Inconclusive" };
export const RESULT_COLOUR: Record<LineResult, string> = { pass: COLOUR.pass, fail: COLOUR.fail, inconclusive: COLOUR.inconclusive };
export const VERDICT_COLOUR = { within_tolerance: COLOUR.pass, out_of_tolerance: COLOUR.fail, inconclusive: COLOUR.inconclusive } as const;

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

export type Doc = PDFKit.PDFDocument;

export interface Column {
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
    // T60 is 60 dB of decay; where the recordings saw less, the figure is an extrapolation and says so.
    t60: [r.t60S.toFixed(2), t60ExtrapolatedFrom(r.t60ObservedDecayDb)].filter(Boolean).join("\n"),
    t60min: r.minT60S ? trimNumber(r.minT60S, 2) : "\u2014",
    q: Math.round(r.q).toString(),
    result: RESULT_WORDS[r.result],
  };
}

export async function qrPng(url: string): Promise<Buffer> {
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
  const { doc, finished } = openCertificateDocument({
    title: `Test certificate ${data.number}`,
    author: data.workshop.name,
    subject: `Test certificate for unit ${data.unit.serial}, ${data.product.specName} v${data.product.specVersion}`,
    issuedAt: data.issuedAt,
  });

  // The sections in order; the notes keep the end mark with them, so it never stands alone.
  const traceability = data.traceability;
  const sections: ((d: Doc) => void)[] = [
    (d) => drawTitleBlock(d, data, qr),
    (d) => drawParticulars(d, data),
    (d) => drawMethod(d, data.method),
    (d) => drawResults(d, data),
    ...(traceability ? [(d: Doc) => drawTraceability(d, traceability)] : []),
    (d) => drawConformity(d, data),
    (d) => drawAuthorisation(d, data),
    (d) => {
      drawFinePrint(d, data);
      drawEndMark(d);
    },
  ];
  const pageRoom = BOTTOM - MARGIN.top;
  // One page if the content fits at the designed spacing or somewhat tighter; else the designed spacing over pages.
  let heights: number[] = [];
  for (const k of [1, 0.75, 0.5]) {
    spacing = k;
    heights = measureSections(sections);
    if (heights.reduce((a, b) => a + b, 0) <= pageRoom) break;
    spacing = 1;
  }
  if (spacing === 1) heights = measureSections(sections);

  doc.on("pageAdded", () => drawHeader(doc, data));
  doc.addPage();
  sections.forEach((draw, i) => {
    // A section that fits a page starts on a fresh one rather than breaking; a longer one breaks inside.
    if (i > 0 && doc.y + heights[i] > BOTTOM && heights[i] <= pageRoom) doc.addPage();
    sectionFits = doc.y + heights[i] <= BOTTOM;
    draw(doc);
    sectionFits = false;
  });
  spacing = 1;

  drawFooters(doc, data);
  doc.end();
  return finished;
}

/**
 * A new A4 certificate document with Inter registered ("regular", "medium", "semibold") and its
 * bytes collected. The dates come from the issue time, so the same data give the same bytes.
 */
export function openCertificateDocument(info: { title: string; author: string; subject: string; issuedAt: string }): { doc: Doc; finished: Promise<Buffer> } {
  const issued = new Date(info.issuedAt);
  const doc = new PDFDocument({
    size: "A4",
    margins: MARGIN,
    bufferPages: true,
    autoFirstPage: false,
    pdfVersion: "1.7",
    subset: "PDF/A-2b",
    lang: "en-GB",
    displayTitle: true,
    info: { Title: info.title, Author: info.author, Subject: info.subject, Creator: "Tinelog", Producer: "Tinelog (pdfkit)", CreationDate: issued, ModDate: issued },
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
  return { doc, finished };
}

/** Height of each section (pt) drawn one after another on a scratch page too tall to break. */
function measureSections(sections: ((d: Doc) => void)[]): number[] {
  const scratch = new PDFDocument({ size: [PAGE.width, 40_000], margins: MARGIN, autoFirstPage: false });
  scratch.registerFont("regular", FONTS.regular);
  scratch.registerFont("medium", FONTS.medium);
  scratch.registerFont("semibold", FONTS.semibold);
  useFallbackText(scratch);
  scratch.addPage();
  scratch.y = MARGIN.top;
  const heights = sections.map((draw) => {
    const y0 = scratch.y;
    draw(scratch);
    return scratch.y - y0;
  });
  scratch.end();
  return heights;
}

/** The running header of every page: the workshop on the left, the document and its number on the right. */
export function drawRunningHeader(doc: Doc, workshopName: string, title: string): void {
  const y = 30;
  doc.save();
  doc.font("semibold").fontSize(9).fillColor(COLOUR.ink).text(workshopName, MARGIN.left, y, { width: CONTENT_WIDTH / 2 - 8, height: 11, ellipsis: true });
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.muted).text(title, MARGIN.left + CONTENT_WIDTH / 2, y, { width: CONTENT_WIDTH / 2, align: "right", lineBreak: false });
  doc.moveTo(MARGIN.left, 50).lineTo(PAGE.width - MARGIN.right, 50).lineWidth(1.2).strokeColor(COLOUR.accent).stroke();
  doc.restore();
  doc.x = MARGIN.left;
  doc.y = MARGIN.top;
}

function drawHeader(doc: Doc, data: CertificateData): void {
  drawRunningHeader(doc, data.workshop.name, `Test certificate No. ${data.number}`);
}

function drawFooters(doc: Doc, data: CertificateData): void {
  drawPageFooters(doc, `Certificate No. ${data.number}`, data.withdrawn ? "WITHDRAWN" : data.superseded ? "SUPERSEDED" : null);
}

/** Number, "reproduce only in full" and "Page i of n" on every page, and the watermark when there is one. */
export function drawPageFooters(doc: Doc, label: string, watermark: "WITHDRAWN" | "SUPERSEDED" | null): void {
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
    doc.text(label, MARGIN.left, y, { width: CONTENT_WIDTH / 3, lineBreak: false });
    doc.text("Reproduce only in full", MARGIN.left + CONTENT_WIDTH / 3, y, { width: CONTENT_WIDTH / 3, align: "center", lineBreak: false });
    doc.font("medium").fillColor(COLOUR.ink);
    doc.text(`Page ${i - range.start + 1} of ${total}`, MARGIN.left + (2 * CONTENT_WIDTH) / 3, y, { width: CONTENT_WIDTH / 3, align: "right", lineBreak: false });
    if (watermark) drawWatermark(doc, watermark);
    doc.page.margins.bottom = bottom;
  }
}

/** A large, faint diagonal word across the page (a superseded or withdrawn certificate). */
function drawWatermark(doc: Doc, word: string): void {
  doc.save();
  const cx = PAGE.width / 2;
  const cy = PAGE.height / 2;
  doc.rotate(-35, { origin: [cx, cy] });
  doc.font("semibold").fontSize(84).fillColor(COLOUR.fail).fillOpacity(0.1);
  doc.text(word, cx - 330, cy - 50, { width: 660, align: "center", lineBreak: false });
  doc.restore();
}

/** The notice at the top of a withdrawn certificate: when, why, and that it is no longer valid. */
export function drawWithdrawnNotice(doc: Doc, withdrawn: { at: string; reason: string }): void {
  noticeBox(doc, `WITHDRAWN on ${formatDateUtc(withdrawn.at)}. This certificate was withdrawn by the issuing workshop and is no longer valid; it stays on record as issued. Reason: ${withdrawn.reason}`, COLOUR.fail, "#FFFFFF", true);
}

/**
 * Vertical spacing of the sections, 1 = as designed. Set for one render at a time (drawing is
 * synchronous); a certificate that just misses one page is tightened to fit.
 */
let spacing = 1;
/** True while drawing a section already known to fit where it starts: no break inside it then. */
let sectionFits = false;

/** Whether `height` more points would run past the page's bottom margin (never inside a section known to fit). */
export function wouldOverflow(doc: Doc, height: number): boolean {
  return !sectionFits && doc.y + height > doc.page.height - MARGIN.bottom;
}

export function ensureSpace(doc: Doc, height: number): void {
  if (wouldOverflow(doc, height)) doc.addPage();
}

export function sectionHeading(doc: Doc, title: string, spaceAfterHeading = 40): void {
  ensureSpace(doc, 18 + spaceAfterHeading);
  doc.moveDown(0.5 * spacing);
  doc.font("semibold").fontSize(10).fillColor(COLOUR.accent).text(title, MARGIN.left, doc.y, { width: CONTENT_WIDTH });
  doc.moveDown(0.25);
}

/** The QR code (top right), the document's title, its number and a one-line subtitle; returns where the text column is. */
export function drawTitleHead(doc: Doc, qr: Buffer, title: string, number: string, subtitle: string): { top: number; qrSize: number; textWidth: number } {
  const top = doc.y;
  const qrSize = 84;
  const qrX = PAGE.width - MARGIN.right - qrSize;
  doc.image(qr, qrX, top - 4, { width: qrSize, height: qrSize });
  doc.font("regular").fontSize(6.5).fillColor(COLOUR.muted).text("Scan to verify", qrX, top + qrSize - 2, { width: qrSize, align: "center" });

  const textWidth = CONTENT_WIDTH - qrSize - 16;
  doc.font("semibold").fontSize(22).fillColor(COLOUR.ink).text(title, MARGIN.left, top, { width: textWidth });
  doc.font("medium").fontSize(11).fillColor(COLOUR.accent).text(`No. ${number}`, { width: textWidth });
  doc.moveDown(0.3);
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.muted).text(subtitle, { width: textWidth });
  return { top, qrSize, textWidth };
}

/** The verification address and code, right-aligned under the title. */
export function drawVerifyLine(doc: Doc, data: Pick<CertificateData, "verifyUrl" | "verificationCode">): void {
  doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text(`Verify at ${data.verifyUrl} \u00B7 code ${data.verificationCode}`, MARGIN.left, doc.y, { width: CONTENT_WIDTH, align: "right", link: data.verifyUrl });
  doc.moveDown(0.4 * spacing);
}

function drawTitleBlock(doc: Doc, data: CertificateData, qr: Buffer): void {
  const { top, qrSize, textWidth } = drawTitleHead(doc, qr, "Test certificate", data.number, "Measured partial frequencies and decay of a tuned metal item");
  doc.moveDown(0.5);

  // Verdict badge.
  const verdict = verdictWords[data.verdict];
  doc.font("semibold").fontSize(10);
  const badgeW = doc.widthOfString(verdict) + 20;
  const badgeY = doc.y;
  doc.roundedRect(MARGIN.left, badgeY, badgeW, 20, 4).fillColor(VERDICT_COLOUR[data.verdict]).fill();
  doc.fillColor("#FFFFFF").text(verdict, MARGIN.left, badgeY + 5, { width: badgeW, align: "center", lineBreak: false });
  const against = data.concession ? "Released under a concession: see the statement of conformity" : `Verdict against ${data.product.specName}, version ${data.product.specVersion}`;
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.muted).text(against, MARGIN.left + badgeW + 10, badgeY + 5.5, {
    width: textWidth - badgeW - 10,
    lineBreak: false,
  });
  doc.y = Math.max(badgeY + 28, top + qrSize + 10);
  doc.x = MARGIN.left;
  drawVerifyLine(doc, data);

  if (data.withdrawn) drawWithdrawnNotice(doc, data.withdrawn);
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

export function noticeBox(doc: Doc, message: string, fill: string, ink: string, strong: boolean): void {
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
  drawParticularColumns(doc, left, right);
}

/** The "Particulars" section: label/value pairs in two columns. */
export function drawParticularColumns(doc: Doc, left: [string, string][], right: [string, string][]): void {
  sectionHeading(doc, "Particulars", 150);
  const colW = (CONTENT_WIDTH - 24) / 2;
  const top = doc.y;
  const leftEnd = labelledColumn(doc, left, MARGIN.left, top, colW);
  const rightEnd = labelledColumn(doc, right, MARGIN.left + colW + 24, top, colW);
  doc.x = MARGIN.left;
  doc.y = Math.max(leftEnd, rightEnd);
}

export function drawMethod(doc: Doc, method: CertificateData["method"]): void {
  sectionHeading(doc, "Method", 40);
  doc.font("medium").fontSize(9).fillColor(COLOUR.ink).text(`${method.name}, analyser version ${method.analyserVersion}`, MARGIN.left, doc.y, { width: CONTENT_WIDTH });
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.ink).text(method.summary, { width: CONTENT_WIDTH, lineGap: 1 });
}

function labelledColumn(doc: Doc, rows: [string, string][], x: number, y: number, width: number): number {
  const labelW = 92;
  for (const [label, value] of rows) {
    doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text(label, x, y + 1, { width: labelW });
    doc.font("regular").fontSize(9).fillColor(COLOUR.ink).text(value, x + labelW, y, { width: width - labelW, lineGap: 0.5 });
    y = doc.y + 3 * spacing;
  }
  return y;
}

/** The results header; a frequency corrected to the reference temperature says so in its column title. */
function drawTableHeader(doc: Doc, data: CertificateData): void {
  const t = data.conditions.referenceTemperatureC;
  drawColumnHeader(doc, t === null || t === undefined ? COLUMNS : COLUMNS.map((c) => (c.key === "measured" ? { ...c, title: `Measured at ${trimNumber(t, 1)} \u00B0C (Hz)` } : c)));
}

/** A results table's header row, the column titles on the soft accent. */
export function drawColumnHeader(doc: Doc, columns: Column[]): void {
  const y = doc.y;
  doc.font("medium").fontSize(7.5);
  const h = Math.max(...columns.map((c) => doc.heightOfString(c.title, { width: c.width - 6 }))) + 8;
  doc.rect(MARGIN.left, y, CONTENT_WIDTH, h).fillColor(COLOUR.accentSoft).fill();
  let x = MARGIN.left;
  doc.fillColor(COLOUR.ink);
  for (const col of columns) {
    doc.text(col.title, x + 3, y + 4, { width: col.width - 6, align: col.align });
    x += col.width;
  }
  doc.y = y + h;
}

function drawResults(doc: Doc, data: CertificateData): void {
  sectionHeading(doc, "Results", 70);
  drawTableHeader(doc, data);
  data.results.forEach((r, i) => {
    const cells = cellsFor(r);
    doc.font("regular").fontSize(8);
    const h = Math.max(...COLUMNS.map((c) => doc.heightOfString(cells[c.key], { width: c.width - 6 }))) + 8;
    if (wouldOverflow(doc, h)) {
      doc.addPage();
      doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text("Results, continued", MARGIN.left, doc.y);
      doc.moveDown(0.3);
      drawTableHeader(doc, data);
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
  // A concession's departures and reason are part of the signed statement itself.
  const head = data.concession ? `${verdictWords[data.verdict]} \u2014 released as it is under a concession` : verdictWords[data.verdict];
  drawDecisionAndStatement(doc, data.decisionRule, VERDICT_COLOUR[data.verdict], head, data.statementOfConformity);
}

/** The decision rule in words, then the statement of conformity in a box with a coloured edge. */
export function drawDecisionAndStatement(doc: Doc, rule: CertificateData["decisionRule"], colour: string, head: string, statement: string): void {
  sectionHeading(doc, "Decision rule", 30);
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.ink).text(decisionRuleWords[rule], MARGIN.left, doc.y, { width: CONTENT_WIDTH, lineGap: 1 });

  sectionHeading(doc, "Statement of conformity", 50);
  doc.font("semibold").fontSize(10);
  doc.font("regular").fontSize(9);
  const bodyH = doc.heightOfString(statement, { width: CONTENT_WIDTH - 24, lineGap: 1 });
  const h = bodyH + 34;
  ensureSpace(doc, h);
  const y = doc.y;
  doc.rect(MARGIN.left, y, 3, h).fillColor(colour).fill();
  doc.rect(MARGIN.left + 3, y, CONTENT_WIDTH - 3, h).fillColor(COLOUR.zebra).fill();
  doc.font("semibold").fontSize(10).fillColor(colour).text(head, MARGIN.left + 14, y + 8, { width: CONTENT_WIDTH - 24 });
  doc.font("regular").fontSize(9).fillColor(COLOUR.ink).text(statement, MARGIN.left + 14, doc.y + 2, { width: CONTENT_WIDTH - 24, lineGap: 1 });
  doc.x = MARGIN.left;
  doc.y = y + h;
}

export function drawAuthorisation(doc: Doc, data: Pick<CertificateData, "authorisedBy" | "authorisedAt">): void {
  sectionHeading(doc, "Authorisation", 40);
  const y = doc.y;
  doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text("Authorised by", MARGIN.left, y + 1, { width: 92 });
  doc.font("medium").fontSize(9.5).fillColor(COLOUR.ink).text(`${data.authorisedBy.name}, ${data.authorisedBy.role}`, MARGIN.left + 92, y, { width: CONTENT_WIDTH - 92 });
  const y2 = doc.y + 3;
  doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text("Date and time", MARGIN.left, y2 + 1, { width: 92 });
  doc.font("regular").fontSize(9).fillColor(COLOUR.ink).text(formatDateTimeUtc(data.authorisedAt), MARGIN.left + 92, y2, { width: CONTENT_WIDTH - 92 });
  doc.x = MARGIN.left;
}

const T60_EXTRAPOLATED =
  "T60 is the time for a partial to decay by 60 dB. Where a result reads \u201Cfrom N dB\u201D (marked \u2020 in a list of units), the recordings saw N dB of that decay and T60 is extrapolated from it along the fitted exponential decay.";

/** The closing notes; `results` decides whether the note on extrapolated T60 is needed. */
export function drawFinePrint(doc: Doc, data: Pick<CertificateData, "flags"> & { results: Pick<CertificateData["results"][number], "t60ObservedDecayDb">[] }): void {
  const notes = [FINE_PRINT.itemOnly, FINE_PRINT.fullOnly, FINE_PRINT.uncertainty];
  if (data.results.some((r) => t60ExtrapolatedFrom(r.t60ObservedDecayDb))) notes.push(T60_EXTRAPOLATED);
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
    doc.y += 2.5 * spacing;
  });
  doc.x = MARGIN.left;
}

export function drawEndMark(doc: Doc): void {
  ensureSpace(doc, 30);
  doc.moveDown(spacing);
  const y = doc.y + 5;
  const label = FINE_PRINT.endMark;
  doc.font("medium").fontSize(8.5).fillColor(COLOUR.accent);
  const w = doc.widthOfString(label) + 24;
  const cx = PAGE.width / 2;
  doc.moveTo(MARGIN.left + 60, y).lineTo(cx - w / 2, y).lineWidth(0.6).strokeColor(COLOUR.accent).stroke();
  doc.moveTo(cx + w / 2, y).lineTo(PAGE.width - MARGIN.right - 60, y).stroke();
  doc.text(label, cx - w / 2, y - 5, { width: w, align: "center", lineBreak: false });
}

// ---------------------------------------------------------------------------------------------
// Measurement traceability: the instruments behind the results and the fundamental's budget.

interface GridColumn {
  title: string;
  width: number;
  align: "left" | "right";
}

/** A plain table: a tinted header, zebra rows, thin rules; repeats its header on a new page. */
function drawGrid(doc: Doc, columns: GridColumn[], rows: { cells: string[]; strong?: boolean }[], fontSize = 7.5): void {
  const header = () => {
    doc.font("medium").fontSize(fontSize);
    const h = Math.max(...columns.map((c) => doc.heightOfString(c.title, { width: c.width - 6 }))) + 7;
    const y = doc.y;
    doc.rect(MARGIN.left, y, CONTENT_WIDTH, h).fillColor(COLOUR.accentSoft).fill();
    let x = MARGIN.left;
    doc.fillColor(COLOUR.ink);
    for (const c of columns) {
      doc.text(c.title, x + 3, y + 3.5, { width: c.width - 6, align: c.align });
      x += c.width;
    }
    doc.y = y + h;
  };
  ensureSpace(doc, 40);
  header();
  rows.forEach((row, i) => {
    doc.font(row.strong ? "semibold" : "regular").fontSize(fontSize);
    const h = Math.max(...columns.map((c, k) => doc.heightOfString(row.cells[k] ?? "", { width: c.width - 6, lineGap: 0.3 }))) + 7;
    if (wouldOverflow(doc, h)) {
      doc.addPage();
      header();
    }
    const y = doc.y;
    if (i % 2 === 1) doc.rect(MARGIN.left, y, CONTENT_WIDTH, h).fillColor(COLOUR.zebra).fill();
    let x = MARGIN.left;
    columns.forEach((c, k) => {
      doc.font(row.strong ? "semibold" : k === 0 ? "medium" : "regular").fontSize(fontSize).fillColor(COLOUR.ink);
      doc.text(row.cells[k] ?? "", x + 3, y + 3.5, { width: c.width - 6, align: c.align, lineGap: 0.3, features: c.align === "right" ? ["tnum"] : [] });
      x += c.width;
    });
    doc.moveTo(MARGIN.left, y + h).lineTo(PAGE.width - MARGIN.right, y + h).lineWidth(0.4).strokeColor(COLOUR.rule).stroke();
    doc.y = y + h;
  });
  doc.x = MARGIN.left;
}

const STATUS_WORDS: Record<CertificateTraceability["instruments"][number]["status"], string> = {
  calibrated: "in calibration",
  expired: "calibration expired",
  uncalibrated: "not calibrated",
  not_named: "not recorded",
};

/**
 * The "Measurement traceability" section: whether traceability can be stated (and why not), the
 * recorder and thermometer with their calibrations and references, and the fundamental's budget
 * laid out as the usual table of input quantities (component, basis, distribution, standard
 * uncertainty, sensitivity, contribution), then the combined and the expanded uncertainty (k = 2).
 */
function drawTraceability(doc: Doc, t: CertificateTraceability): void {
  sectionHeading(doc, "Measurement traceability", 60);
  noticeBox(doc, t.statement, t.traceable ? COLOUR.accentSoft : COLOUR.amendSoft, COLOUR.ink, !t.traceable);
  if (t.instruments.length > 0) {
    drawGrid(
      doc,
      [
        { title: "Instrument", width: 112, align: "left" },
        { title: "Calibration", width: 102, align: "left" },
        { title: "Result and use", width: 140, align: "left" },
        { title: "Calibrated against", width: CONTENT_WIDTH - 354, align: "left" },
      ],
      t.instruments.map((i) => ({
        cells: [
          `${i.role === "recorder" ? "Recorder" : "Thermometer"}: ${i.name}${i.model ? `\n${i.model}` : ""}${i.serial ? `\nserial ${i.serial}` : ""}`,
          i.calibration ? `${i.calibration.number}\n${i.calibration.calibratedOn}, valid to ${i.calibration.validUntil}\n(${STATUS_WORDS[i.status]})` : STATUS_WORDS[i.status],
          i.calibration ? i.calibration.result : "no calibration: the assumed tolerance was used",
          i.calibration ? i.calibration.reference : "\u2014",
        ],
      })),
    );
  }
  const b = t.budget;
  if (!b) return;
  doc.moveDown(0.6);
  ensureSpace(doc, 90);
  doc.font("medium").fontSize(8.5).fillColor(COLOUR.ink).text(`Uncertainty budget of the ${b.label.toLowerCase()} (${b.measuredHz.toFixed(4)} Hz)`, MARGIN.left, doc.y, { width: CONTENT_WIDTH });
  doc.moveDown(0.2);
  const rows = b.lines.map((l) => ({ cells: [l.component, l.basis, l.distribution, l.standardUncertainty, l.sensitivity, twoSignificant(l.contributionHz)] }));
  rows.push({ cells: ["Combined", "root sum of squares of the contributions (components taken as uncorrelated)", "", "", "", twoSignificant(b.combinedHz)] });
  rows.push({ cells: [`Expanded, k = ${b.coverageFactor}`, `U = ${b.coverageFactor} \u00D7 combined, about 95 % coverage`, "", "", "", twoSignificant(b.expandedHz)], strong: true } as { cells: string[]; strong?: boolean });
  drawGrid(doc, [
    { title: "Component", width: 78, align: "left" },
    { title: "Basis", width: 170, align: "left" },
    { title: "Distribution", width: 54, align: "left" },
    { title: "Standard uncertainty", width: 64, align: "right" },
    { title: "Sensitivity", width: 70, align: "right" },
    { title: "Contribution (Hz)", width: CONTENT_WIDTH - 436, align: "right" },
  ], rows);
  doc.moveDown(0.3);
  doc
    .font("regular")
    .fontSize(7.5)
    .fillColor(COLOUR.muted)
    .text("Contribution = |sensitivity| \u00D7 standard uncertainty. A rectangular distribution of half-width a has the standard uncertainty a/\u221A3.", MARGIN.left, doc.y, { width: CONTENT_WIDTH });
}
