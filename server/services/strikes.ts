/** Strikes: accepting an upload, recording its analysis, and re-evaluating the unit. */
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import type { AnalysisResult } from "../../shared/schemas/analysis.ts";
import type { EvaluationView } from "../../shared/schemas/evaluation.ts";
import type { Support, SpecVersion } from "../../shared/schemas/spec.ts";
import type { StrikeDetail, StrikeNoteReading, StrikeSummary, UnitDetail } from "../../shared/schemas/strike.ts";
import { evaluateUnit, matchStrike, SAMPLE_CLOCK_HALF_WIDTH_PPM, THERMOMETER_HALF_WIDTH_C, type EvaluationStrikeInput } from "../../shared/evaluation.ts";
import type { Db, Sqlite } from "../db/client.ts";
import { batch, disposition, evaluation, measurement, partial, strike, unit, user, workshopProfile } from "../db/schema.ts";
import { conflict, notFound } from "../http-error.ts";
import { audit, type Actor } from "./audit.ts";
import { latestEvaluations, findBatch } from "./batches.ts";
import { appendToChain } from "./ledger-chain.ts";
import { getSpecVersion } from "./specs.ts";

export function findUnit(db: Db, workshopId: string, unitId: string) {
  const row = db.select().from(unit).where(and(eq(unit.id, unitId), eq(unit.workshopId, workshopId))).get();
  if (!row) throw notFound("That unit");
  return row;
}

type StrikeRow = typeof strike.$inferSelect;

type SegmentPartials = AnalysisResult["strikes"][number]["partials"];

/**
 * What the spec makes of one strike's partials, for lists and the strike page: the spec label each
 * measured partial carries (partial index → label), and the strike note when the spec has one.
 */
function specReading(spec: SpecVersion, partials: SegmentPartials): { labels: Record<number, string>; strikeNote: StrikeNoteReading | null } {
  const labels: Record<number, string> = {};
  const match = matchStrike(spec, partials);
  match.indices.forEach((idx, req) => {
    if (idx !== null) labels[idx] = spec.partials[req].label;
  });
  const req = spec.partials.findIndex((p) => p.targetKind === "strike_note");
  const note = req >= 0 ? match.strikeNotes[req] : null;
  const strikeNote = note
    ? { label: spec.partials[req].label, frequencyHz: note.frequencyHz, uncertaintyHz: note.uncertaintyHz, targetHz: spec.partials[req].targetHz, misfitCents: note.misfitCents, members: note.members.map(({ index, harmonic, deviationCents }) => ({ index, harmonic, deviationCents })) }
    : null;
  return { labels, strikeNote };
}

/** The fundamental found in a strike (the strike note when the spec's fundamental is one), Hz. */
function fundamentalOf(spec: SpecVersion, result: AnalysisResult | null, reading: ReturnType<typeof specReading> | null): number | null {
  const partials = result?.strikes[0]?.partials;
  if (!partials?.length || !reading) return null;
  const fundamental = spec.partials.find((p) => p.isFundamental);
  if (!fundamental) return null;
  if (fundamental.targetKind === "strike_note") return reading.strikeNote?.frequencyHz ?? null;
  const idx = Object.entries(reading.labels).find(([, l]) => l === fundamental.label)?.[0];
  return idx !== undefined ? partials[Number(idx)].frequencyHz : null;
}

function toSummary(row: StrikeRow, by: { id: string; name: string } | null, fundamentalHz: number | null): StrikeSummary {
  return {
    id: row.id,
    unitId: row.unitId,
    state: row.state,
    originalName: row.originalName,
    sha256: row.sha256,
    sizeBytes: row.sizeBytes,
    uploadedAt: row.uploadedAt.toISOString(),
    uploadedBy: by,
    temperatureC: row.temperatureC,
    support: row.support as Support | null,
    failureReason: row.failureReason,
    sampleRate: row.sampleRate,
    channels: row.channels,
    durationS: row.durationS,
    fundamentalHz,
  };
}

function measurementOf(db: Db, strikeId: string) {
  return db.select().from(measurement).where(eq(measurement.strikeId, strikeId)).get() ?? null;
}

