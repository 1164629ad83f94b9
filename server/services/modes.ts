/**
 * Modes of a design: storing predicted mode lists on a spec version, and the mode map that joins
 * them with the measured partials of a batch (or of every batch of the specification). The maths
 * is pure and lives in shared/ (mode-import, mode-matching, mode-measurements, mode-map, beam).
 */
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { temperatureCorrect } from "../../shared/evaluation.ts";
import { describeLineError, type ImportedMode, type LineError } from "../../shared/mode-import.ts";
import { buildModeMap, geometryEstimate, type ModelInput } from "../../shared/mode-map.ts";
import { measuredModes, type PartialObservation, type StrikeObservation } from "../../shared/mode-measurements.ts";
import { modelConditionLabels, type ModeKind, type ModeList, type ModeMap, type ModeMapQuery, type ModelCondition } from "../../shared/schemas/modes.ts";
import type { Support } from "../../shared/schemas/spec.ts";
import { supports } from "../../shared/schemas/spec.ts";
import type { Db } from "../db/client.ts";
import { batch, measurement, modeList, partial, predictedMode, spec, specPartial, specVersion, strike, unit, user } from "../db/schema.ts";
import { badRequest, notFound } from "../http-error.ts";
import { audit, type Actor } from "./audit.ts";
import { findBatch } from "./batches.ts";

/** The spec version within the spec and the workshop, or 404. */
export function findSpecVersion(db: Db, workshopId: string, specId: string, versionId: string) {
  const row = db
    .select({ v: specVersion })
    .from(specVersion)
    .innerJoin(spec, eq(spec.id, specVersion.specId))
    .where(and(eq(specVersion.id, versionId), eq(specVersion.specId, specId), eq(spec.workshopId, workshopId)))
    .get();
  if (!row) throw notFound("That specification version");
  return row.v;
}

export function findSpec(db: Db, workshopId: string, specId: string) {
  const row = db.select().from(spec).where(and(eq(spec.id, specId), eq(spec.workshopId, workshopId))).get();
  if (!row) throw notFound("That specification");
  return row;
}

/**
 * Import problems as the API's 400: the message lists the first few, `fields` all of them, keyed
 * "line 7" for a file and "modes.6" (the seventh item) for a JSON body.
 */
export function importProblems(errors: LineError[], unit: "line" | "item" = "line") {
  const fields: Record<string, string> = {};
  for (const e of errors) fields[unit === "line" ? `line ${e.line}` : `modes.${e.line - 1}`] ??= e.message;
  const say = (e: LineError) => (unit === "line" ? describeLineError(e) : `Item ${e.line}: ${e.message}`);
  const shown = errors.slice(0, 5).map(say).join(" ");
  const more = errors.length > 5 ? ` …and ${errors.length - 5} more.` : "";
  return badRequest(`The mode list has ${errors.length === 1 ? "a problem" : `${errors.length} problems`}; nothing was imported. ${shown}${more} Correct the ${unit === "line" ? "file (or the column mapping)" : "list"} and send it again.`, fields);
}

export type ModeListImport = {
  name: string;
  condition: ModelCondition;
  youngsModulusGPa: number | null;
  densityKgM3: number | null;
  sourceName: string | null;
  modes: ImportedMode[];
};

/**
 * Stores the imported modes as one list per condition (rows may name their own condition) in one
 * transaction, so a failure leaves nothing behind.
 */
export function importModeLists(db: Db, actor: Actor, specId: string, versionId: string, input: ModeListImport): ModeList[] {
  const version = findSpecVersion(db, actor.workshopId, specId, versionId);
  const byCondition = new Map<ModelCondition, ImportedMode[]>();
  for (const m of input.modes) {
    const c = m.condition ?? input.condition;
    byCondition.set(c, [...(byCondition.get(c) ?? []), m]);
  }
  const ids: string[] = [];
  db.transaction((tx) => {
    for (const [condition, modes] of byCondition) {
      const id = randomUUID();
      ids.push(id);
      const name = input.name || (byCondition.size > 1 || !input.sourceName ? `${modelConditionLabels[condition].split(" ")[0]} model` : input.sourceName.replace(/\.[a-z0-9]+$/i, ""));
      tx.insert(modeList)
        .values({ id, workshopId: actor.workshopId, specVersionId: version.id, condition, name: name.slice(0, 120), sourceName: input.sourceName?.slice(0, 255) ?? null, youngsModulusGPa: input.youngsModulusGPa, densityKgM3: input.densityKgM3, createdBy: actor.userId })
        .run();
      for (let i = 0; i < modes.length; i += 300) {
        tx.insert(predictedMode)
          .values(modes.slice(i, i + 300).map((m) => ({ listId: id, mode: m.mode, frequencyHz: m.frequencyHz, label: m.label, kind: m.kind })))
          .run();
      }
      audit(tx, actor, "modes.import", "spec_version", version.id, { after: { listId: id, condition, modes: modes.length, sourceName: input.sourceName, youngsModulusGPa: input.youngsModulusGPa, densityKgM3: input.densityKgM3 } });
    }
  });
  return ids.map((id) => readList(db, id)!);
}

