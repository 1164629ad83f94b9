/**
 * Test certificates: built from a unit's latest evaluation, rendered to PDF, hashed, signed with the
 * workshop server's Ed25519 key over the canonical data, stored, and mailed to the customer.
 * A certificate follows QA's decision (none for a scrapped unit; a concession is stated). An
 * amendment gets a new number and marks the earlier certificate superseded; a withdrawal is a new
 * record pointing at the certificate; every certificate stays retrievable. The PDF download, the
 * e-mail, the re-send and the public verification serve unit and batch certificates alike.
 */
import { readFileSync } from "node:fs";
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, gt, inArray, isNull } from "drizzle-orm";
import type { EvaluationView } from "../../shared/schemas/evaluation.ts";
import type { BatchCertificateData } from "../../shared/schemas/batch-certificate.ts";
import {
  certificateNumber,
  concessionStatement,
  defaultStatementOfConformity,
  needsMeasurementOnlyCaution,
  verdictWords,
  type CertificateData,
  type CertificateMailSummary,
  type CertificateResult,
  type CertificateSummary,
  type CertificateSummaryBase,
  type IssueCertificateInput,
} from "../../shared/schemas/certificate.ts";
import { familyLabels, supportLabels, type Family, type Support } from "../../shared/schemas/spec.ts";
import { roleLabels, type RoleName } from "../../shared/permissions.ts";
import { renderBatchCertificatePdf } from "../certificates/batch-pdf.ts";
import { renderCertificatePdf } from "../certificates/pdf.ts";
import { canonicalize, newVerificationCode, sha256Hex, signCertificate, verifyCertificate, type SigningKey } from "../certificates/signing.ts";
import type { Db, Sqlite } from "../db/client.ts";
import { auditEvent, batch, certificate, certificateWithdrawal, mailMessage, organization, strike, strikeVoid, workshopProfile } from "../db/schema.ts";
import { conflict, HttpError } from "../http-error.ts";
import type { Mailer, MailRecord } from "../mail/mailer.ts";
import { audit, type Actor } from "./audit.ts";
import { certifiability } from "./certification.ts";
import { findAnyCertificate, findByVerificationCode, nextNumber, pdfKeyOf, pdfPath, storeWithRow, withdrawalsOf, withWorkshopNumbering, type AnyCertificate } from "./certificate-store.ts";
import { appendToChain } from "./ledger-chain.ts";
import { certificateTraceability, measuredTemperatures } from "./certificate-traceability.ts";
import { getSpecVersion } from "./specs.ts";
import { findUnit } from "./strikes.ts";

export type CertificateDeps = { db: Db; sqlite?: Sqlite; mailer: Mailer; key: SigningKey; dataDir: string; baseUrl: string; analyserVersion: string };
export type Issuer = Actor & { name: string; role: RoleName };

export const METHOD_SUMMARY =
  "Each strike was recorded as uncompressed audio and analysed by Tinelog: partials were located in a zero-padded, Hann-windowed spectrum and each was refined by fitting exponentially decaying sinusoids (matrix pencil start, least-squares finish), which gives its frequency, decay time constant τ, T60 = τ·ln 1000 and Q = π·f·τ with their uncertainties. Results of several strikes are combined by the median.";

/** Re-sends of one certificate's e-mail allowed per hour: enough for a lost mail, not a mail bomb. */
export const RESEND_LIMIT_PER_HOUR = 5;

export type MailSummary = CertificateMailSummary;

export function profileOf(db: Db, workshopId: string) {
  const w = db.select().from(organization).where(eq(organization.id, workshopId)).get()!;
  const p = db.select().from(workshopProfile).where(eq(workshopProfile.workshopId, workshopId)).get();
  const missing = [!p?.address && "address", !p?.sendingEmail && "sending e-mail address", !p?.qualityEmail && "quality contact e-mail"].filter(Boolean);
  if (!p || missing.length) throw conflict(`The workshop profile lacks its ${missing.join(", ")}; the owner completes it under Settings before certificates can be issued.`);
  return { name: w.name, address: p.address, sendingEmail: p.sendingEmail, qualityEmail: p.qualityEmail, prefix: p.certificatePrefix };
}

