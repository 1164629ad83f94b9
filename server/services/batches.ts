/** Batches, their units and the ledger view (units with their latest evaluation). */
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, inArray, max } from "drizzle-orm";
import type { BatchDetail, BatchStatistics, BatchSummary, CreateBatchInput, AddUnitsInput, LedgerRow, DispositionDecision } from "../../shared/schemas/batch.ts";
import type { EvaluationView } from "../../shared/schemas/evaluation.ts";
import type { Family } from "../../shared/schemas/spec.ts";
import { expandSerialRange, SerialRangeError } from "../../shared/serials.ts";
import type { Db, Sqlite } from "../db/client.ts";
import { batch, disposition, evaluation, specVersion, specPartial, strike, unit, user } from "../db/schema.ts";
import { badRequest, conflict, HttpError, notFound } from "../http-error.ts";
import { verdictWhy } from "../../shared/verdict-why.ts";
import { audit, type Actor } from "./audit.ts";
import { appendToChain } from "./ledger-chain.ts";
import { usesVoidedStrike, voidsByUnit } from "./strike-voids.ts";

const CLOSING_DECISIONS: DispositionDecision[] = ["use_as_is", "scrap"];

export function findBatch(db: Db, workshopId: string, batchId: string) {
  const row = db.select().from(batch).where(and(eq(batch.id, batchId), eq(batch.workshopId, workshopId))).get();
  if (!row) throw notFound("That batch");
  return row;
}

function specOf(db: Db, versionId: string) {
  const v = db.select().from(specVersion).where(eq(specVersion.id, versionId)).get()!;
  return { id: v.specId, name: v.name, version: v.version, versionId: v.id, family: v.family as Family };
}

/**
 * The latest evaluation of each unit, keyed by unit id. A unit whose latest evaluation was made
 * from a strike voided since (and that has no strike left to evaluate) has none.
 */
export function latestEvaluations(db: Db, unitIds: string[]): Map<string, EvaluationView> {
  const out = new Map<string, EvaluationView>();
  if (!unitIds.length) return out;
  const rows = db.select().from(evaluation).where(inArray(evaluation.unitId, unitIds)).orderBy(asc(evaluation.createdAt), asc(evaluation.id)).all();
  for (const r of rows) out.set(r.unitId, { ...(r.detail as EvaluationView), id: r.id, unitId: r.unitId, specVersionId: r.specVersionId, verdict: r.verdict, createdAt: r.createdAt.toISOString() });
  const voids = voidsByUnit(db, [...out.keys()]);
  for (const [unitId, list] of voids) {
    const ev = out.get(unitId);
    if (ev && usesVoidedStrike(ev, list)) out.delete(unitId);
  }
  return out;
}

/** The latest disposition of each unit (a superseding one is always the later), keyed by unit id. */
export function latestDispositions(db: Db, unitIds: string[]) {
  const out = new Map<string, { id: string; decision: DispositionDecision; reason: string; at: Date; by: string; evaluationId: string | null }>();
  if (!unitIds.length) return out;
  const rows = db
    .select({ d: disposition, by: user.name })
    .from(disposition)
    .leftJoin(user, eq(user.id, disposition.decidedBy))
    .where(inArray(disposition.unitId, unitIds))
    .orderBy(asc(disposition.createdAt))
    .all();
  for (const { d, by } of rows) out.set(d.unitId, { id: d.id, decision: d.decision, reason: d.reason, at: d.createdAt, by: by ?? "unknown", evaluationId: d.evaluationId });
  return out;
}

/**
 * The disposition that decides each unit now: the latest one, made on the unit's latest evaluation
 * (a new evaluation, after a new strike or a void, reopens the unit). Keyed by unit id.
 */
export function standingDispositions(db: Db, unitIds: string[], evals: Map<string, EvaluationView> = latestEvaluations(db, unitIds)) {
  const out = latestDispositions(db, unitIds);
  for (const [unitId, d] of out) if (d.evaluationId !== evals.get(unitId)?.id) out.delete(unitId);
  return out;
}

