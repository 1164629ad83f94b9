/**
 * Test certificates: built from a unit's latest evaluation, rendered to PDF, hashed, signed with the
 * workshop server's Ed25519 key over the canonical data, stored, and mailed to the customer.
 * An amendment gets a new number and marks the earlier certificate superseded; both stay retrievable.
 */
import { randomUUID } from "node:crypto";
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { and, asc, desc, eq, like, max } from "drizzle-orm";
import type { EvaluationView } from "../../shared/schemas/evaluation.ts";
import {
  certificateNumber,
  defaultStatementOfConformity,
  needsMeasurementOnlyCaution,
  type CertificateData,
  type IssueCertificateInput,
} from "../../shared/schemas/certificate.ts";
import { familyLabels, supportLabels, type Family, type Support } from "../../shared/schemas/spec.ts";
import { roleLabels, type RoleName } from "../../shared/permissions.ts";
import { renderCertificatePdf } from "../certificates/pdf.ts";
import { canonicalize, newVerificationCode, sha256Hex, signCertificate, verifyCertificate, type SigningKey } from "../certificates/signing.ts";
import type { Db } from "../db/client.ts";
import { batch, certificate, mailMessage, organization, strike, workshopProfile } from "../db/schema.ts";
import { conflict, HttpError, notFound } from "../http-error.ts";
import type { Mailer } from "../mail/mailer.ts";
import { audit, type Actor } from "./audit.ts";
import { latestEvaluations } from "./batches.ts";
import { getSpecVersion } from "./specs.ts";
import { findUnit } from "./strikes.ts";

export type CertificateDeps = { db: Db; mailer: Mailer; key: SigningKey; dataDir: string; baseUrl: string; analyserVersion: string };

const METHOD_SUMMARY =
  "Each strike was recorded as uncompressed audio and analysed by Tinelog: partials were located in a zero-padded, Hann-windowed spectrum and each was refined by fitting exponentially decaying sinusoids (matrix pencil start, least-squares finish), which gives its frequency, decay time constant τ, T60 = τ·ln 1000 and Q = π·f·τ with their uncertainties. Results of several strikes are combined by the median.";

export type CertificateSummary = {
  id: string;
  number: string;
  issuedAt: string;
  recipientEmail: string;
  recipientName: string | null;
  verdict: CertificateData["verdict"];
  verifyUrl: string;
  pdfSha256: string;
  amends: string | null;
  supersededBy: string | null;
  state: "current" | "superseded";
  mail: { id: string; state: "sending" | "sent" | "failed"; error: string | null; attempts: number } | null;
};

function pdfPath(dataDir: string, key: string) {
  return path.join(dataDir, "certificates", key);
}

function profileOf(db: Db, workshopId: string) {
  const w = db.select().from(organization).where(eq(organization.id, workshopId)).get()!;
  const p = db.select().from(workshopProfile).where(eq(workshopProfile.workshopId, workshopId)).get();
  const missing = [!p?.address && "address", !p?.sendingEmail && "sending e-mail address", !p?.qualityEmail && "quality contact e-mail"].filter(Boolean);
  if (!p || missing.length) throw conflict(`The workshop profile lacks its ${missing.join(", ")}; the owner completes it under Settings before certificates can be issued.`);
  return { name: w.name, address: p.address, sendingEmail: p.sendingEmail, qualityEmail: p.qualityEmail, prefix: p.certificatePrefix };
}