/** Temperatures, supports and dates of the strikes a unit's evaluation was made from (voided strikes left out). */
export function strikeFacts(db: Db, unitIds: string[]) {
  if (!unitIds.length) return [];
  return db
    .select({ unitId: strike.unitId, temperatureC: strike.temperatureC, support: strike.support, uploadedAt: strike.uploadedAt })
    .from(strike)
    .leftJoin(strikeVoid, eq(strikeVoid.strikeId, strike.id))
    .where(and(inArray(strike.unitId, unitIds), eq(strike.state, "done"), isNull(strikeVoid.id)))
    .orderBy(asc(strike.uploadedAt))
    .all();
}

/** The certificate's result lines: every requirement measured, with its expanded uncertainty (k = 2). */
export function resultLines(ev: EvaluationView): CertificateResult[] {
  return ev.requirements
    .filter((r) => r.measuredHz !== null && r.targetHz !== null && r.deviationCents !== null && r.t60S !== null && r.q !== null)
    .map((r) => ({
      label: r.label,
      measuredHz: r.measuredHz!,
      expandedUncertaintyHz: r.expandedUncertaintyHz ?? 0,
      targetHz: r.targetHz!,
      toleranceCents: r.toleranceCents,
      deviationCents: r.deviationCents!,
      t60S: r.t60S!,
      ...(typeof r.t60ObservedDecayDb === "number" ? { t60ObservedDecayDb: Math.round(r.t60ObservedDecayDb) } : {}),
      minT60S: r.minT60S,
      q: r.q!,
      result: r.result === "pass" || r.result === "fail" ? r.result : r.result === "not_found" ? "fail" : "inconclusive",
    }));
}

export const supportsInWords = (supports: (string | null)[]) =>
  [...new Set(supports.filter((s): s is string => !!s))].map((s) => supportLabels[s as Support] ?? s).join(", ") || "Not recorded";

/** Every fork may end up in a clinic or a laboratory; other families when their spec's name says so. */
export const measurementOnlyCaution = (spec: { family: string; name: string }) => spec.family === "tuning_fork" || needsMeasurementOnlyCaution(spec.name);

/** Everything the certificate states, from the unit's latest evaluation (also used for the preview). */
function buildData(deps: CertificateDeps, actor: Issuer, unitId: string, input: IssueCertificateInput, ident: { number: string; code: string; issuedAt: Date; amends: CertificateData["amends"] }): { data: CertificateData; evaluation: EvaluationView } {
  const { db } = deps;
  const u = findUnit(db, actor.workshopId, unitId);
  const b = db.select().from(batch).where(eq(batch.id, u.batchId)).get()!;
  const standing = certifiability(db, b, [u]).get(u.id)!;
  if (!standing.eligible) throw conflict(standing.reason);
  const ev = standing.evaluation;
  const spec = getSpecVersion(db, actor.workshopId, ev.specVersionId)!;
  const strikes = strikeFacts(db, [unitId]);
  const temps = measuredTemperatures(ev, strikes.map((s) => s.temperatureC));
  const results = resultLines(ev);
  if (!results.length) throw conflict(`Unit ${u.serial}'s evaluation has no measured partial to report.`);
  const w = profileOf(db, actor.workshopId);
  const day = (d: Date) => d.toISOString().slice(0, 10);
  const statement = defaultStatementOfConformity(ev.verdict, spec.decisionRule, spec.name, spec.version);
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
      support: supportsInWords(strikes.map((s) => s.support)),
      strikes: Math.max(1, ev.strikesUsed),
      location: null,
    },
    measuredFrom: day(strikes[0]?.uploadedAt ?? ident.issuedAt),
    measuredTo: day(strikes.at(-1)?.uploadedAt ?? ident.issuedAt),
    results,
    decisionRule: spec.decisionRule,
    verdict: ev.verdict,
    // What the statement applies to: a concession names its departures and reason in the statement itself.
    statementOfConformity: standing.concession ? `${statement} ${concessionStatement(standing.concession)}` : statement,
    concession: standing.concession,
    authorisedBy: { name: actor.name, role: roleLabels[actor.role] },
    authorisedAt: ident.issuedAt.toISOString(),
    flags: { measurementOnlyCaution: measurementOnlyCaution(spec) },
    traceability: certificateTraceability(db, actor.workshopId, ev),
  };
  return { data, evaluation: ev };
}