function readList(db: Db, listId: string): ModeList | null {
  const row = db
    .select({ l: modeList, v: { specId: specVersion.specId, version: specVersion.version }, by: { id: user.id, name: user.name } })
    .from(modeList)
    .innerJoin(specVersion, eq(specVersion.id, modeList.specVersionId))
    .leftJoin(user, eq(user.id, modeList.createdBy))
    .where(eq(modeList.id, listId))
    .get();
  if (!row) return null;
  const modes = db.select().from(predictedMode).where(eq(predictedMode.listId, listId)).orderBy(asc(predictedMode.mode)).all();
  return {
    id: row.l.id,
    specId: row.v.specId,
    specVersionId: row.l.specVersionId,
    version: row.v.version,
    condition: row.l.condition,
    name: row.l.name,
    sourceName: row.l.sourceName,
    youngsModulusGPa: row.l.youngsModulusGPa,
    densityKgM3: row.l.densityKgM3,
    createdAt: row.l.createdAt.toISOString(),
    createdBy: row.by?.id ? { id: row.by.id, name: row.by.name } : null,
    modes: modes.map((m) => ({ mode: m.mode, frequencyHz: m.frequencyHz, label: m.label, kind: (m.kind as ModeKind | null) ?? null })),
  };
}

/** Every list of a spec version, newest first. */
export function listModeLists(db: Db, workshopId: string, specId: string, versionId: string): ModeList[] {
  const version = findSpecVersion(db, workshopId, specId, versionId);
  return db
    .select({ id: modeList.id })
    .from(modeList)
    .where(eq(modeList.specVersionId, version.id))
    .orderBy(desc(modeList.createdAt), desc(modeList.id))
    .all()
    .map((r) => readList(db, r.id)!);
}

/**
 * The lists in force for a spec version: per condition, the newest list of that version or, when it
 * has none, of the nearest earlier version (a new version of the tolerances keeps the design's model).
 */
function listsInForce(db: Db, specId: string, upToVersion: number): ModeList[] {
  const rows = db
    .select({ id: modeList.id, condition: modeList.condition, version: specVersion.version, at: modeList.createdAt })
    .from(modeList)
    .innerJoin(specVersion, eq(specVersion.id, modeList.specVersionId))
    .where(eq(specVersion.specId, specId))
    .all()
    .filter((r) => r.version <= upToVersion)
    .sort((a, b) => b.version - a.version || b.at.getTime() - a.at.getTime() || b.id.localeCompare(a.id));
  const chosen = new Map<string, string>();
  for (const r of rows) if (!chosen.has(r.condition)) chosen.set(r.condition, r.id);
  return ["free", "held"].flatMap((c) => (chosen.has(c) ? [readList(db, chosen.get(c)!)!] : []));
}

const chunks = <T>(xs: T[], n = 500) => Array.from({ length: Math.ceil(xs.length / n) }, (_, i) => xs.slice(i * n, (i + 1) * n));