/** Everything the certificate states, from the unit's latest evaluation (also used for the preview). */
function buildData(deps: CertificateDeps, actor: Actor & { name: string; role: RoleName }, unitId: string, input: IssueCertificateInput, ident: { number: string; code: string; issuedAt: Date; amends: CertificateData["amends"] }): { data: CertificateData; evaluation: EvaluationView } {
  const { db } = deps;
  const u = findUnit(db, actor.workshopId, unitId);
  const b = db.select().from(batch).where(eq(batch.id, u.batchId)).get()!;
  if (b.state !== "released") throw conflict(`Batch ${b.code} is not released yet (it is ${b.state.replace("_", " ")}); QA releases the batch before certificates are issued.`);
  const ev = latestEvaluations(db, [unitId]).get(unitId);
  if (!ev) throw conflict(`Unit ${u.serial} has no evaluation; it must be measured before a certificate can be issued.`);
  const spec = getSpecVersion(db, actor.workshopId, ev.specVersionId)!;
  const strikes = db.select().from(strike).where(and(eq(strike.unitId, unitId), eq(strike.state, "done"))).orderBy(asc(strike.uploadedAt)).all();
  const temps = strikes.map((s) => s.temperatureC).filter((t): t is number => t !== null);
  const supports = [...new Set(strikes.map((s) => s.support).filter((s): s is string => !!s))];
  const results = ev.requirements
    .filter((r) => r.measuredHz !== null && r.targetHz !== null && r.deviationCents !== null && r.t60S !== null && r.q !== null)
    .map((r) => ({
      label: r.label,
      measuredHz: r.measuredHz!,
      expandedUncertaintyHz: r.expandedUncertaintyHz ?? 0,
      targetHz: r.targetHz!,
      toleranceCents: r.toleranceCents,
      deviationCents: r.deviationCents!,
      t60S: r.t60S!,
      minT60S: r.minT60S,
      q: r.q!,
      result: (r.result === "pass" || r.result === "fail" ? r.result : r.result === "not_found" ? "fail" : "inconclusive") as "pass" | "fail" | "inconclusive",
    }));
  if (!results.length) throw conflict(`Unit ${u.serial}'s evaluation has no measured partial to report.`);
  const w = profileOf(db, actor.workshopId);
  const day = (d: Date) => d.toISOString().slice(0, 10);
  const data: CertificateData = {
    number: ident.number,
    verificationCode: ident.code,
    verifyUrl: `${deps.baseUrl}/verify/${ident.code}`,
    issuedAt: ident.issuedAt.toISOString(),
    amends: ident.amends,
    superseded: false,
    supersededBy: null,
    workshop: { name: w.name, address: w.address, sendingEmail: w.sendingEmail, qualityEmail: w.qualityEmail },
    customer: { name: input.recipientName ?? u.customerName ?? input.recipientEmail },
    unit: { serial: u.serial },
    product: { specName: spec.name, specVersion: spec.version, family: familyLabels[spec.family as Family] ?? spec.family },
    method: { name: "Tinelog strike analysis", analyserVersion: deps.analyserVersion, summary: METHOD_SUMMARY },
    conditions: {
      temperatureC: temps.length ? Math.round((temps.reduce((a, t) => a + t, 0) / temps.length) * 10) / 10 : null,
      referenceTemperatureC: ev.temperatureCorrected ? spec.referenceTemperatureC : null,
      support: supports.map((s) => supportLabels[s as Support] ?? s).join(", ") || "Not recorded",
      strikes: Math.max(1, ev.strikesUsed),
      location: null,
    },
    measuredFrom: day(strikes[0]?.uploadedAt ?? ident.issuedAt),
    measuredTo: day(strikes.at(-1)?.uploadedAt ?? ident.issuedAt),
    results,
    decisionRule: spec.decisionRule,
    verdict: ev.verdict,
    statementOfConformity: defaultStatementOfConformity(ev.verdict, spec.decisionRule, spec.name, spec.version),
    authorisedBy: { name: actor.name, role: roleLabels[actor.role] },
    authorisedAt: ident.issuedAt.toISOString(),
    // Any fork may end up in a clinic or a laboratory, so every fork certificate states that it records a
    // measurement only; other families get it when their spec's name says clinical or laboratory use.
    flags: { measurementOnlyCaution: spec.family === "tuning_fork" || needsMeasurementOnlyCaution(spec.name) },
  };
  return { data, evaluation: ev };
}

/** The next number in the workshop's sequence for this year: PREFIX-YYYY-NNNNN. */
function nextNumber(db: Db, workshopId: string, prefix: string, at: Date): string {
  const stem = `${prefix}-${at.getUTCFullYear()}-`;
  const [{ last }] = db.select({ last: max(certificate.number) }).from(certificate).where(and(eq(certificate.workshopId, workshopId), like(certificate.number, `${stem}%`))).all();
  const n = last ? Number(last.slice(stem.length)) + 1 : 1;
  return certificateNumber(prefix, at.getUTCFullYear(), n);
}

export async function previewCertificate(deps: CertificateDeps, actor: Actor & { name: string; role: RoleName }, unitId: string, input: IssueCertificateInput): Promise<Buffer> {
  const { data } = buildData(deps, actor, unitId, input, { number: "PREVIEW — NOT ISSUED", code: "preview-not-a-valid-code", issuedAt: new Date(), amends: null });
  return renderCertificatePdf(data);
}