function specForUnit(db: Db, workshopId: string, u: typeof unit.$inferSelect) {
  const b = findBatch(db, workshopId, u.batchId);
  const spec = getSpecVersion(db, workshopId, b.specVersionId)!;
  return { batch: b, spec };
}

export type NewStrike = {
  unitId: string;
  originalName: string;
  sha256: string;
  fileKey: string;
  sizeBytes: number;
  format: { sampleRate: number; channels: number; bitsPerSample: number; encoding: string; durationS: number };
  temperatureC: number | null;
  support: Support | null;
};

/** Refuses a second upload of the same bytes to the same unit, naming the first. */
export function assertNotDuplicate(db: Db, unitId: string, sha256: string) {
  const existing = db.select().from(strike).where(and(eq(strike.unitId, unitId), eq(strike.sha256, sha256))).get();
  if (existing) {
    throw conflict(
      `This exact recording was already uploaded to this unit as "${existing.originalName}" on ${existing.uploadedAt.toISOString().slice(0, 16).replace("T", " ")} UTC. Strike the unit again for a new measurement.`,
      { audio: "Same file as an earlier strike" },
    );
  }
}

export function insertStrike(db: Db, actor: Actor, s: NewStrike): StrikeRow {
  const id = randomUUID();
  return db.transaction((tx) => {
    const row = tx
      .insert(strike)
      .values({ id, workshopId: actor.workshopId, unitId: s.unitId, uploadedBy: actor.userId, originalName: s.originalName, sha256: s.sha256, fileKey: s.fileKey, sizeBytes: s.sizeBytes, ...s.format, temperatureC: s.temperatureC, support: s.support, state: "queued" })
      .returning()
      .get();
    audit(tx, actor, "strike.upload", "strike", id, { after: { unitId: s.unitId, originalName: s.originalName, sha256: s.sha256 } });
    return row;
  });
}

/** Inputs of the evaluation: every analysed strike segment of the unit. */
function evaluationInputs(db: Db, unitId: string): EvaluationStrikeInput[] {
  const rows = db
    .select({ s: strike, result: measurement.result })
    .from(strike)
    .innerJoin(measurement, eq(measurement.strikeId, strike.id))
    .where(and(eq(strike.unitId, unitId), eq(strike.state, "done")))
    .orderBy(asc(strike.uploadedAt))
    .all();
  return rows.flatMap(({ s, result }) =>
    (result as AnalysisResult).strikes.map((seg, segment) => ({ strikeId: s.id, segment, temperatureC: s.temperatureC, partials: seg.partials })),
  );
}

/**
 * Records a finished analysis in one transaction: the measurement, its partials, the strike's
 * state, the unit's new evaluation and their hash-chain entries. All or nothing.
 */
export function recordAnalysis(db: Db, sqlite: Sqlite, strikeId: string, result: AnalysisResult): void {
  const s = db.select().from(strike).where(eq(strike.id, strikeId)).get();
  if (!s) return;
  const plots = result.strikes.map((seg) => seg.plot ?? null);
  const stored: AnalysisResult = { ...result, strikes: result.strikes.map(({ plot: _plot, ...seg }) => seg) };
  db.transaction((tx) => {
    if (tx.select({ id: measurement.id }).from(measurement).where(eq(measurement.strikeId, strikeId)).get()) return; // recorded already (a retry after a crash)
    const measurementId = randomUUID();
    tx.insert(measurement).values({ id: measurementId, workshopId: s.workshopId, strikeId, analyserVersion: result.analyserVersion, result: stored, plot: plots }).run();
    const partialRows = result.strikes.flatMap((seg, segment) =>
      seg.partials.map((p, position) => ({
        measurementId,
        segment,
        position,
        frequencyHz: p.frequencyHz,
        frequencyUncertaintyHz: p.frequencyUncertaintyHz,
        amplitudeDb: p.amplitudeDb,
        tauS: p.tauS,
        tauUncertaintyS: p.tauUncertaintyS,
        t60S: p.t60S,
        q: p.q,
        fitR2: p.fitR2,
        beatHz: p.beatHz,
        tauUnreliable: p.tauUnreliable,
      })),
    );
    for (let i = 0; i < partialRows.length; i += 200) tx.insert(partial).values(partialRows.slice(i, i + 200)).run();
    tx.update(strike)
      .set({ state: "done", finishedAt: new Date(), failureCode: null, failureReason: null, sampleRate: result.sampleRate, channels: result.channels, bitsPerSample: result.bitsPerSample, encoding: result.encoding, durationS: result.durationS })
      .where(eq(strike.id, strikeId))
      .run();
    appendToChain(sqlite, s.workshopId, "measurement", measurementId);
    evaluateAndRecord(tx as unknown as Db, sqlite, s.workshopId, s.unitId);
  });
}