/** The mode map of a specification over one batch (or every batch made under it), optionally a set of its units. */
export function getModeMap(db: Db, workshopId: string, specId: string, q: ModeMapQuery): ModeMap {
  const s = findSpec(db, workshopId, specId);
  const versions = db.select().from(specVersion).where(eq(specVersion.specId, s.id)).orderBy(desc(specVersion.version)).all();
  const versionById = new Map(versions.map((v) => [v.id, v]));
  let scopeBatch: typeof batch.$inferSelect | null = null;
  if (q.batch) {
    scopeBatch = findBatch(db, workshopId, q.batch);
    if (!versionById.has(scopeBatch.specVersionId)) {
      throw badRequest(`Batch ${scopeBatch.code} is made under another specification; choose one of this specification's batches.`, { batch: "Not a batch of this specification" });
    }
  }
  const scopeVersion = scopeBatch ? versionById.get(scopeBatch.specVersionId)! : versions[0];
  const batches = scopeBatch ? [scopeBatch] : db.select().from(batch).where(and(eq(batch.workshopId, workshopId), inArray(batch.specVersionId, versions.map((v) => v.id)))).all();
  const batchById = new Map(batches.map((b) => [b.id, b]));
  let units = batches.length ? db.select().from(unit).where(inArray(unit.batchId, batches.map((b) => b.id))).orderBy(asc(unit.position)).all() : [];
  if (q.units.length) {
    const wanted = new Set(q.units);
    const found = units.filter((u) => wanted.has(u.id));
    if (found.length !== wanted.size) throw notFound(scopeBatch ? `Some of those units are not in batch ${scopeBatch.code}; they` : "Some of those units");
    units = found;
  }

  // Every analysed strike of those units and its partials, at the reference temperature of the
  // version each unit's batch was made under.
  const unitIds = units.map((u) => u.id);
  const strikeRows = chunks(unitIds).flatMap((ids) =>
    db.select({ id: strike.id, unitId: strike.unitId, support: strike.support, temperatureC: strike.temperatureC }).from(strike).where(and(inArray(strike.unitId, ids), eq(strike.state, "done"))).all(),
  );
  const partialRows = chunks(strikeRows.map((r) => r.id)).flatMap((ids) =>
    db
      .select({ strikeId: measurement.strikeId, segment: partial.segment, f: partial.frequencyHz, uF: partial.frequencyUncertaintyHz, tau: partial.tauS, uTau: partial.tauUncertaintyS, unreliable: partial.tauUnreliable })
      .from(partial)
      .innerJoin(measurement, eq(measurement.id, partial.measurementId))
      .where(inArray(measurement.strikeId, ids))
      .all(),
  );
  const unitById = new Map(units.map((u) => [u.id, u]));
  const strikeById = new Map(strikeRows.map((r) => [r.id, r]));
  const supportOf = (v: string | null): Support | null => ((supports as readonly string[]).includes(v ?? "") ? (v as Support) : null);
  const segments = new Map<string, StrikeObservation>();
  for (const r of strikeRows) segments.set(`${r.id}#0`, { unitId: r.unitId, strikeId: r.id, segment: 0, support: supportOf(r.support) });
  const observations: PartialObservation[] = partialRows.map((p) => {
    const st = strikeById.get(p.strikeId)!;
    const v = versionById.get(batchById.get(unitById.get(st.unitId)!.batchId)!.specVersionId)!;
    const key = `${st.id}#${p.segment}`;
    if (!segments.has(key)) segments.set(key, { unitId: st.unitId, strikeId: st.id, segment: p.segment, support: supportOf(st.support) });
    const factor = temperatureCorrect(1, st.temperatureC, v);
    return {
      unitId: st.unitId,
      strikeId: st.id,
      segment: p.segment,
      support: supportOf(st.support),
      frequencyHz: p.f * factor,
      frequencyUncertaintyHz: p.uF * factor,
      tauS: p.tau,
      tauUncertaintyS: p.uTau,
      tauReliable: !p.unreliable,
    };
  });
  const measured = measuredModes([...segments.values()], observations);

  const models: ModelInput[] = listsInForce(db, s.id, scopeVersion.version);
  const map = buildModeMap(models, measured);

  const fundamental = db.select().from(specPartial).where(and(eq(specPartial.specVersionId, scopeVersion.id), eq(specPartial.isFundamental, true))).get();
  const geometry = geometryEstimate(q, scopeVersion.family, fundamental?.targetHz ?? null, map.measuredModes);
  const useGeometry = map.youngsModulusSource === null && geometry !== null;

  const supportsByUnit = new Map<string, Set<Support>>();
  for (const r of strikeRows) {
    const sp = supportOf(r.support);
    if (sp) supportsByUnit.set(r.unitId, (supportsByUnit.get(r.unitId) ?? new Set()).add(sp));
  }
  const strikes = { hand: 0, suspended: 0, stand: 0, other: 0, unknown: 0 } as ModeMap["scope"]["strikes"];
  for (const r of strikeRows) strikes[supportOf(r.support) ?? "unknown"]++;
  return {
    ...map,
    youngsModulusGPa: useGeometry ? geometry.youngsModulusGPa : map.youngsModulusGPa,
    youngsModulusUncertaintyGPa: useGeometry ? geometry.youngsModulusUncertaintyGPa : map.youngsModulusUncertaintyGPa,
    youngsModulusSource: useGeometry ? "geometry" : map.youngsModulusSource,
    models: models.map(({ modes: _modes, ...l }) => l),
    geometry,
    scope: {
      batch: scopeBatch ? { id: scopeBatch.id, code: scopeBatch.code } : null,
      specVersion: scopeVersion.version,
      units: units.map((u) => ({ id: u.id, serial: u.serial, batchCode: batchById.get(u.batchId)!.code, supports: [...(supportsByUnit.get(u.id) ?? [])] })),
      unitsMeasured: new Set(strikeRows.map((r) => r.unitId)).size,
      unitsBothWays: [...supportsByUnit.values()].filter((set) => set.has("suspended") && (set.has("hand") || set.has("stand"))).length,
      strikes,
      referenceTemperatureC: scopeVersion.referenceTemperatureC,
    },
  };
}