export async function issueCertificate(deps: CertificateDeps, actor: Actor & { name: string; role: RoleName }, unitId: string, input: IssueCertificateInput): Promise<CertificateSummary> {
  const { db } = deps;
  const u = findUnit(db, actor.workshopId, unitId);
  let amended: typeof certificate.$inferSelect | undefined;
  if (input.amendsNumber) {
    amended = db.select().from(certificate).where(and(eq(certificate.number, input.amendsNumber), eq(certificate.workshopId, actor.workshopId), eq(certificate.unitId, unitId))).get();
    if (!amended) throw new HttpError(400, "validation_failed", `Certificate ${input.amendsNumber} is not one of unit ${u.serial}'s.`, { amendsNumber: "Not a certificate of this unit" });
    if (amended.supersededById) throw conflict(`Certificate ${amended.number} was already amended; amend the newest one.`);
  }
  const w = profileOf(db, actor.workshopId);
  const issuedAt = new Date();
  const number = nextNumber(db, actor.workshopId, w.prefix, issuedAt);
  const code = newVerificationCode();
  const { data, evaluation } = buildData(deps, actor, unitId, input, { number, code, issuedAt, amends: amended ? { number: amended.number, reason: input.amendReason! } : null });
  const pdf = await renderCertificatePdf(data);
  const pdfSha256 = sha256Hex(pdf);
  const canonical = canonicalize(data);
  const signature = signCertificate(canonical, deps.key);
  const key = `${actor.workshopId}/${number}.pdf`;
  mkdirSync(path.dirname(pdfPath(deps.dataDir, key)), { recursive: true });
  writeFileSync(pdfPath(deps.dataDir, key), pdf, { flag: "wx" });
  const id = randomUUID();
  db.transaction((tx) => {
    tx.insert(certificate)
      .values({ id, workshopId: actor.workshopId, unitId, evaluationId: evaluation.id, number, verificationCode: code, recipientEmail: input.recipientEmail, recipientName: input.recipientName ?? null, issuedBy: actor.userId, issuedAt, canonical, signature, pdfSha256, pdfKey: key, amendsId: amended?.id ?? null, amendReason: input.amendReason ?? null })
      .run();
    if (amended) tx.update(certificate).set({ supersededById: id }).where(eq(certificate.id, amended.id)).run();
    audit(tx, actor, amended ? "certificate.amend" : "certificate.issue", "certificate", id, { after: { number, unitId, verdict: data.verdict, pdfSha256, amends: amended?.number ?? null } });
  });
  await sendCertificateMail(deps, id);
  return listCertificates(db, actor.workshopId, unitId, deps.baseUrl).find((c) => c.id === id)!;
}