/** Appends a new evaluation of the unit from all its analysed strikes. */
export function evaluateAndRecord(db: Db, sqlite: Sqlite, workshopId: string, unitId: string): void {
  const u = findUnit(db, workshopId, unitId);
  const { spec } = specForUnit(db, workshopId, u);
  const inputs = evaluationInputs(db, unitId);
  if (!inputs.length) return;
  const profile = db.select().from(workshopProfile).where(eq(workshopProfile.workshopId, workshopId)).get();
  const opts = { clockHalfWidthPpm: profile?.clockTolerancePpm ?? SAMPLE_CLOCK_HALF_WIDTH_PPM, thermometerHalfWidthC: profile?.thermometerToleranceC ?? THERMOMETER_HALF_WIDTH_C };
  const { labels: _labels, ...evaluated } = evaluateUnit(spec, inputs, opts);
  // The tolerances used stay with the evaluation: a later change of the profile does not rewrite history.
  const view = { ...evaluated, assumptions: opts };
  const id = randomUUID();
  db.insert(evaluation).values({ id, workshopId, unitId, specVersionId: spec.id, verdict: view.verdict, detail: view }).run();
  appendToChain(sqlite, workshopId, "evaluation", id);
  audit(db, { workshopId, userId: null }, "unit.evaluate", "unit", unitId, { after: { evaluationId: id, verdict: view.verdict } });
}

export function markFailed(db: Db, strikeId: string, code: string, reason: string): void {
  db.update(strike).set({ state: "failed", failureCode: code, failureReason: reason, finishedAt: new Date() }).where(eq(strike.id, strikeId)).run();
}

export function getStrike(db: Db, workshopId: string, strikeId: string): StrikeDetail {
  const row = db.select().from(strike).where(and(eq(strike.id, strikeId), eq(strike.workshopId, workshopId))).get();
  if (!row) throw notFound("That strike");
  const u = findUnit(db, workshopId, row.unitId);
  const { batch: b, spec } = specForUnit(db, workshopId, u);
  const m = measurementOf(db, row.id);
  const by = row.uploadedBy ? db.select({ id: user.id, name: user.name }).from(user).where(eq(user.id, row.uploadedBy)).get() ?? null : null;
  let result: AnalysisResult | null = null;
  let reading: ReturnType<typeof specReading> | null = null;
  if (m) {
    const stored = m.result as AnalysisResult;
    const plots = (m.plot ?? []) as (AnalysisResult["strikes"][number]["plot"] | null)[];
    result = { ...stored, strikes: stored.strikes.map((seg, i) => ({ ...seg, plot: plots[i] ?? undefined })) };
    reading = specReading(spec, stored.strikes[0]?.partials ?? []);
  }
  return {
    ...toSummary(row, by, fundamentalOf(spec, result, reading)),
    analyserVersion: m?.analyserVersion ?? null,
    bitsPerSample: row.bitsPerSample,
    encoding: row.encoding,
    finishedAt: row.finishedAt?.toISOString() ?? null,
    result,
    warnings: result?.warnings ?? [],
    strikes: result?.strikes.map(({ plot: _plot, ...seg }) => seg) ?? [],
    unit: { id: u.id, serial: u.serial, batchId: b.id, batchCode: b.code },
    labels: reading?.labels ?? {},
    strikeNote: reading?.strikeNote ?? null,
    referencePitchHz: spec.referencePitchHz,
  };
}

export function strikeFile(db: Db, workshopId: string, strikeId: string) {
  const row = db.select({ fileKey: strike.fileKey, originalName: strike.originalName }).from(strike).where(and(eq(strike.id, strikeId), eq(strike.workshopId, workshopId))).get();
  if (!row) throw notFound("That strike");
  return row;
}