export async function previewCertificate(deps: CertificateDeps, actor: Issuer, unitId: string, input: IssueCertificateInput): Promise<Buffer> {
  const { data } = buildData(deps, actor, unitId, input, { number: "PREVIEW — NOT ISSUED", code: "preview-not-a-valid-code", issuedAt: new Date(), amends: null });
  return renderCertificatePdf(data);
}

export async function issueCertificate(deps: CertificateDeps, actor: Issuer, unitId: string, input: IssueCertificateInput): Promise<CertificateSummary> {
  const { db } = deps;
  const u = findUnit(db, actor.workshopId, unitId);
  let amended: typeof certificate.$inferSelect | undefined;
  if (input.amendsNumber) {
    amended = db.select().from(certificate).where(and(eq(certificate.number, input.amendsNumber), eq(certificate.workshopId, actor.workshopId), eq(certificate.unitId, unitId))).get();
    if (!amended) throw new HttpError(400, "validation_failed", `Certificate ${input.amendsNumber} is not one of unit ${u.serial}'s.`, { amendsNumber: "Not a certificate of this unit" });
    if (amended.supersededById) throw conflict(`Certificate ${amended.number} was already amended; amend the newest one.`);
    if (withdrawalsOf(db, [amended.id]).has(amended.id)) throw conflict(`Certificate ${amended.number} was withdrawn; issue a new certificate instead of amending it.`);
  }
  const w = profileOf(db, actor.workshopId);
  const id = randomUUID();
  await issueSigned(
    deps,
    actor.workshopId,
    w.prefix,
    id,
    (ident) => buildData(deps, actor, unitId, input, { ...ident, amends: amended ? { number: amended.number, reason: input.amendReason! } : null }),
    ({ data }) => renderCertificatePdf(data),
    ({ data }) => data,
    (tx, { data, evaluation }, s) => {
      tx.insert(certificate)
        .values({ id, workshopId: actor.workshopId, unitId, evaluationId: evaluation.id, number: s.number, verificationCode: s.code, recipientEmail: input.recipientEmail, recipientName: input.recipientName ?? null, issuedBy: actor.userId, issuedAt: s.issuedAt, canonical: s.canonical, signature: s.signature, pdfSha256: s.pdfSha256, pdfKey: s.pdfKey, amendsId: amended?.id ?? null, amendReason: input.amendReason ?? null })
        .run();
      if (amended) tx.update(certificate).set({ supersededById: id }).where(eq(certificate.id, amended.id)).run();
      audit(tx, actor, amended ? "certificate.amend" : "certificate.issue", "certificate", id, { after: { number: s.number, unitId, verdict: data.verdict, concession: Boolean(data.concession), pdfSha256: s.pdfSha256, amends: amended?.number ?? null } });
    },
  );
  await sendCertificateMail(deps, { kind: "unit", row: db.select().from(certificate).where(eq(certificate.id, id)).get()! });
  return listCertificates(db, actor.workshopId, unitId, deps.baseUrl).find((c) => c.id === id)!;
}

export type Signed = { number: string; code: string; issuedAt: Date; canonical: string; signature: string; pdfSha256: string; pdfKey: string };

/**
 * The issuing steps every certificate shares: under the workshop's numbering lock, the next number
 * and a verification code; the data built and rendered; the signed data (exactly what the PDF
 * shows) and the PDF's hash; then row and file stored together.
 */
export async function issueSigned<B>(
  deps: CertificateDeps,
  workshopId: string,
  prefix: string,
  id: string,
  build: (ident: { number: string; code: string; issuedAt: Date }) => B,
  render: (built: B) => Promise<Buffer>,
  signed: (built: B) => unknown,
  insert: (tx: Db, built: B, s: Signed) => void,
): Promise<void> {
  await withWorkshopNumbering(workshopId, async () => {
    const issuedAt = new Date();
    const number = nextNumber(deps.db, workshopId, prefix, issuedAt);
    const code = newVerificationCode();
    const built = build({ number, code, issuedAt });
    const pdf = await render(built);
    const canonical = canonicalize(signed(built));
    const s: Signed = { number, code, issuedAt, canonical, signature: signCertificate(canonical, deps.key), pdfSha256: sha256Hex(pdf), pdfKey: pdfKeyOf(workshopId, id) };
    storeWithRow(deps.db, deps.dataDir, s.pdfKey, pdf, number, (tx) => insert(tx, built, s));
  });
}

