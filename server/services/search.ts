/**
 * Search across one workshop: unit serials, batch codes, certificate numbers (unit and batch
 * certificates), and customers by name or e-mail. Every query is filtered on the workshop, so
 * another workshop's records never appear. Matching is case-insensitive substring (LIKE with the
 * wildcards of the query escaped); at most `LIMIT` results per kind, exact matches first.
 */
import { and, asc, eq, like, or, sql, type SQL } from "drizzle-orm";
import type { SearchResults } from "../../shared/schemas/corrections.ts";
import type { Db } from "../db/client.ts";
import { batch, batchCertificate, certificate, specVersion, unit } from "../db/schema.ts";
import { withdrawalsOf } from "./certificate-store.ts";

const LIMIT = 8;

/** A LIKE pattern for "contains q", with %, _ and the escape character itself taken literally. */
function contains(q: string): string {
  return `%${q.replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;
}
const ilike = (column: Parameters<typeof like>[0], pattern: string): SQL => sql`${column} LIKE ${pattern} ESCAPE '\\'`;
/** Exact (case-insensitive) matches sort first, then alphabetically. */
const exactFirst = (column: Parameters<typeof like>[0], q: string): SQL => sql`CASE WHEN lower(${column}) = lower(${q}) THEN 0 ELSE 1 END`;

export function search(db: Db, workshopId: string, q: string): SearchResults {
  const p = contains(q);
  const units = db
    .select({ id: unit.id, serial: unit.serial, batchId: batch.id, batchCode: batch.code })
    .from(unit)
    .innerJoin(batch, eq(batch.id, unit.batchId))
    .where(and(eq(unit.workshopId, workshopId), ilike(unit.serial, p)))
    .orderBy(exactFirst(unit.serial, q), asc(unit.serial))
    .limit(LIMIT)
    .all();
  const batches = db
    .select({ id: batch.id, code: batch.code, state: batch.state, specName: specVersion.name })
    .from(batch)
    .innerJoin(specVersion, eq(specVersion.id, batch.specVersionId))
    .where(and(eq(batch.workshopId, workshopId), ilike(batch.code, p)))
    .orderBy(exactFirst(batch.code, q), asc(batch.code))
    .limit(LIMIT)
    .all();
  const unitCerts = db
    .select({ id: certificate.id, number: certificate.number, unitId: certificate.unitId, serial: unit.serial, batchId: unit.batchId, supersededById: certificate.supersededById })
    .from(certificate)
    .innerJoin(unit, eq(unit.id, certificate.unitId))
    .where(and(eq(certificate.workshopId, workshopId), ilike(certificate.number, p)))
    .orderBy(exactFirst(certificate.number, q), asc(certificate.number))
    .limit(LIMIT)
    .all();
  const batchCerts = db
    .select({ id: batchCertificate.id, number: batchCertificate.number, batchId: batchCertificate.batchId, code: batch.code })
    .from(batchCertificate)
    .innerJoin(batch, eq(batch.id, batchCertificate.batchId))
    .where(and(eq(batchCertificate.workshopId, workshopId), ilike(batchCertificate.number, p)))
    .orderBy(exactFirst(batchCertificate.number, q), asc(batchCertificate.number))
    .limit(LIMIT)
    .all();
  const withdrawn = withdrawalsOf(db, [...unitCerts.map((c) => c.id), ...batchCerts.map((c) => c.id)]);
  const customers = db
    .select({ unitId: unit.id, serial: unit.serial, name: unit.customerName, email: unit.customerEmail })
    .from(unit)
    .where(and(eq(unit.workshopId, workshopId), or(ilike(unit.customerName, p), ilike(unit.customerEmail, p))))
    .orderBy(asc(unit.customerName), asc(unit.serial))
    .limit(LIMIT)
    .all();
  return {
    units,
    batches,
    certificates: [
      ...unitCerts.map((c) => ({
        number: c.number,
        kind: "unit" as const,
        unitId: c.unitId,
        batchId: c.batchId,
        label: `Unit ${c.serial}`,
        state: withdrawn.has(c.id) ? ("withdrawn" as const) : c.supersededById ? ("superseded" as const) : ("current" as const),
      })),
      ...batchCerts.map((c) => ({ number: c.number, kind: "batch" as const, unitId: null, batchId: c.batchId, label: `Batch ${c.code}`, state: withdrawn.has(c.id) ? ("withdrawn" as const) : ("current" as const) })),
    ].slice(0, LIMIT),
    customers,
  };
}
