/**
 * Renders a batch certificate (one document for a consignment) as PDF: the same look, fine print
 * and signature note as the unit certificate (pdf.ts), with one block of result lines per unit,
 * the concessions with what each departs from, and the units the certificate does not cover.
 * Deterministic like the unit certificate: the same data give the same bytes.
 */
import { t60ExtrapolatedFrom } from "../../shared/physics.ts";
import { verdictWords } from "../../shared/schemas/certificate.ts";
import { batchCertificateDataSchema, type BatchCertificateData, type BatchCertificateUnit } from "../../shared/schemas/batch-certificate.ts";
import {
  BOTTOM,
  COLOUR,
  CONTENT_WIDTH,
  CertificateRenderError,
  MARGIN,
  PAGE,
  RESULT_COLOUR,
  RESULT_WORDS,
  VERDICT_COLOUR,
  drawAuthorisation,
  drawColumnHeader,
  drawDecisionAndStatement,
  drawEndMark,
  drawFinePrint,
  drawMethod,
  drawPageFooters,
  drawParticularColumns,
  drawRunningHeader,
  drawTitleHead,
  drawVerifyLine,
  drawWithdrawnNotice,
  ensureSpace,
  familyWords,
  formatDateTimeUtc,
  formatDateUtc,
  formatWithUncertainty,
  openCertificateDocument,
  qrPng,
  sectionHeading,
  signed,
  supportWords,
  trimNumber,
  type Column,
  type Doc,
} from "./pdf.ts";

/** 499 pt of content width: serial, partial and the measured columns of the unit certificate. */
const COLUMNS: Column[] = [
  { key: "serial", title: "Serial", width: 62, align: "left" },
  { key: "label", title: "Partial", width: 66, align: "left" },
  { key: "measured", title: "Measured\n(Hz)", width: 56, align: "right" },
  { key: "u", title: "U, k = 2\n(Hz)", width: 42, align: "right" },
  { key: "target", title: "Target\n(Hz)", width: 52, align: "right" },
  { key: "tol", title: "Tol.\n(cents)", width: 40, align: "right" },
  { key: "dev", title: "Dev.\n(cents)", width: 44, align: "right" },
  { key: "t60", title: "T60\n(s)", width: 38, align: "right" },
  { key: "q", title: "Q", width: 39, align: "right" },
  { key: "result", title: "Result", width: 60, align: "center" },
];

function cells(u: BatchCertificateUnit, i: number): Record<string, string> {
  const r = u.results[i];
  const m = formatWithUncertainty(r.measuredHz, r.expandedUncertaintyHz);
  return {
    serial: i === 0 ? u.serial : "",
    label: r.label,
    measured: m.value,
    u: m.u,
    target: trimNumber(r.targetHz, 3),
    tol: `\u00B1${trimNumber(r.toleranceCents, 2)}`,
    dev: signed(r.deviationCents, 1),
    // One line per result here: an extrapolated T60 is marked with a dagger, explained in the notes.
    t60: t60ExtrapolatedFrom(r.t60ObservedDecayDb) ? `${r.t60S.toFixed(2)}\u2020` : r.t60S.toFixed(2),
    q: Math.round(r.q).toString(),
    result: RESULT_WORDS[r.result],
  };
}

/**
 * Renders the batch certificate as a PDF (A4). Validates `data` first.
 * @throws CertificateRenderError listing every field that is missing or invalid.
 */
