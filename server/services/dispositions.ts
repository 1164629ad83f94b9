/**
 * QA's dispositions: a decision on a unit that is not within tolerance, with its reason. A unit has
 * at most one standing disposition on its latest evaluation; correcting it means superseding it (a
 * new disposition that points at the old one, with its own reason), allowed until the batch is
 * released. Every write appends a disposition row, its hash-chain entry and an audit entry.
 */
import { randomUUID } from "node:crypto";
import { and, eq, inArray } from "drizzle-orm";
import { dispositionLabels, type DispositionDecision } from "../../shared/schemas/batch.ts";
import type { UnitDetail } from "../../shared/schemas/strike.ts";
import type { Db, Sqlite } from "../db/client.ts";
import { batch, disposition, unit } from "../db/schema.ts";
import { badRequest, conflict, notFound } from "../http-error.ts";
import { audit, type Actor } from "./audit.ts";
import { findBatch, getBatch, latestEvaluations, standingDispositions } from "./batches.ts";
import { appendToChain } from "./ledger-chain.ts";
import { findUnit, getUnit } from "./strikes.ts";

type Decision = { decision: DispositionDecision; reason: string };

const day = (d: Date) => d.toISOString().slice(0, 16).replace("T", " ") + " UTC";

function assertOpen(b: typeof batch.$inferSelect) {
  if (b.state === "released") throw conflict(`Batch ${b.code} is released; dispositions can no longer change.`);
}

/** Appends one disposition with its chain and audit entries; call inside a transaction. */
function append(db: Db, sqlite: Sqlite, actor: Actor, unitId: string, evaluationId: string, input: Decision, supersedesId: string | null) {
  const id = randomUUID();
  db.insert(disposition).values({ id, workshopId: actor.workshopId, unitId, evaluationId, decision: input.decision, reason: input.reason, decidedBy: actor.userId, supersedesId }).run();
  appendToChain(sqlite, actor.workshopId, "disposition", id);
  audit(db, actor, supersedesId ? "unit.disposition.supersede" : "unit.disposition", "unit", unitId, {
    after: { dispositionId: id, decision: input.decision, reason: input.reason, evaluationId, supersedes: supersedesId },
  });
  return id;
}

/** Why each unit may not get a first disposition now, by unit id (absent: it may). */
function refusals(db: Db, units: { id: string; serial: string }[]) {
  const ids = units.map((u) => u.id);
  const evals = latestEvaluations(db, ids);
  const standing = standingDispositions(db, ids, evals);
  const out = new Map<string, string>();
  for (const u of units) {
    const ev = evals.get(u.id);
    const d = standing.get(u.id);
    if (!ev) out.set(u.id, `${u.serial} has no evaluation yet; measure it first`);
    else if (ev.verdict === "within_tolerance") out.set(u.id, `${u.serial} is within tolerance; a disposition is only for units out of tolerance or inconclusive`);
    else if (d) out.set(u.id, `${u.serial} already has a standing disposition (${dispositionLabels[d.decision]}, ${day(d.at)}); supersede it with a reason instead`);
  }
  return { evals, out };
}

export function recordDisposition(db: Db, sqlite: Sqlite, actor: Actor, unitId: string, input: Decision): UnitDetail {
  const u = findUnit(db, actor.workshopId, unitId);
  assertOpen(findBatch(db, actor.workshopId, u.batchId));
  db.transaction((tx) => {
    const { evals, out } = refusals(tx as unknown as Db, [u]);
    const refused = out.get(u.id);
    if (refused) throw conflict(`Unit ${refused}.`);
    append(tx as unknown as Db, sqlite, actor, u.id, evals.get(u.id)!.id, input, null);
  });
  return getUnit(db, actor.workshopId, unitId);
}

/**
 * Replaces the standing disposition with a new one for the same evaluation. Refused once the batch
 * is released, for a disposition already superseded, and for one no longer standing (made on an
 * earlier evaluation: record a new disposition instead).
 */
export function supersedeDisposition(db: Db, sqlite: Sqlite, actor: Actor, dispositionId: string, input: Decision): UnitDetail {
  const old = db.select().from(disposition).where(and(eq(disposition.id, dispositionId), eq(disposition.workshopId, actor.workshopId))).get();
  if (!old) throw notFound("That disposition");
  const u = findUnit(db, actor.workshopId, old.unitId);
  assertOpen(findBatch(db, actor.workshopId, u.batchId));
  db.transaction((tx) => {
    const t = tx as unknown as Db;
    const later = t.select({ id: disposition.id, at: disposition.createdAt }).from(disposition).where(eq(disposition.supersedesId, old.id)).get();
    if (later) throw conflict(`This disposition of unit ${u.serial} was already superseded on ${day(later.at)}; supersede the one that stands now.`);
    const evals = latestEvaluations(t, [u.id]);
    const standing = standingDispositions(t, [u.id], evals).get(u.id);
    if (standing?.id !== old.id) {
      throw conflict(`This disposition of unit ${u.serial} no longer stands: the unit was evaluated again since. Record a new disposition for the latest evaluation instead.`);
    }
    append(t, sqlite, actor, u.id, evals.get(u.id)!.id, input, old.id);
  });
  return getUnit(db, actor.workshopId, u.id);
}

/**
 * One disposition for several units of a batch, in one transaction with one audit entry per unit.
 * All or nothing: a unit that cannot take a first disposition refuses the whole step, named.
 */
export function recordBulkDisposition(db: Db, sqlite: Sqlite, actor: Actor, batchId: string, input: Decision & { unitIds: string[] }) {
  const b = findBatch(db, actor.workshopId, batchId);
  assertOpen(b);
  const wanted = [...new Set(input.unitIds)];
  db.transaction((tx) => {
    const t = tx as unknown as Db;
    const units = t.select({ id: unit.id, serial: unit.serial }).from(unit).where(and(eq(unit.batchId, b.id), eq(unit.workshopId, actor.workshopId), inArray(unit.id, wanted))).all();
    if (units.length !== wanted.length) throw badRequest(`${wanted.length - units.length} of the selected units are not in batch ${b.code}; reload the ledger and select again.`, { unitIds: "Units not in this batch" });
    const { evals, out } = refusals(t, units);
    if (out.size) {
      const list = [...out.values()];
      throw conflict(`Nothing was recorded: ${list.slice(0, 10).join("; ")}${list.length > 10 ? `; and ${list.length - 10} more` : ""}.`, { unitIds: `${out.size} unit${out.size === 1 ? "" : "s"} cannot take this disposition` });
    }
    for (const u of units) append(t, sqlite, actor, u.id, evals.get(u.id)!.id, input, null);
  });
  return getBatch(db, actor.workshopId, b.id);
}