function ledgerRows(db: Db, batchId: string): LedgerRow[] {
  const units = db.select().from(unit).where(eq(unit.batchId, batchId)).orderBy(asc(unit.position)).all();
  const ids = units.map((u) => u.id);
  const evals = latestEvaluations(db, ids);
  const disps = standingDispositions(db, ids, evals);
  const voided = new Set([...voidsByUnit(db, ids).values()].flat().map((v) => v.strikeId));
  const all = ids.length
    ? db.select({ id: strike.id, unitId: strike.unitId, state: strike.state, at: strike.uploadedAt }).from(strike).where(inArray(strike.unitId, ids)).all()
    : [];
  const strikes = all.filter((s) => !voided.has(s.id));
  const voidedOf = new Map<string, number>();
  for (const s of all) if (voided.has(s.id)) voidedOf.set(s.unitId, (voidedOf.get(s.unitId) ?? 0) + 1);
  // Grouped once (Map.groupBy needs Node 21): the ledger is read on every poll of a bench tablet.
  const strikesOf = new Map<string, typeof strikes>();
  for (const s of strikes) {
    const list = strikesOf.get(s.unitId);
    if (list) list.push(s);
    else strikesOf.set(s.unitId, [s]);
  }
  return units.map((u) => {
    const mine = strikesOf.get(u.id) ?? [];
    const ev = evals.get(u.id) ?? null;
    const fund = ev?.requirements.find((r) => r.isFundamental) ?? ev?.requirements[0] ?? null;
    const overtone = ev?.requirements.find((r) => !r.isFundamental && r.measuredRatio != null) ?? null;
    const disp = disps.get(u.id) ?? null;
    const pending = mine.filter((s) => s.state === "queued" || s.state === "analysing").length;
    const closed = pending === 0 && ev !== null && (ev.verdict === "within_tolerance" || (disp !== null && CLOSING_DECISIONS.includes(disp.decision)));
    const lastAt = mine.reduce<Date | null>((m, s) => (!m || s.at > m ? s.at : m), null);
    return {
      id: u.id,
      serial: u.serial,
      customerName: u.customerName,
      customerEmail: u.customerEmail,
      strikes: mine.length,
      pendingStrikes: pending,
      lastMeasuredAt: lastAt?.toISOString() ?? null,
      verdict: ev?.verdict ?? null,
      fundamentalHz: fund?.measuredHz ?? null,
      temperatureCorrected: ev?.temperatureCorrected ?? false,
      deviationCents: fund?.deviationCents ?? null,
      overtoneRatio: overtone?.measuredRatio ?? null,
      t60S: fund?.t60S ?? null,
      t60ObservedDecayDb: fund?.t60ObservedDecayDb ?? null,
      t60Unreliable: fund?.t60Unreliable ?? false,
      q: fund?.q ?? null,
      disposition: disp ? { id: disp.id, decision: disp.decision, reason: disp.reason, at: disp.at.toISOString(), by: disp.by } : null,
      open: !closed,
      why: ev ? verdictWhy(ev) : [],
      voidedStrikes: voidedOf.get(u.id) ?? 0,
    };
  });
}

function summarize(db: Db, row: typeof batch.$inferSelect, rows: LedgerRow[]): BatchSummary {
  const releasedBy = row.releasedBy ? db.select({ id: user.id, name: user.name }).from(user).where(eq(user.id, row.releasedBy)).get() ?? null : null;
  return {
    id: row.id,
    code: row.code,
    state: row.state,
    quantity: row.quantity,
    units: rows.length,
    measured: rows.filter((r) => r.verdict !== null).length,
    withinTolerance: rows.filter((r) => r.verdict === "within_tolerance").length,
    outOfTolerance: rows.filter((r) => r.verdict === "out_of_tolerance").length,
    inconclusive: rows.filter((r) => r.verdict === "inconclusive").length,
    spec: specOf(db, row.specVersionId),
    createdAt: row.createdAt.toISOString(),
    releasedAt: row.releasedAt?.toISOString() ?? null,
    releasedBy,
  };
}

