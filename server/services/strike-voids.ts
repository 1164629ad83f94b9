/**
 * Which strikes were taken out of the record. Read by the evaluation (a voided strike is never
 * evaluated), the ledger (it is counted apart) and the unit page (shown struck through).
 */
import { eq, inArray } from "drizzle-orm";
import type { EvaluationView } from "../../shared/schemas/evaluation.ts";
import type { Db } from "../db/client.ts";
import { measurement, strikeVoid, user } from "../db/schema.ts";

export type StrikeVoidRow = { id: string; strikeId: string; unitId: string; reason: string; at: Date; by: { id: string; name: string } | null; measuredAt: Date | null };

/** The voids of the units' strikes, by unit. */
export function voidsByUnit(db: Db, unitIds: string[]): Map<string, StrikeVoidRow[]> {
  const out = new Map<string, StrikeVoidRow[]>();
  if (!unitIds.length) return out;
  const rows = db
    .select({ v: strikeVoid, byName: user.name, measuredAt: measurement.createdAt })
    .from(strikeVoid)
    .leftJoin(user, eq(user.id, strikeVoid.voidedBy))
    .leftJoin(measurement, eq(measurement.strikeId, strikeVoid.strikeId))
    .where(inArray(strikeVoid.unitId, unitIds))
    .all();
  for (const { v, byName, measuredAt } of rows) {
    const row = { id: v.id, strikeId: v.strikeId, unitId: v.unitId, reason: v.reason, at: v.createdAt, by: v.voidedBy ? { id: v.voidedBy, name: byName ?? "unknown" } : null, measuredAt };
    const list = out.get(v.unitId);
    if (list) list.push(row);
    else out.set(v.unitId, [row]);
  }
  return out;
}

/**
 * True when the evaluation was made from a strike voided since. An evaluation that lists its
 * strikes is checked against the list; an older one was made from every strike analysed by then.
 */
export function usesVoidedStrike(ev: Pick<EvaluationView, "strikeIds" | "createdAt">, voids: StrikeVoidRow[]): boolean {
  if (ev.strikeIds) return voids.some((v) => ev.strikeIds!.includes(v.strikeId));
  const at = new Date(ev.createdAt).getTime();
  return voids.some((v) => v.measuredAt !== null && v.measuredAt.getTime() <= at);
}