export async function renderBatchCertificatePdf(input: BatchCertificateData): Promise<Buffer> {
  const parsed = batchCertificateDataSchema.safeParse(input);
  if (!parsed.success) {
    const list = parsed.error.issues.map((i) => `${i.path.join(".") || "(root)"}: ${i.message}`).join("; ");
    throw new CertificateRenderError(`Cannot render the batch certificate: ${list}`);
  }
  const data = parsed.data;
  const qr = await qrPng(data.verifyUrl);
  const { doc, finished } = openCertificateDocument({
    title: `Batch test certificate ${data.number}`,
    author: data.workshop.name,
    subject: `Batch test certificate for batch ${data.batch.code}, ${data.product.specName} v${data.product.specVersion}`,
    issuedAt: data.issuedAt,
  });
  doc.on("pageAdded", () => drawRunningHeader(doc, data.workshop.name, `Batch test certificate No. ${data.number}`));
  doc.addPage();

  drawBatchTitle(doc, data, qr);
  drawBatchParticulars(doc, data);
  drawUnitResults(doc, data);
  drawConcessions(doc, data);
  drawNotCovered(doc, data);
  drawBatchConformity(doc, data);
  drawAuthorisation(doc, data);
  drawFinePrint(doc, { flags: data.flags, results: data.units.flatMap((u) => u.results) });
  drawEndMark(doc);

  drawPageFooters(doc, `Certificate No. ${data.number}`, data.withdrawn ? "WITHDRAWN" : null);
  doc.end();
  return finished;
}

function drawBatchTitle(doc: Doc, data: BatchCertificateData, qr: Buffer): void {
  const conceded = data.units.filter((u) => u.concession).length;
  const subtitle = `Measured partial frequencies and decay of ${data.units.length} unit${data.units.length === 1 ? "" : "s"} of batch ${data.batch.code}${conceded ? `, ${conceded} of them released under a concession` : ""}.`;
  const { top, qrSize } = drawTitleHead(doc, qr, "Batch test certificate", data.number, subtitle);
  doc.y = Math.max(doc.y + 8, top + qrSize + 10);
  doc.x = MARGIN.left;
  drawVerifyLine(doc, data);
  if (data.withdrawn) drawWithdrawnNotice(doc, data.withdrawn);
}

function drawBatchParticulars(doc: Doc, data: BatchCertificateData): void {
  const c = data.conditions;
  const temperature =
    c.temperatureMinC === null || c.temperatureMaxC === null
      ? "not recorded"
      : c.temperatureMinC === c.temperatureMaxC
        ? `${trimNumber(c.temperatureMinC, 1)} \u00B0C`
        : `${trimNumber(c.temperatureMinC, 1)} to ${trimNumber(c.temperatureMaxC, 1)} \u00B0C`;
  const measured =
    formatDateUtc(data.measuredFrom) === formatDateUtc(data.measuredTo) ? formatDateUtc(data.measuredFrom) : `${formatDateUtc(data.measuredFrom)} to ${formatDateUtc(data.measuredTo)}`;
  const left: [string, string][] = [
    ["Issued by", `${data.workshop.name}\n${data.workshop.address}`],
    ["Quality contact", data.workshop.qualityEmail],
    ["Customer", data.customer.name],
    ["Batch", `${data.batch.code} (${data.batch.unitCount} unit${data.batch.unitCount === 1 ? "" : "s"} made, ${data.units.length} covered here)`],
    ["Product", `${data.product.specName}, version ${data.product.specVersion}`],
    ["Product family", familyWords(data.product.family)],
  ];
  const right: [string, string][] = [
    ["Dates of measurement", measured],
    ["Date of issue", formatDateTimeUtc(data.issuedAt)],
    ["Ambient temperature", temperature],
    ["Temperature correction", c.referenceTemperatureC === null ? "none applied" : `frequencies corrected to ${trimNumber(c.referenceTemperatureC, 1)} \u00B0C`],
    ["Support while struck", c.support.split(", ").map(supportWords).join(", ")],
    ["Place of measurement", "at the issuing workshop"],
  ];
  drawParticularColumns(doc, left, right);
  drawMethod(doc, data.method);
}

const drawUnitTableHeader = (doc: Doc) => drawColumnHeader(doc, COLUMNS);