export function listBatches(db: Db, workshopId: string): BatchSummary[] {
  return db
    .select()
    .from(batch)
    .where(eq(batch.workshopId, workshopId))
    .orderBy(desc(batch.createdAt))
    .all()
    .map((b) => summarize(db, b, ledgerRows(db, b.id)));
}

export function getBatch(db: Db, workshopId: string, batchId: string): BatchDetail {
  const row = findBatch(db, workshopId, batchId);
  const rows = ledgerRows(db, row.id);
  const partials = db.select().from(specPartial).where(eq(specPartial.specVersionId, row.specVersionId)).orderBy(asc(specPartial.position)).all();
  const fund = partials.find((p) => p.isFundamental) ?? partials[0];
  const version = db.select({ referenceTemperatureC: specVersion.referenceTemperatureC }).from(specVersion).where(eq(specVersion.id, row.specVersionId)).get();
  return {
    ...summarize(db, row, rows),
    notes: row.notes,
    rows,
    statistics: statistics(rows),
    fundamentalToleranceCents: fund?.toleranceCents ?? null,
    minT60S: fund?.minT60S ?? null,
    referenceTemperatureC: version?.referenceTemperatureC ?? 20,
  };
}

function statistics(rows: LedgerRow[]): BatchStatistics {
  const dev = rows.map((r) => r.deviationCents).filter((d): d is number => d !== null);
  // A T60 marked unreliable is no figure of the process: left out of the batch's median.
  const t60 = rows.filter((r) => !r.t60Unreliable).map((r) => r.t60S).filter((d): d is number => d !== null).sort((a, b) => a - b);
  const mean = dev.length ? dev.reduce((a, b) => a + b, 0) / dev.length : null;
  const sd = mean !== null && dev.length > 1 ? Math.sqrt(dev.reduce((a, d) => a + (d - mean) ** 2, 0) / (dev.length - 1)) : null;
  const mid = t60.length >> 1;
  return {
    measured: rows.filter((r) => r.verdict !== null).length,
    meanDeviationCents: mean,
    sdDeviationCents: sd,
    medianT60S: t60.length ? (t60.length % 2 ? t60[mid] : (t60[mid - 1] + t60[mid]) / 2) : null,
  };
}

function serialsOf(input: { serials?: string[]; range?: { from: string; to: string } }): string[] {
  const list = [...(input.serials ?? [])];
  if (input.range) {
    try {
      list.push(...expandSerialRange(input.range.from, input.range.to));
    } catch (error) {
      if (error instanceof SerialRangeError) throw badRequest(error.message, { range: error.message });
      throw error;
    }
  }
  const dupes = list.filter((s, i) => list.indexOf(s) !== i);
  if (dupes.length) throw badRequest(`These serials are listed twice: ${[...new Set(dupes)].slice(0, 10).join(", ")}.`, { serials: "Duplicate serials" });
  return list;
}

function insertUnits(db: Db, workshopId: string, batchId: string, serials: string[], customer: { customerName?: string; customerEmail?: string }) {
  if (!serials.length) return;
  const taken = db
    .select({ serial: unit.serial })
    .from(unit)
    .where(and(eq(unit.workshopId, workshopId), inArray(unit.serial, serials)))
    .all()
    .map((u) => u.serial);
  if (taken.length) {
    throw conflict(`These serials already exist in this workshop: ${taken.slice(0, 10).join(", ")}${taken.length > 10 ? ` and ${taken.length - 10} more` : ""}.`, { serials: "Overlaps existing units" });
  }
  const [{ last }] = db.select({ last: max(unit.position) }).from(unit).where(eq(unit.batchId, batchId)).all();
  const start = (last ?? -1) + 1;
  for (let i = 0; i < serials.length; i += 500) {
    db.insert(unit)
      .values(serials.slice(i, i + 500).map((serial, j) => ({
        id: randomUUID(),
        workshopId,
        batchId,
        serial,
        position: start + i + j,
        customerName: customer.customerName || null,
        customerEmail: customer.customerEmail || null,
      })))
      .run();
  }
}

