/**
 * Certificates for a whole released batch: every unit's own certificate, each to its unit's
 * customer, issued one after the other with progress; and the batch certificate, one signed
 * document for a consignment listing every unit that may carry a certificate with its results.
 */
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { batchStatementOfConformity, type BatchCertificateData, type BatchCertificateSummary, type IssueBatchCertificateInput } from "../../shared/schemas/batch-certificate.ts";
import { familyLabels, type Family } from "../../shared/schemas/spec.ts";
import { roleLabels } from "../../shared/permissions.ts";
import { renderBatchCertificatePdf } from "../certificates/batch-pdf.ts";
import type { Db } from "../db/client.ts";
import { batchCertificate, certificate, unit } from "../db/schema.ts";
import { conflict, HttpError } from "../http-error.ts";
import { audit } from "./audit.ts";
import { findBatch } from "./batches.ts";
import { certifiability } from "./certification.ts";
import { withdrawalsOf } from "./certificate-store.ts";
import {
  issueCertificate,
  issueSigned,
  measurementOnlyCaution,
  METHOD_SUMMARY,
  profileOf,
  resultLines,
  sendCertificateMail,
  strikeFacts,
  summaryBases,
  supportsInWords,
  type CertificateDeps,
  type Issuer,
  type MailSummary,
} from "./certificates.ts";
import { getSpecVersion } from "./specs.ts";

export type PlanItem = { unitId: string; serial: string; action: "issue" | "skip"; reason: string | null; recipientEmail: string | null };
export type IssueOutcome = { unitId: string; serial: string; outcome: "issued" | "skipped" | "failed"; number: string | null; reason: string | null; mail: MailSummary["state"] | null };

/**
 * What issuing every unit's certificate would do: issue for each unit that may carry one and has
 * a customer e-mail and no current certificate; skip the rest, saying why.
 */
export function unitCertificatePlan(db: Db, workshopId: string, batchId: string): PlanItem[] {
  const b = findBatch(db, workshopId, batchId);
  if (b.state !== "released") throw conflict(`Batch ${b.code} is not released yet; QA releases the batch before certificates are issued.`);
  const units = db.select().from(unit).where(eq(unit.batchId, b.id)).orderBy(asc(unit.position)).all();
  const standing = certifiability(db, b, units);
  const certs = units.length ? db.select().from(certificate).where(inArray(certificate.unitId, units.map((u) => u.id))).orderBy(desc(certificate.issuedAt)).all() : [];
  const withdrawn = withdrawalsOf(db, certs.map((c) => c.id));
  const current = new Map<string, string>();
  for (const c of certs) if (!c.supersededById && !withdrawn.has(c.id) && !current.has(c.unitId)) current.set(c.unitId, c.number);
  return units.map((u) => {
    const s = standing.get(u.id)!;
    const skip = (reason: string): PlanItem => ({ unitId: u.id, serial: u.serial, action: "skip", reason, recipientEmail: u.customerEmail });
    if (!s.eligible) return skip(s.reason);
    if (current.has(u.id)) return skip(`Already certified: ${current.get(u.id)} is current.`);
    if (!u.customerEmail) return skip(`Unit ${u.serial} has no customer e-mail; add it on the unit's page, then issue its certificate there.`);
    return { unitId: u.id, serial: u.serial, action: "issue", reason: null, recipientEmail: u.customerEmail };
  });
}

/**
 * Issues the certificate of every unit the plan says to, each to its unit's customer, one after
 * the other (each is its own signed document and transaction, with its own audit entry). Calls
 * `progress` after each unit; a unit that fails is reported and the others go on.
 */