function drawUnitResults(doc: Doc, data: BatchCertificateData): void {
  sectionHeading(doc, "Results per unit", 70);
  drawUnitTableHeader(doc);
  const lineH = 15;
  data.units.forEach((u, k) => {
    const blockH = u.results.length * lineH;
    // A unit's lines stay together on one page.
    if (doc.y + blockH > BOTTOM) {
      doc.addPage();
      doc.font("regular").fontSize(7.5).fillColor(COLOUR.muted).text("Results per unit, continued", MARGIN.left, doc.y);
      doc.moveDown(0.3);
      drawUnitTableHeader(doc);
    }
    const y0 = doc.y;
    if (k % 2 === 1) doc.rect(MARGIN.left, y0, CONTENT_WIDTH, blockH).fillColor(COLOUR.zebra).fill();
    u.results.forEach((r, i) => {
      const row = cells(u, i);
      const y = y0 + i * lineH;
      let x = MARGIN.left;
      for (const col of COLUMNS) {
        const isResult = col.key === "result";
        doc
          .font(isResult ? "semibold" : col.key === "serial" ? "medium" : "regular")
          .fontSize(8)
          .fillColor(isResult ? RESULT_COLOUR[r.result] : COLOUR.ink)
          .text(col.key === "serial" && i === 0 && u.concession ? `${row.serial} *` : row[col.key], x + 3, y + 4, { width: col.width - 6, align: col.align, lineBreak: false, features: col.align === "right" ? ["tnum"] : [] });
        x += col.width;
      }
    });
    doc.moveTo(MARGIN.left, y0 + blockH).lineTo(PAGE.width - MARGIN.right, y0 + blockH).lineWidth(0.4).strokeColor(COLOUR.rule).stroke();
    doc.x = MARGIN.left;
    doc.y = y0 + blockH;
  });
  doc.moveDown(0.4);
  doc
    .font("regular")
    .fontSize(7.5)
    .fillColor(COLOUR.muted)
    .text(
      "Deviation = 1200 \u00B7 log\u2082(measured / target). T60: time for the partial to decay by 60 dB. Q = \u03C0 \u00B7 f \u00B7 \u03C4 (dimensionless). Each unit's values are the median of its strikes. * released under a concession (see below).",
      MARGIN.left,
      doc.y,
      { width: CONTENT_WIDTH },
    );
}

function drawConcessions(doc: Doc, data: BatchCertificateData): void {
  const conceded = data.units.filter((u) => u.concession);
  if (!conceded.length) return;
  sectionHeading(doc, "Concessions", 40);
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.ink).text("These units do not conform in the requirements named and were released as they are by a recorded decision of the workshop (use as is).", MARGIN.left, doc.y, { width: CONTENT_WIDTH, lineGap: 1 });
  doc.moveDown(0.3);
  for (const u of conceded) {
    const c = u.concession!;
    const body = `Departs in: ${c.departures.join("; ")}. Reason recorded (${formatDateUtc(c.decidedAt)}): ${c.reason}`;
    doc.font("regular").fontSize(8.5);
    const h = doc.heightOfString(body, { width: CONTENT_WIDTH - 80, lineGap: 0.5 });
    ensureSpace(doc, h + 6);
    const y = doc.y;
    doc.font("semibold").fontSize(8.5).fillColor(COLOUR.fail).text(u.serial, MARGIN.left, y, { width: 74 });
    doc.font("regular").fontSize(8.5).fillColor(COLOUR.ink).text(body, MARGIN.left + 80, y, { width: CONTENT_WIDTH - 80, lineGap: 0.5 });
    doc.y = Math.max(doc.y, y + 11) + 3;
  }
  doc.x = MARGIN.left;
}

function drawNotCovered(doc: Doc, data: BatchCertificateData): void {
  if (!data.excluded.length) return;
  sectionHeading(doc, "Not covered", 30);
  const list = data.excluded.map((e) => `${e.serial} (${e.reason})`).join(", ");
  doc.font("regular").fontSize(8.5).fillColor(COLOUR.ink).text(`Units of batch ${data.batch.code} that this certificate does not cover: ${list}.`, MARGIN.left, doc.y, { width: CONTENT_WIDTH, lineGap: 1 });
}

function drawBatchConformity(doc: Doc, data: BatchCertificateData): void {
  const conceded = data.units.filter((u) => u.concession).length;
  const colour = conceded === 0 ? VERDICT_COLOUR.within_tolerance : VERDICT_COLOUR.inconclusive;
  const head = conceded === 0 ? `${verdictWords.within_tolerance}: every unit listed conforms` : `${data.units.length - conceded} conform, ${conceded} released under a concession`;
  drawDecisionAndStatement(doc, data.decisionRule, colour, head, data.statementOfConformity);
}