export function getUnit(db: Db, workshopId: string, unitId: string): UnitDetail {
  const u = findUnit(db, workshopId, unitId);
  const { batch: b, spec } = specForUnit(db, workshopId, u);
  const rows = db
    .select({ s: strike, by: { id: user.id, name: user.name } })
    .from(strike)
    .leftJoin(user, eq(user.id, strike.uploadedBy))
    .where(eq(strike.unitId, unitId))
    .orderBy(desc(strike.uploadedAt))
    .all();
  const results = new Map(
    rows.length
      ? db.select({ strikeId: measurement.strikeId, result: measurement.result }).from(measurement).where(inArray(measurement.strikeId, rows.map((r) => r.s.id))).all().map((m) => [m.strikeId, m.result as AnalysisResult])
      : [],
  );
  const strikes = rows.map(({ s, by }) => {
    const result = results.get(s.id) ?? null;
    const reading = result ? specReading(spec, result.strikes[0]?.partials ?? []) : null;
    return toSummary(s, by?.id ? by : null, fundamentalOf(spec, result, reading));
  });
  const ev: EvaluationView | null = latestEvaluations(db, [unitId]).get(unitId) ?? null;
  const dispositions = db
    .select({ d: disposition, by: { id: user.id, name: user.name } })
    .from(disposition)
    .leftJoin(user, eq(user.id, disposition.decidedBy))
    .where(eq(disposition.unitId, unitId))
    .orderBy(desc(disposition.createdAt))
    .all()
    .map(({ d, by }) => ({ id: d.id, decision: d.decision, reason: d.reason, at: d.createdAt.toISOString(), by: by?.id ? by : null, evaluationId: d.evaluationId }));
  return {
    id: u.id,
    serial: u.serial,
    customerName: u.customerName,
    customerEmail: u.customerEmail,
    createdAt: u.createdAt.toISOString(),
    batch: { id: b.id, code: b.code, state: b.state },
    spec: { id: spec.specId, name: spec.name, version: spec.version, versionId: spec.id, family: spec.family, referenceTemperatureC: spec.referenceTemperatureC },
    strikes,
    evaluation: ev,
    dispositions,
    nextUnit: nextUnmeasured(db, b.id, u.id),
  };
}

/** The first unit of the batch (in order) with no strike yet, other than `exceptId`. */
export function nextUnmeasured(db: Db, batchId: string, exceptId?: string): { id: string; serial: string } | null {
  const units = db.select({ id: unit.id, serial: unit.serial }).from(unit).where(eq(unit.batchId, batchId)).orderBy(asc(unit.position)).all();
  const struck = new Set(
    units.length ? db.select({ unitId: strike.unitId }).from(strike).where(inArray(strike.unitId, units.map((u) => u.id))).all().map((s) => s.unitId) : [],
  );
  return units.find((u) => u.id !== exceptId && !struck.has(u.id)) ?? null;
}

export function recordDisposition(db: Db, sqlite: Sqlite, actor: Actor, unitId: string, input: { decision: typeof disposition.$inferInsert.decision; reason: string }) {
  const u = findUnit(db, actor.workshopId, unitId);
  const b = db.select().from(batch).where(eq(batch.id, u.batchId)).get()!;
  if (b.state === "released") throw conflict(`Batch ${b.code} is released; dispositions can no longer change.`);
  const ev = latestEvaluations(db, [unitId]).get(unitId);
  if (!ev) throw conflict(`Unit ${u.serial} has no evaluation yet; measure it first.`);
  if (ev.verdict === "within_tolerance") throw conflict(`Unit ${u.serial} is within tolerance; a disposition is only for units out of tolerance or inconclusive.`);
  const id = randomUUID();
  db.transaction((tx) => {
    tx.insert(disposition).values({ id, workshopId: actor.workshopId, unitId, evaluationId: ev.id, decision: input.decision, reason: input.reason, decidedBy: actor.userId }).run();
    appendToChain(sqlite, actor.workshopId, "disposition", id);
    audit(tx, actor, "unit.disposition", "unit", unitId, { after: { dispositionId: id, decision: input.decision, reason: input.reason, evaluationId: ev.id } });
  });
  return getUnit(db, actor.workshopId, unitId);
}