export async function issueUnitCertificates(deps: CertificateDeps, actor: Issuer, batchId: string, progress: (outcome: IssueOutcome, done: number, total: number) => void): Promise<IssueOutcome[]> {
  const plan = unitCertificatePlan(deps.db, actor.workshopId, batchId);
  profileOf(deps.db, actor.workshopId); // a missing profile refuses the whole run, before anything is issued
  const outcomes: IssueOutcome[] = [];
  for (const item of plan) {
    let outcome: IssueOutcome;
    if (item.action === "skip") {
      outcome = { unitId: item.unitId, serial: item.serial, outcome: "skipped", number: null, reason: item.reason, mail: null };
    } else {
      const u = deps.db.select().from(unit).where(eq(unit.id, item.unitId)).get()!;
      try {
        const c = await issueCertificate(deps, actor, u.id, { recipientEmail: u.customerEmail!, recipientName: u.customerName ?? undefined });
        outcome = { unitId: u.id, serial: u.serial, outcome: "issued", number: c.number, reason: null, mail: c.mail?.state ?? null };
      } catch (error) {
        if (!(error instanceof HttpError)) throw error;
        outcome = { unitId: u.id, serial: u.serial, outcome: "failed", number: null, reason: error.message, mail: null };
      }
    }
    outcomes.push(outcome);
    progress(outcome, outcomes.length, plan.length);
  }
  return outcomes;
}

/** Everything a batch certificate states, from each unit's latest evaluation and standing disposition. */
function buildBatchData(deps: CertificateDeps, actor: Issuer, batchId: string, input: IssueBatchCertificateInput, ident: { number: string; code: string; issuedAt: Date }): BatchCertificateData {
  const { db } = deps;
  const b = findBatch(db, actor.workshopId, batchId);
  if (b.state !== "released") throw conflict(`Batch ${b.code} is not released yet; QA releases the batch before certificates are issued.`);
  const units = db.select().from(unit).where(eq(unit.batchId, b.id)).orderBy(asc(unit.position)).all();
  const standing = certifiability(db, b, units);
  const covered = units.filter((u) => standing.get(u.id)!.eligible);
  if (!covered.length) throw conflict(`No unit of batch ${b.code} may carry a certificate (none is within tolerance or accepted under a concession), so there is nothing to certify.`);
  const facts = strikeFacts(db, covered.map((u) => u.id));
  const temps = facts.map((f) => f.temperatureC).filter((t): t is number => t !== null);
  const spec = getSpecVersion(db, actor.workshopId, b.specVersionId)!;
  const w = profileOf(db, actor.workshopId);
  const day = (d: Date) => d.toISOString().slice(0, 10);
  const listed = covered.map((u) => {
    const s = standing.get(u.id)!;
    if (!s.eligible) throw new Error("unreachable: filtered to eligible units");
    const mine = facts.filter((f) => f.unitId === u.id).map((f) => f.temperatureC).filter((t): t is number => t !== null);
    return {
      serial: u.serial,
      verdict: s.evaluation.verdict,
      results: resultLines(s.evaluation),
      temperatureC: mine.length ? Math.round((mine.reduce((a, t) => a + t, 0) / mine.length) * 10) / 10 : null,
      strikes: Math.max(1, s.evaluation.strikesUsed),
      concession: s.concession,
    };
  });
  const empty = listed.find((u) => !u.results.length);
  if (empty) throw conflict(`Unit ${empty.serial}'s evaluation has no measured partial to report.`);
  const excluded = units.flatMap((u) => {
    const s = standing.get(u.id)!;
    return s.eligible ? [] : [{ serial: u.serial, reason: s.short }];
  });
  const corrected = covered.some((u) => {
    const s = standing.get(u.id)!;
    return s.eligible && s.evaluation.temperatureCorrected;
  });
  const product = { specName: spec.name, specVersion: spec.version, family: familyLabels[spec.family as Family] ?? spec.family };
  const data: BatchCertificateData = {
    number: ident.number,
    verificationCode: ident.code,
    verifyUrl: `${deps.baseUrl}/verify/${ident.code}`,
    issuedAt: ident.issuedAt.toISOString(),
    workshop: { name: w.name, address: w.address, sendingEmail: w.sendingEmail, qualityEmail: w.qualityEmail },
    customer: { name: input.recipientName ?? input.recipientEmail },
    batch: { code: b.code, quantity: b.quantity, unitCount: units.length },
    product,
    method: { name: "Tinelog strike analysis", analyserVersion: deps.analyserVersion, summary: METHOD_SUMMARY },
    conditions: {
      temperatureMinC: temps.length ? Math.min(...temps) : null,
      temperatureMaxC: temps.length ? Math.max(...temps) : null,
      referenceTemperatureC: corrected ? spec.referenceTemperatureC : null,
      support: supportsInWords(facts.map((f) => f.support)),
    },
    measuredFrom: day(facts[0]?.uploadedAt ?? ident.issuedAt),
    measuredTo: day(facts.reduce((m, f) => (f.uploadedAt > m ? f.uploadedAt : m), facts[0]?.uploadedAt ?? ident.issuedAt)),
    units: listed,
    excluded,
    decisionRule: spec.decisionRule as BatchCertificateData["decisionRule"],
    statementOfConformity: "",
    authorisedBy: { name: actor.name, role: roleLabels[actor.role] },
    authorisedAt: ident.issuedAt.toISOString(),
    flags: { measurementOnlyCaution: measurementOnlyCaution(spec) },
  };
  data.statementOfConformity = batchStatementOfConformity(data);
  return data;
}