export function createBatch(db: Db, actor: Actor, input: CreateBatchInput): BatchDetail {
  const versions = db
    .select()
    .from(specVersion)
    .where(and(eq(specVersion.specId, input.specId), eq(specVersion.workshopId, actor.workshopId)))
    .orderBy(desc(specVersion.version))
    .all();
  if (!versions.length) throw badRequest("Choose a specification of this workshop.", { specId: "Unknown specification" });
  const version = input.specVersion ? versions.find((v) => v.version === input.specVersion) : versions[0];
  if (!version) throw badRequest(`The specification has no version ${input.specVersion}.`, { specVersion: "Unknown version" });
  const exists = db.select({ id: batch.id }).from(batch).where(and(eq(batch.workshopId, actor.workshopId), eq(batch.code, input.code))).get();
  if (exists) throw conflict(`A batch with code ${input.code} already exists.`, { code: "Already used" });
  const serials = input.range ? serialsOf({ range: input.range }) : [];
  if (serials.length > input.quantity) throw badRequest(`The serial range holds ${serials.length} units but the quantity is ${input.quantity}.`, { range: "More serials than the quantity" });
  const id = randomUUID();
  db.transaction((tx) => {
    tx.insert(batch).values({ id, workshopId: actor.workshopId, code: input.code, specVersionId: version.id, quantity: input.quantity, notes: input.notes, createdBy: actor.userId }).run();
    insertUnits(tx as unknown as Db, actor.workshopId, id, serials, {});
    audit(tx, actor, "batch.create", "batch", id, { after: { code: input.code, specVersionId: version.id, quantity: input.quantity, units: serials.length } });
  });
  return getBatch(db, actor.workshopId, id);
}

export function addUnits(db: Db, actor: Actor, batchId: string, input: AddUnitsInput): BatchDetail {
  const b = findBatch(db, actor.workshopId, batchId);
  if (b.state === "released") throw conflict(`Batch ${b.code} is released; units can no longer be added.`);
  const serials = serialsOf(input);
  db.transaction((tx) => {
    insertUnits(tx as unknown as Db, actor.workshopId, batchId, serials, input);
    audit(tx, actor, "batch.add_units", "batch", batchId, { after: { serials: serials.length, first: serials[0], last: serials.at(-1) } });
  });
  return getBatch(db, actor.workshopId, batchId);
}

export function markInReview(db: Db, actor: Actor, batchId: string): BatchDetail {
  const b = findBatch(db, actor.workshopId, batchId);
  if (b.state !== "open") throw conflict(`Batch ${b.code} is ${b.state.replace("_", " ")}, not open.`);
  db.transaction((tx) => {
    tx.update(batch).set({ state: "in_review" }).where(eq(batch.id, batchId)).run();
    audit(tx, actor, "batch.review", "batch", batchId, { before: { state: b.state }, after: { state: "in_review" } });
  });
  return getBatch(db, actor.workshopId, batchId);
}

export function releaseBatch(db: Db, sqlite: Sqlite, actor: Actor, batchId: string): BatchDetail {
  const b = findBatch(db, actor.workshopId, batchId);
  if (b.state === "released") throw conflict(`Batch ${b.code} was already released.`);
  const rows = ledgerRows(db, batchId);
  if (!rows.length) throw conflict(`Batch ${b.code} has no units to release.`);
  const open = rows.filter((r) => r.open);
  if (open.length) {
    const list = open.slice(0, 20).map((r) => `${r.serial} (${r.verdict ? r.verdict.replaceAll("_", " ") + ", no disposition" : r.pendingStrikes ? "analysis pending" : "not measured"})`);
    throw new HttpError(409, "conflict", `${open.length} unit${open.length > 1 ? "s are" : " is"} still open: ${list.join(", ")}${open.length > 20 ? ", …" : ""}. Measure them, or record a disposition, before release.`);
  }
  db.transaction((tx) => {
    tx.update(batch).set({ state: "released", releasedBy: actor.userId, releasedAt: new Date() }).where(eq(batch.id, batchId)).run();
    appendToChain(sqlite, actor.workshopId, "release", batchId);
    audit(tx, actor, "batch.release", "batch", batchId, { before: { state: b.state }, after: { state: "released" } });
  });
  return getBatch(db, actor.workshopId, batchId);
}
