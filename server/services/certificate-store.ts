/**
 * Where certificates live: numbers per workshop (PREFIX-YYYY-NNNNN, one series for unit and batch
 * certificates), PDF files keyed by certificate id under DATA_DIR/certificates/<workshop>/, and the
 * row and its file written together, so a failure between them leaves neither behind.
 */
import { randomUUID } from "node:crypto";
import { mkdirSync, readdirSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { and, eq, inArray, like, max } from "drizzle-orm";
import type { Db } from "../db/client.ts";
import { batchCertificate, certificate, certificateWithdrawal, user } from "../db/schema.ts";
import { certificateNumber } from "../../shared/schemas/certificate.ts";
import { conflict, notFound } from "../http-error.ts";

export function pdfPath(dataDir: string, key: string): string {
  const root = path.join(dataDir, "certificates");
  const p = path.resolve(root, key);
  if (!p.startsWith(root + path.sep)) throw new Error(`certificate key escapes the store: ${key}`);
  return p;
}

/** The key of a new certificate's PDF: by id, never by number (numbers are the workshop's own). */
export const pdfKeyOf = (workshopId: string, certificateId: string) => `${workshopId}/${certificateId}.pdf`;

/** Removes half-written PDFs (`*.part`) a crash may have left between writing and committing. */
export function sweepCertificateParts(dataDir: string): number {
  const root = path.join(dataDir, "certificates");
  let removed = 0;
  let dirs: string[] = [];
  try {
    dirs = readdirSync(root);
  } catch {
    return 0;
  }
  for (const d of dirs) {
    const dir = path.join(root, d);
    if (!statSync(dir).isDirectory()) continue;
    for (const f of readdirSync(dir)) {
      if (f.endsWith(".part")) {
        rmSync(path.join(dir, f), { force: true });
        removed++;
      }
    }
  }
  return removed;
}

// Issuing takes the next number, renders and stores: one at a time per workshop, so two issues at
// once cannot take the same number (the unique index would refuse the second).
const queues = new Map<string, Promise<unknown>>();

export function withWorkshopNumbering<T>(workshopId: string, work: () => Promise<T>): Promise<T> {
  const before = queues.get(workshopId) ?? Promise.resolve();
  const run = before.then(work, work);
  const settled = run.then(
    () => undefined,
    () => undefined,
  );
  queues.set(workshopId, settled);
  void settled.then(() => {
    if (queues.get(workshopId) === settled) queues.delete(workshopId);
  });
  return run;
}

/** The next number in the workshop's series for this year: PREFIX-YYYY-NNNNN, unit and batch certificates together. */
export function nextNumber(db: Db, workshopId: string, prefix: string, at: Date): string {
  const stem = `${prefix}-${at.getUTCFullYear()}-`;
  const last = [certificate, batchCertificate]
    .map((t) => db.select({ last: max(t.number) }).from(t).where(and(eq(t.workshopId, workshopId), like(t.number, `${stem}%`))).get()?.last ?? null)
    .filter((n): n is string => n !== null && /^\d+$/.test(n.slice(stem.length)))
    .map((n) => Number(n.slice(stem.length)));
  const n = last.length ? Math.max(...last) + 1 : 1;
  return certificateNumber(prefix, at.getUTCFullYear(), n);
}

/**
 * Writes the PDF beside its final place, then in one transaction inserts the row (and whatever
 * goes with it) and moves the file into place. A failure anywhere removes the file again, so a
 * retry starts clean; the key is the new certificate's id, so it never meets an older file.
 */
export function storeWithRow(db: Db, dataDir: string, key: string, pdf: Buffer, number: string, insert: (tx: Db) => void): void {
  const final = pdfPath(dataDir, key);
  const part = `${final}.${randomUUID()}.part`;
  mkdirSync(path.dirname(final), { recursive: true });
  writeFileSync(part, pdf, { flag: "wx" });
  try {
    db.transaction((tx) => {
      insert(tx as unknown as Db);
      renameSync(part, final);
    });
  } catch (error) {
    rmSync(part, { force: true });
    rmSync(final, { force: true });
    if ((error as { code?: string }).code === "SQLITE_CONSTRAINT_UNIQUE" && /number/.test(String((error as Error).message))) {
      throw conflict(`Another certificate took number ${number} at the same moment; issue again.`);
    }
    throw error;
  }
}

export type UnitCertificateRow = typeof certificate.$inferSelect;
export type BatchCertificateRow = typeof batchCertificate.$inferSelect;
export type AnyCertificate = { kind: "unit"; row: UnitCertificateRow } | { kind: "batch"; row: BatchCertificateRow };

/** A unit or batch certificate of the workshop by its number; 404 for another workshop's. */
export function findAnyCertificate(db: Db, workshopId: string, number: string): AnyCertificate {
  const unitRow = db.select().from(certificate).where(and(eq(certificate.workshopId, workshopId), eq(certificate.number, number))).get();
  if (unitRow) return { kind: "unit", row: unitRow };
  const batchRow = db.select().from(batchCertificate).where(and(eq(batchCertificate.workshopId, workshopId), eq(batchCertificate.number, number))).get();
  if (batchRow) return { kind: "batch", row: batchRow };
  throw notFound("That certificate");
}

/** Any certificate by its public verification code (not scoped: the code is the secret). */
export function findByVerificationCode(db: Db, code: string): AnyCertificate | null {
  const unitRow = db.select().from(certificate).where(eq(certificate.verificationCode, code)).get();
  if (unitRow) return { kind: "unit", row: unitRow };
  const batchRow = db.select().from(batchCertificate).where(eq(batchCertificate.verificationCode, code)).get();
  return batchRow ? { kind: "batch", row: batchRow } : null;
}

export type Withdrawal = { id: string; at: Date; reason: string; by: { id: string; name: string } | null };

/** The withdrawal of each certificate id that has one. */
export function withdrawalsOf(db: Db, certificateIds: string[]): Map<string, Withdrawal> {
  const out = new Map<string, Withdrawal>();
  if (!certificateIds.length) return out;
  const rows = db
    .select({ w: certificateWithdrawal, name: user.name })
    .from(certificateWithdrawal)
    .leftJoin(user, eq(user.id, certificateWithdrawal.withdrawnBy))
    .where(inArray(certificateWithdrawal.certificateId, certificateIds))
    .all();
  for (const { w, name } of rows) out.set(w.certificateId, { id: w.id, at: w.createdAt, reason: w.reason, by: w.withdrawnBy ? { id: w.withdrawnBy, name: name ?? "unknown" } : null });
  return out;
}