const esc = (s: string) => s.replace(/[&<>"]/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[ch]!);
const fromOf = (w: { name: string; sendingEmail: string }) => `"${w.name.replaceAll('"', "")}" <${w.sendingEmail}>`;

/** What a certificate is about, in one phrase for mail: "BTW-440 concert fork, serial F-0001". */
function subjectOf(c: AnyCertificate): { what: string; title: string; workshop: CertificateData["workshop"]; verifyUrl: string } {
  if (c.kind === "unit") {
    const d = JSON.parse(c.row.canonical) as CertificateData;
    return { what: `${d.product.specName}, serial ${d.unit.serial}`, title: "test certificate", workshop: d.workshop, verifyUrl: d.verifyUrl };
  }
  const d = JSON.parse(c.row.canonical) as BatchCertificateData;
  return { what: `${d.product.specName}, batch ${d.batch.code} (${d.units.length} unit${d.units.length === 1 ? "" : "s"})`, title: "batch test certificate", workshop: d.workshop, verifyUrl: d.verifyUrl };
}

/** Sends (or re-sends) the certificate e-mail with its PDF. A failure is recorded on the mail row; the certificate stays. */
export async function sendCertificateMail(deps: CertificateDeps, c: AnyCertificate): Promise<MailRecord> {
  const { db } = deps;
  const row = c.row;
  const s = subjectOf(c);
  const pdf = readFileSync(pdfPath(deps.dataDir, row.pdfKey));
  const verdictLine = c.kind === "unit" ? `Result: ${verdictWords[(JSON.parse(row.canonical) as CertificateData).verdict].toLowerCase()}${(JSON.parse(row.canonical) as CertificateData).concession ? ", released under a concession (see the statement of conformity)" : ""}.` : "The results of each unit are listed in the certificate.";
  const greeting = row.recipientName ? `Dear ${row.recipientName},` : "Hello,";
  const text = [
    greeting,
    "",
    `attached is ${s.title} ${row.number} for ${s.what}, issued by ${s.workshop.name}.`,
    verdictLine,
    "",
    `You can check that the certificate is genuine at ${s.verifyUrl}`,
    `(the PDF's SHA-256 is ${row.pdfSha256}).`,
    "",
    `Questions about the measurement: reply to this message or write to ${s.workshop.qualityEmail}.`,
    "",
    s.workshop.name,
  ].join("\n");
  const html = `<p>${esc(greeting)}</p><p>attached is ${esc(s.title)} <strong>${esc(row.number)}</strong> for ${esc(s.what)}, issued by ${esc(s.workshop.name)}.</p><p>${esc(verdictLine)}</p><p><a href="${esc(s.verifyUrl)}">Check that the certificate is genuine</a> (the PDF's SHA-256 is <code>${row.pdfSha256}</code>).</p><p>Questions about the measurement: reply to this message or write to ${esc(s.workshop.qualityEmail)}.</p><p>${esc(s.workshop.name)}</p>`;
  const existing = db.select().from(mailMessage).where(and(eq(mailMessage.relatedId, row.id), eq(mailMessage.kind, "certificate"))).orderBy(desc(mailMessage.createdAt)).get();
  if (existing && existing.state === "failed") return deps.mailer.retry(existing.id);
  return deps.mailer.send({
    workshopId: row.workshopId,
    kind: "certificate",
    relatedId: row.id,
    to: row.recipientEmail,
    from: fromOf(s.workshop),
    replyTo: s.workshop.qualityEmail,
    subject: `${s.title.charAt(0).toUpperCase()}${s.title.slice(1)} ${row.number} — ${s.what}`,
    text,
    html,
    attachments: [{ filename: `${row.number}.pdf`, contentType: "application/pdf", content: pdf }],
  });
}

/** Tells the recipient that a certificate they were sent is withdrawn, and why; no attachment. */
async function sendWithdrawalNotice(deps: CertificateDeps, c: AnyCertificate, reason: string, at: Date): Promise<MailRecord> {
  const row = c.row;
  const s = subjectOf(c);
  const greeting = row.recipientName ? `Dear ${row.recipientName},` : "Hello,";
  const when = at.toISOString().slice(0, 10);
  const text = [
    greeting,
    "",
    `${s.workshop.name} has withdrawn ${s.title} ${row.number} for ${s.what}, which was sent to you on ${row.issuedAt.toISOString().slice(0, 10)}.`,
    `It was withdrawn on ${when} for this reason: ${reason}`,
    "",
    "The certificate is no longer valid. Please do not rely on it or pass it on; the verification page now shows it as withdrawn:",
    s.verifyUrl,
    "",
    `Questions: reply to this message or write to ${s.workshop.qualityEmail}.`,
    "",
    s.workshop.name,
  ].join("\n");
  const html = `<p>${esc(greeting)}</p><p>${esc(s.workshop.name)} has withdrawn ${esc(s.title)} <strong>${esc(row.number)}</strong> for ${esc(s.what)}, which was sent to you on ${esc(row.issuedAt.toISOString().slice(0, 10))}.</p><p>It was withdrawn on ${esc(when)} for this reason: ${esc(reason)}</p><p>The certificate is no longer valid. Please do not rely on it or pass it on; <a href="${esc(s.verifyUrl)}">the verification page</a> now shows it as withdrawn.</p><p>Questions: reply to this message or write to ${esc(s.workshop.qualityEmail)}.</p><p>${esc(s.workshop.name)}</p>`;
  return deps.mailer.send({
    workshopId: row.workshopId,
    kind: "certificate_notice",
    relatedId: row.id,
    to: row.recipientEmail,
    from: fromOf(s.workshop),
    replyTo: s.workshop.qualityEmail,
    subject: `Withdrawn: ${s.title} ${row.number} — ${s.what}`,
    text,
    html,
  });
}

const mailSummary = (m: typeof mailMessage.$inferSelect | undefined): MailSummary | null => (m ? { id: m.id, state: m.state, error: m.error, attempts: m.attempts } : null);

/** The latest certificate e-mail of each certificate id. */
function latestMails(db: Db, ids: string[]) {
  const out = new Map<string, MailSummary>();
  if (!ids.length) return out;
  const rows = db.select().from(mailMessage).where(and(inArray(mailMessage.relatedId, ids), eq(mailMessage.kind, "certificate"))).orderBy(asc(mailMessage.createdAt)).all();
  for (const m of rows) out.set(m.relatedId!, mailSummary(m)!);
  return out;
}

type StoredCertificate = { id: string; number: string; issuedAt: Date; recipientEmail: string; recipientName: string | null; verificationCode: string; pdfSha256: string };

/** What every certificate list shows of each row (unit or batch certificate): its withdrawal and latest e-mail looked up once. */
export function summaryBases(db: Db, rows: StoredCertificate[], baseUrl: string): Map<string, CertificateSummaryBase> {
  const ids = rows.map((r) => r.id);
  const withdrawals = withdrawalsOf(db, ids);
  const mails = latestMails(db, ids);
  return new Map(
    rows.map((r) => {
      const w = withdrawals.get(r.id);
      return [
        r.id,
        {
          id: r.id,
          number: r.number,
          issuedAt: r.issuedAt.toISOString(),
          recipientEmail: r.recipientEmail,
          recipientName: r.recipientName,
          verifyUrl: `${baseUrl}/verify/${r.verificationCode}`,
          pdfSha256: r.pdfSha256,
          withdrawn: w ? { at: w.at.toISOString(), reason: w.reason, by: w.by?.name ?? null } : null,
          mail: mails.get(r.id) ?? null,
        },
      ];
    }),
  );
}

export function listCertificates(db: Db, workshopId: string, unitId: string, baseUrl: string): CertificateSummary[] {
  const rows = db.select().from(certificate).where(and(eq(certificate.workshopId, workshopId), eq(certificate.unitId, unitId))).orderBy(desc(certificate.issuedAt)).all();
  const byId = new Map(rows.map((r) => [r.id, r]));
  const bases = summaryBases(db, rows, baseUrl);
  return rows.map((r) => {
    const data = JSON.parse(r.canonical) as CertificateData;
    const base = bases.get(r.id)!;
    return {
      ...base,
      verdict: data.verdict,
      concession: Boolean(data.concession),
      amends: r.amendsId ? byId.get(r.amendsId)?.number ?? null : null,
      supersededBy: r.supersededById ? byId.get(r.supersededById)?.number ?? null : null,
      state: base.withdrawn ? "withdrawn" : r.supersededById ? "superseded" : "current",
    };
  });
}

/**
 * The certificate's PDF. A withdrawn or superseded one is re-rendered with its mark unless the
 * original is asked for (the stored bytes, whose hash the verification page shows).
 */
export async function certificatePdf(deps: CertificateDeps, workshopId: string, number: string, original: boolean): Promise<Buffer> {
  const c = findAnyCertificate(deps.db, workshopId, number);
  const stored = readFileSync(pdfPath(deps.dataDir, c.row.pdfKey));
  if (original) return stored;
  const w = withdrawalsOf(deps.db, [c.row.id]).get(c.row.id);
  const withdrawn = w ? { at: w.at.toISOString(), reason: w.reason } : null;
  if (c.kind === "batch") return withdrawn ? renderBatchCertificatePdf({ ...(JSON.parse(c.row.canonical) as BatchCertificateData), withdrawn }) : stored;
  if (!withdrawn && !c.row.supersededById) return stored;
  const by = c.row.supersededById ? deps.db.select({ number: certificate.number }).from(certificate).where(eq(certificate.id, c.row.supersededById)).get() : undefined;
  return renderCertificatePdf({ ...(JSON.parse(c.row.canonical) as CertificateData), superseded: Boolean(c.row.supersededById), supersededBy: by?.number ?? null, withdrawn });
}

/**
 * Re-sends the certificate's e-mail: refused for a withdrawn or superseded certificate (409) and
 * after RESEND_LIMIT_PER_HOUR re-sends within the hour (429, with when to try again).
 */
export async function resendCertificate(deps: CertificateDeps, actor: Actor, number: string): Promise<{ mail: MailSummary; retryAfterS?: number }> {
  const { db } = deps;
  const c = findAnyCertificate(db, actor.workshopId, number);
  if (withdrawalsOf(db, [c.row.id]).has(c.row.id)) throw conflict(`Certificate ${number} was withdrawn; it can no longer be sent.`);
  if (c.kind === "unit" && c.row.supersededById) {
    const by = db.select({ number: certificate.number }).from(certificate).where(eq(certificate.id, c.row.supersededById)).get();
    throw conflict(`Certificate ${number} was superseded by ${by?.number ?? "a later one"}; send that one instead.`);
  }
  const since = new Date(Date.now() - 3600_000);
  const recent = db
    .select({ at: auditEvent.at })
    .from(auditEvent)
    .where(and(eq(auditEvent.workshopId, actor.workshopId), eq(auditEvent.action, "certificate.resend"), eq(auditEvent.entityId, c.row.id), gt(auditEvent.at, since)))
    .orderBy(asc(auditEvent.at))
    .all();
  if (recent.length >= RESEND_LIMIT_PER_HOUR) {
    const free = new Date(recent[0].at.getTime() + 3600_000);
    const retryAfterS = Math.max(1, Math.ceil((free.getTime() - Date.now()) / 1000));
    throw Object.assign(
      new HttpError(429, "too_many_requests", `Certificate ${number} was already re-sent ${recent.length} times in the last hour (at most ${RESEND_LIMIT_PER_HOUR}). It can be sent again from ${free.toISOString().slice(11, 16)} UTC.`),
      { retryAfterS },
    );
  }
  audit(db, actor, "certificate.resend", "certificate", c.row.id, { after: { number, to: c.row.recipientEmail } });
  return { mail: mailSummary(await sendCertificateMail(deps, c))! };
}

/**
 * Withdraws a certificate: a withdrawal row with its reason (chained and audited), then a notice to
 * the recipient. The certificate stays on record; its verification page and PDF say "withdrawn".
 */
export async function withdrawCertificate(deps: CertificateDeps & { sqlite: Sqlite }, actor: Actor, number: string, reason: string) {
  const { db, sqlite } = deps;
  const c = findAnyCertificate(db, actor.workshopId, number);
  if (c.kind === "unit" && c.row.supersededById) {
    const by = db.select({ number: certificate.number }).from(certificate).where(eq(certificate.id, c.row.supersededById)).get();
    throw conflict(`Certificate ${number} was already superseded by ${by?.number ?? "a later one"} and is no longer valid; withdraw that one if needed.`);
  }
  const id = randomUUID();
  db.transaction((tx) => {
    const earlier = withdrawalsOf(tx as unknown as Db, [c.row.id]).get(c.row.id);
    if (earlier) throw conflict(`Certificate ${number} was already withdrawn on ${earlier.at.toISOString().slice(0, 10)} (${earlier.reason}).`);
    tx.insert(certificateWithdrawal).values({ id, workshopId: actor.workshopId, certificateId: c.row.id, reason, withdrawnBy: actor.userId }).run();
    appendToChain(sqlite, actor.workshopId, "certificate_withdrawal", id);
    audit(tx, actor, "certificate.withdraw", "certificate", c.row.id, { after: { number, reason, withdrawalId: id } });
  });
  const w = withdrawalsOf(db, [c.row.id]).get(c.row.id)!;
  const notice = await sendWithdrawalNotice(deps, c, reason, w.at);
  return { number, withdrawn: { at: w.at.toISOString(), reason }, notice: mailSummary(notice) };
}

/**
 * What the public verification page shows for a code (no contact data of the customer, nor who
 * withdrew), or null when no certificate has it.
 */
export function verifyByCode(deps: CertificateDeps, code: string) {
  const c = findByVerificationCode(deps.db, code);
  if (!c) return null;
  const signed = JSON.parse(c.row.canonical) as { number?: string; verificationCode?: string };
  // The signature covers the data; the data must also name this very certificate and code.
  const signatureValid = verifyCertificate(c.row.canonical, c.row.signature, deps.key.publicKey) && signed.number === c.row.number && signed.verificationCode === c.row.verificationCode;
  let pdfIntact = false;
  try {
    pdfIntact = sha256Hex(readFileSync(pdfPath(deps.dataDir, c.row.pdfKey))) === c.row.pdfSha256;
  } catch {
    pdfIntact = false;
  }
  const w = withdrawalsOf(deps.db, [c.row.id]).get(c.row.id);
  const common = {
    number: c.row.number,
    pdfSha256: c.row.pdfSha256,
    signatureAlgorithm: "Ed25519",
    signingKeyId: deps.key.keyId,
    pdfIntact,
    withdrawn: w ? { at: w.at.toISOString(), reason: w.reason } : null,
  };
  /** What both kinds state, from their signed data; the signature must also cover this row's number and code. */
  const stated = (data: CertificateData | BatchCertificateData) => ({
    signatureValid: signatureValid && data.number === c.row.number && data.verificationCode === c.row.verificationCode,
    workshop: data.workshop.name,
    product: `${data.product.specName} (version ${data.product.specVersion})`,
    family: data.product.family,
    measuredFrom: data.measuredFrom,
    measuredTo: data.measuredTo,
    issuedAt: data.issuedAt,
    decisionRule: data.decisionRule,
    statementOfConformity: data.statementOfConformity,
    authorisedBy: data.authorisedBy,
  });
  const line = (r: CertificateResult) => ({ label: r.label, measuredHz: r.measuredHz, expandedUncertaintyHz: r.expandedUncertaintyHz, deviationCents: r.deviationCents, toleranceCents: r.toleranceCents, result: r.result });
  if (c.kind === "batch") {
    const data = JSON.parse(c.row.canonical) as BatchCertificateData;
    return {
      ...common,
      ...stated(data),
      kind: "batch" as const,
      batch: data.batch.code,
      units: data.units.map((u) => ({ serial: u.serial, verdict: u.verdict, concession: u.concession, results: u.results.map(line) })),
      excluded: data.excluded,
    };
  }
  const data = JSON.parse(c.row.canonical) as CertificateData;
  const by = c.row.supersededById ? deps.db.select({ number: certificate.number }).from(certificate).where(eq(certificate.id, c.row.supersededById)).get() : undefined;
  return {
    ...common,
    ...stated(data),
    kind: "unit" as const,
    unit: data.unit.serial,
    verdict: data.verdict,
    concession: data.concession ?? null,
    results: data.results.map(line),
    amends: data.amends,
    superseded: Boolean(c.row.supersededById),
    supersededBy: by?.number ?? null,
  };
}