/** Sends (or re-sends) the certificate e-mail. A failure is recorded on the mail row; the certificate stays. */
export async function sendCertificateMail(deps: CertificateDeps, certificateId: string) {
  const { db } = deps;
  const c = db.select().from(certificate).where(eq(certificate.id, certificateId)).get()!;
  const data = JSON.parse(c.canonical) as CertificateData;
  const pdf = readFileSync(pdfPath(deps.dataDir, c.pdfKey));
  const greeting = c.recipientName ? `Dear ${c.recipientName},` : "Hello,";
  const text = [
    greeting,
    "",
    `attached is test certificate ${c.number} for ${data.product.specName}, serial ${data.unit.serial}, issued by ${data.workshop.name}.`,
    `Result: ${data.verdict.replaceAll("_", " ")}.`,
    "",
    `You can check that the certificate is genuine at ${data.verifyUrl}`,
    `(the PDF's SHA-256 is ${c.pdfSha256}).`,
    "",
    `Questions about the measurement: reply to this message or write to ${data.workshop.qualityEmail}.`,
    "",
    data.workshop.name,
  ].join("\n");
  const esc = (s: string) => s.replace(/[&<>"]/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[ch]!);
  const html = `<p>${esc(greeting)}</p><p>attached is test certificate <strong>${esc(c.number)}</strong> for ${esc(data.product.specName)}, serial ${esc(data.unit.serial)}, issued by ${esc(data.workshop.name)}.</p><p>Result: <strong>${esc(data.verdict.replaceAll("_", " "))}</strong>.</p><p><a href="${esc(data.verifyUrl)}">Check that the certificate is genuine</a> (the PDF's SHA-256 is <code>${c.pdfSha256}</code>).</p><p>Questions about the measurement: reply to this message or write to ${esc(data.workshop.qualityEmail)}.</p><p>${esc(data.workshop.name)}</p>`;
  const existing = db.select().from(mailMessage).where(and(eq(mailMessage.relatedId, c.id), eq(mailMessage.kind, "certificate"))).orderBy(desc(mailMessage.createdAt)).get();
  if (existing && existing.state === "failed") return deps.mailer.retry(existing.id);
  return deps.mailer.send({
    workshopId: c.workshopId,
    kind: "certificate",
    relatedId: c.id,
    to: c.recipientEmail,
    from: `"${data.workshop.name.replaceAll('"', "")}" <${data.workshop.sendingEmail}>`,
    replyTo: data.workshop.qualityEmail,
    subject: `Test certificate ${c.number} — ${data.product.specName}, serial ${data.unit.serial}`,
    text,
    html,
    attachments: [{ filename: `${c.number}.pdf`, contentType: "application/pdf", content: pdf }],
  });
}

export function listCertificates(db: Db, workshopId: string, unitId: string, baseUrl: string): CertificateSummary[] {
  const rows = db.select().from(certificate).where(and(eq(certificate.workshopId, workshopId), eq(certificate.unitId, unitId))).orderBy(desc(certificate.issuedAt)).all();
  const byId = new Map(rows.map((r) => [r.id, r]));
  return rows.map((r) => {
    const data = JSON.parse(r.canonical) as CertificateData;
    const m = db.select().from(mailMessage).where(and(eq(mailMessage.relatedId, r.id), eq(mailMessage.kind, "certificate"))).orderBy(desc(mailMessage.createdAt)).get();
    return {
      id: r.id,
      number: r.number,
      issuedAt: r.issuedAt.toISOString(),
      recipientEmail: r.recipientEmail,
      recipientName: r.recipientName,
      verdict: data.verdict,
      verifyUrl: `${baseUrl}/verify/${r.verificationCode}`,
      pdfSha256: r.pdfSha256,
      amends: r.amendsId ? byId.get(r.amendsId)?.number ?? null : null,
      supersededBy: r.supersededById ? byId.get(r.supersededById)?.number ?? null : null,
      state: r.supersededById ? "superseded" : "current",
      mail: m ? { id: m.id, state: m.state, error: m.error, attempts: m.attempts } : null,
    };
  });
}

export function findCertificate(db: Db, workshopId: string, number: string) {
  const c = db.select().from(certificate).where(and(eq(certificate.workshopId, workshopId), eq(certificate.number, number))).get();
  if (!c) throw notFound("That certificate");
  return c;
}

/** The certificate's PDF. A superseded one is re-rendered with its SUPERSEDED mark unless the original is asked for. */
export async function certificatePdf(deps: CertificateDeps, workshopId: string, number: string, original: boolean): Promise<Buffer> {
  const c = findCertificate(deps.db, workshopId, number);
  const stored = readFileSync(pdfPath(deps.dataDir, c.pdfKey));
  if (!c.supersededById || original) return stored;
  const by = deps.db.select({ number: certificate.number }).from(certificate).where(eq(certificate.id, c.supersededById)).get();
  return renderCertificatePdf({ ...(JSON.parse(c.canonical) as CertificateData), superseded: true, supersededBy: by?.number ?? null });
}

/** What the public verification page shows: no contact data of the customer. */
/** What the public verification page shows for a code, or null when no certificate has it. */
export function verifyByCode(deps: CertificateDeps, code: string) {
  const c = deps.db.select().from(certificate).where(eq(certificate.verificationCode, code)).get();
  if (!c) return null;
  const data = JSON.parse(c.canonical) as CertificateData;
  const signatureValid = verifyCertificate(c.canonical, c.signature, deps.key.publicKey) && data.number === c.number && data.verificationCode === c.verificationCode;
  let pdfIntact = false;
  try {
    pdfIntact = sha256Hex(readFileSync(pdfPath(deps.dataDir, c.pdfKey))) === c.pdfSha256;
  } catch {
    pdfIntact = false;
  }
  const by = c.supersededById ? deps.db.select({ number: certificate.number }).from(certificate).where(eq(certificate.id, c.supersededById)).get() : undefined;
  return {
    number: c.number,
    workshop: data.workshop.name,
    unit: data.unit.serial,
    product: `${data.product.specName} (version ${data.product.specVersion})`,
    family: data.product.family,
    measuredFrom: data.measuredFrom,
    measuredTo: data.measuredTo,
    issuedAt: data.issuedAt,
    verdict: data.verdict,
    decisionRule: data.decisionRule,
    results: data.results.map((r) => ({ label: r.label, measuredHz: r.measuredHz, expandedUncertaintyHz: r.expandedUncertaintyHz, deviationCents: r.deviationCents, toleranceCents: r.toleranceCents, result: r.result })),
    authorisedBy: data.authorisedBy,
    pdfSha256: c.pdfSha256,
    signatureAlgorithm: "Ed25519",
    signingKeyId: deps.key.keyId,
    signatureValid,
    pdfIntact,
    amends: data.amends,
    superseded: Boolean(c.supersededById),
    supersededBy: by?.number ?? null,
  };
}

