/** Specifications and their immutable versions. */
import { randomUUID } from "node:crypto";
import { and, asc, count, desc, eq, inArray } from "drizzle-orm";
import type { Family, SpecDetail, SpecInput, SpecSummary, SpecVersion, TargetKind } from "../../shared/schemas/spec.ts";
import type { ToleranceUnit } from "../../shared/tuning.ts";
import type { Db } from "../db/client.ts";
import { batch, spec, specPartial, specVersion, user } from "../db/schema.ts";
import { notFound } from "../http-error.ts";
import { audit, type Actor } from "./audit.ts";

type VersionRow = typeof specVersion.$inferSelect;

function toVersion(db: Db, row: VersionRow, createdBy: { id: string; name: string } | null): SpecVersion {
  const partials = db.select().from(specPartial).where(eq(specPartial.specVersionId, row.id)).orderBy(asc(specPartial.position)).all();
  return {
    id: row.id,
    specId: row.specId,
    version: row.version,
    createdAt: row.createdAt.toISOString(),
    createdBy,
    name: row.name,
    family: row.family as Family,
    description: row.description,
    referenceTemperatureC: row.referenceTemperatureC,
    tempCoefficientPerC: row.tempCoefficientPerC,
    decisionRule: row.decisionRule as SpecInput["decisionRule"],
    strikesRequired: row.strikesRequired,
    lengthMm: row.lengthMm,
    referencePitchHz: row.referencePitchHz,
    changeNote: row.changeNote,
    partials: partials.map((p) => ({
      label: p.label,
      isFundamental: p.isFundamental,
      targetKind: p.targetKind as TargetKind,
      targetHz: p.targetHz,
      targetNote: p.targetNote,
      ratio: p.ratio,
      toleranceCents: p.toleranceCents,
      toleranceUnit: p.toleranceUnit as ToleranceUnit,
      // Versions written before tolerances could be given in Hz or ppm hold cents only.
      toleranceValue: p.toleranceValue ?? p.toleranceCents,
      minT60S: p.minT60S,
      minQ: p.minQ,
      maxBeatHz: p.maxBeatHz,
      required: p.required,
    })),
  };
}

/** A spec version by id, within the workshop (null when it is another workshop's). */
export function getSpecVersion(db: Db, workshopId: string, versionId: string): SpecVersion | null {
  const row = db.select().from(specVersion).where(and(eq(specVersion.id, versionId), eq(specVersion.workshopId, workshopId))).get();
  if (!row) return null;
  const by = row.createdBy ? db.select({ id: user.id, name: user.name }).from(user).where(eq(user.id, row.createdBy)).get() ?? null : null;
  return toVersion(db, row, by);
}

function insertVersion(db: Db, specId: string, workshopId: string, version: number, input: SpecInput, userId: string | null): string {
  const id = randomUUID();
  db.insert(specVersion)
    .values({
      id,
      specId,
      workshopId,
      version,
      name: input.name,
      family: input.family,
      description: input.description,
      referenceTemperatureC: input.referenceTemperatureC,
      tempCoefficientPerC: input.tempCoefficientPerC,
      decisionRule: input.decisionRule,
      strikesRequired: input.strikesRequired,
      lengthMm: input.lengthMm,
      referencePitchHz: input.referencePitchHz,
      changeNote: input.changeNote,
      createdBy: userId,
    })
    .run();
  db.insert(specPartial)
    .values(input.partials.map((p, position) => ({ id: randomUUID(), specVersionId: id, position, ...p })))
    .run();
  return id;
}

export function listSpecs(db: Db, workshopId: string): SpecSummary[] {
  const specs = db.select({ id: spec.id }).from(spec).where(eq(spec.workshopId, workshopId)).all();
  return specs
    .map((s) => summary(db, s.id))
    .filter((s): s is SpecSummary => s !== null)
    .sort((a, b) => a.name.localeCompare(b.name));
}

function summary(db: Db, specId: string): SpecSummary | null {
  const latest = db.select().from(specVersion).where(eq(specVersion.specId, specId)).orderBy(desc(specVersion.version)).limit(1).get();
  if (!latest) return null;
  const versionIds = db.select({ id: specVersion.id }).from(specVersion).where(eq(specVersion.specId, specId)).all().map((v) => v.id);
  const [{ n }] = db.select({ n: count() }).from(batch).where(inArray(batch.specVersionId, versionIds)).all();
  return {
    id: specId,
    name: latest.name,
    family: latest.family as Family,
    currentVersion: latest.version,
    currentVersionId: latest.id,
    updatedAt: latest.createdAt.toISOString(),
    batches: n,
  };
}

export function getSpec(db: Db, workshopId: string, specId: string): SpecDetail {
  const row = db.select().from(spec).where(and(eq(spec.id, specId), eq(spec.workshopId, workshopId))).get();
  const s = row && summary(db, row.id);
  if (!s) throw notFound("That specification");
  const versions = db
    .select({ v: specVersion, by: { id: user.id, name: user.name } })
    .from(specVersion)
    .leftJoin(user, eq(user.id, specVersion.createdBy))
    .where(eq(specVersion.specId, specId))
    .orderBy(desc(specVersion.version))
    .all()
    .map(({ v, by }) => toVersion(db, v, by?.id ? by : null));
  return { ...s, versions };
}

export function createSpec(db: Db, actor: Actor, input: SpecInput): SpecDetail {
  const id = randomUUID();
  db.transaction((tx) => {
    tx.insert(spec).values({ id, workshopId: actor.workshopId }).run();
    const versionId = insertVersion(tx as unknown as Db, id, actor.workshopId, 1, input, actor.userId);
    audit(tx, actor, "spec.create", "spec", id, { after: { version: 1, versionId, name: input.name } });
  });
  return getSpec(db, actor.workshopId, id);
}

/** Editing a spec appends a version; batches keep the version they were made under. */
export function addSpecVersion(db: Db, actor: Actor, specId: string, input: SpecInput): SpecDetail {
  const current = getSpec(db, actor.workshopId, specId);
  db.transaction((tx) => {
    const version = current.currentVersion + 1;
    const versionId = insertVersion(tx as unknown as Db, specId, actor.workshopId, version, input, actor.userId);
    audit(tx, actor, "spec.version", "spec", specId, { before: { version: current.currentVersion }, after: { version, versionId, changeNote: input.changeNote } });
  });
  return getSpec(db, actor.workshopId, specId);
}