export function listBatchCertificates(db: Db, workshopId: string, batchId: string, baseUrl: string): BatchCertificateSummary[] {
  const b = findBatch(db, workshopId, batchId);
  const rows = db.select().from(batchCertificate).where(and(eq(batchCertificate.workshopId, workshopId), eq(batchCertificate.batchId, b.id))).orderBy(desc(batchCertificate.issuedAt)).all();
  const bases = summaryBases(db, rows, baseUrl);
  return rows.map((r) => {
    const data = JSON.parse(r.canonical) as BatchCertificateData;
    const base = bases.get(r.id)!;
    return { ...base, units: data.units.length, concessions: data.units.filter((u) => u.concession).length, excluded: data.excluded.length, state: base.withdrawn ? "withdrawn" : "current" };
  });
}

/** Issues, signs, stores and mails a batch certificate. */
export async function issueBatchCertificate(deps: CertificateDeps, actor: Issuer, batchId: string, input: IssueBatchCertificateInput): Promise<BatchCertificateSummary> {
  const { db } = deps;
  const b = findBatch(db, actor.workshopId, batchId);
  const w = profileOf(db, actor.workshopId);
  const id = randomUUID();
  await issueSigned(
    deps,
    actor.workshopId,
    w.prefix,
    id,
    (ident) => buildBatchData(deps, actor, b.id, input, ident),
    renderBatchCertificatePdf,
    (data) => data,
    (tx, data, s) => {
      tx.insert(batchCertificate)
        .values({ id, workshopId: actor.workshopId, batchId: b.id, number: s.number, verificationCode: s.code, recipientEmail: input.recipientEmail, recipientName: input.recipientName ?? null, issuedBy: actor.userId, issuedAt: s.issuedAt, canonical: s.canonical, signature: s.signature, pdfSha256: s.pdfSha256, pdfKey: s.pdfKey })
        .run();
      audit(tx, actor, "batch.certificate.issue", "batch", b.id, { after: { certificateId: id, number: s.number, units: data.units.length, concessions: data.units.filter((u) => u.concession).length, excluded: data.excluded.length, pdfSha256: s.pdfSha256 } });
    },
  );
  await sendCertificateMail(deps, { kind: "batch", row: db.select().from(batchCertificate).where(eq(batchCertificate.id, id)).get()! });
  return listBatchCertificates(db, actor.workshopId, b.id, deps.baseUrl).find((c) => c.id === id)!;
}
