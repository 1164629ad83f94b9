/** Strikes: accepting an upload, recording its analysis, and re-evaluating the unit. */
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, inArray, isNull } from "drizzle-orm";
import type { AnalysisResult } from "../../shared/schemas/analysis.ts";
import type { EvaluationView } from "../../shared/schemas/evaluation.ts";
import type { Support, SpecVersion } from "../../shared/schemas/spec.ts";
import type { StrikeDetail, StrikeNoteReading, StrikeSummary, UnitDetail } from "../../shared/schemas/strike.ts";
import { evaluateUnit, matchStrike, type EvaluationStrikeInput } from "../../shared/evaluation.ts";
import { can, type RoleName } from "../../shared/permissions.ts";
import type { EvaluationTraceability, StrikeCorrection } from "../../shared/schemas/instrument.ts";
import { instrumentNotes, type InstrumentCorrection } from "../../shared/traceability.ts";
import type { Db, Sqlite } from "../db/client.ts";
import { batch, disposition, evaluation, measurement, partial, strike, strikeVoid, unit, user } from "../db/schema.ts";
import { conflict, forbidden, notFound } from "../http-error.ts";
import { audit, type Actor } from "./audit.ts";
import { latestEvaluations, findBatch, standingDispositions } from "./batches.ts";
import { certifiability } from "./certification.ts";
import { instrumentNames, strikeCorrections, workshopEvaluationOptions } from "./instruments.ts";
import { appendToChain } from "./ledger-chain.ts";
import { getSpecVersion } from "./specs.ts";
import { voidsByUnit, type StrikeVoidRow } from "./strike-voids.ts";

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

type Names = Map<string, { id: string; name: string }>;

function toSummary(row: StrikeRow, by: { id: string; name: string } | null, fundamentalHz: number | null, voided: StrikeVoidRow | undefined, instruments: Names): StrikeSummary {
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
    voided: voided ? { at: voided.at.toISOString(), reason: voided.reason, by: voided.by } : null,
    recorder: row.recorderId ? instruments.get(row.recorderId) ?? null : null,
    thermometer: row.thermometerId ? instruments.get(row.thermometerId) ?? null : null,
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
  /** The instruments named at upload (checked by checkStrikeInstruments). */
  recorderId?: string | null;
  thermometerId?: string | null;
};

/** Refuses a second upload of the same bytes to the same unit, naming the first; a voided strike's file may come back. */
export function assertNotDuplicate(db: Db, unitId: string, sha256: string) {
  const existing = db
    .select({ originalName: strike.originalName, uploadedAt: strike.uploadedAt })
    .from(strike)
    .leftJoin(strikeVoid, eq(strikeVoid.strikeId, strike.id))
    .where(and(eq(strike.unitId, unitId), eq(strike.sha256, sha256), isNull(strikeVoid.id)))
    .get();
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
    // Checked again inside the write: two uploads of the same file at once must not both land.
    assertNotDuplicate(tx as unknown as Db, s.unitId, s.sha256);
    const row = tx
      .insert(strike)
      .values({ id, workshopId: actor.workshopId, unitId: s.unitId, uploadedBy: actor.userId, originalName: s.originalName, sha256: s.sha256, fileKey: s.fileKey, sizeBytes: s.sizeBytes, ...s.format, temperatureC: s.temperatureC, support: s.support, recorderId: s.recorderId ?? null, thermometerId: s.thermometerId ?? null, state: "queued" })
      .returning()
      .get();
    audit(tx, actor, "strike.upload", "strike", id, { after: { unitId: s.unitId, originalName: s.originalName, sha256: s.sha256, recorderId: s.recorderId ?? null, thermometerId: s.thermometerId ?? null } });
    return row;
  });
}

/**
 * Inputs of the evaluation: every analysed strike segment of the unit (voided strikes left out), each
 * with the correction of its recorder and thermometer (the calibrations in force when it was measured).
 */
function evaluationInputs(db: Db, workshopId: string, unitId: string, assumed: Parameters<typeof strikeCorrections>[3]): { inputs: EvaluationStrikeInput[]; corrections: InstrumentCorrection[] } {
  const rows = db
    .select({ s: strike, result: measurement.result })
    .from(strike)
    .innerJoin(measurement, eq(measurement.strikeId, strike.id))
    .leftJoin(strikeVoid, eq(strikeVoid.strikeId, strike.id))
    .where(and(eq(strike.unitId, unitId), eq(strike.state, "done"), isNull(strikeVoid.id)))
    .orderBy(asc(strike.uploadedAt))
    .all();
  const byStrike = strikeCorrections(db, workshopId, rows.map((r) => r.s), assumed);
  const inputs = rows.flatMap(({ s, result }) => {
    const c = byStrike.get(s.id)!;
    return (result as AnalysisResult).strikes.map((seg, segment) => ({ strikeId: s.id, segment, temperatureC: s.temperatureC, partials: seg.partials, clock: c.clock, thermometer: c.thermometer }));
  });
  return { inputs, corrections: rows.map((r) => byStrike.get(r.s.id)!) };
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
    // A strike voided while it waited is measured (the record keeps it) but not evaluated.
    const voided = tx.select({ id: strikeVoid.id }).from(strikeVoid).where(eq(strikeVoid.strikeId, strikeId)).get();
    if (!voided) evaluateAndRecord(tx as unknown as Db, sqlite, s.workshopId, s.unitId);
  });
}

/**
 * Appends a new evaluation of the unit from all its analysed strikes (after each analysis, or when
 * someone asks for a re-evaluation: `actor` then names them). Returns the new evaluation's id.
 */
export function evaluateAndRecord(db: Db, sqlite: Sqlite, workshopId: string, unitId: string, actor: Actor = { workshopId, userId: null }): string | null {
  const u = findUnit(db, workshopId, unitId);
  const { spec } = specForUnit(db, workshopId, u);
  const opts = workshopEvaluationOptions(db, workshopId);
  const { inputs, corrections } = evaluationInputs(db, workshopId, unitId, opts);
  if (!inputs.length) return null;
  const { labels: _labels, fundamentalBudget, ...evaluated } = evaluateUnit(spec, inputs, opts);
  // The tolerances and calibrations used stay with the evaluation: a later change of the settings or a
  // new calibration does not rewrite history; the strikes used let a later void tell which evaluations
  // it makes stale.
  const view = {
    ...evaluated,
    assumptions: opts,
    traceability: evaluationTraceability(corrections.map((c) => c.correction), opts, fundamentalBudget),
    strikeIds: [...new Set(inputs.map((i) => i.strikeId))],
  };
  const id = randomUUID();
  db.insert(evaluation).values({ id, workshopId, unitId, specVersionId: spec.id, verdict: view.verdict, detail: view }).run();
  appendToChain(sqlite, workshopId, "evaluation", id);
  audit(db, actor, actor.userId ? "unit.reevaluate" : "unit.evaluate", "unit", unitId, { after: { evaluationId: id, verdict: view.verdict, traceable: view.traceability.traceable } });
  return id;
}

/** What an evaluation records of its instruments: per strike the correction, the notes, and the fundamental's budget. */
function evaluationTraceability(corrections: StrikeCorrection[], assumed: Parameters<typeof instrumentNotes>[1], budget: EvaluationTraceability["budget"]): EvaluationTraceability {
  return { strikes: corrections, ...instrumentNotes(corrections, assumed), budget };
}

/**
 * An explicit re-evaluation: appends a new evaluation from the unit's strikes with the calibrations
 * as they stand now (for example a thermometer certificate entered later). Earlier evaluations stay.
 */
export function reevaluateUnit(db: Db, sqlite: Sqlite, actor: Actor, unitId: string): UnitDetail {
  const u = findUnit(db, actor.workshopId, unitId);
  const b = findBatch(db, actor.workshopId, u.batchId);
  if (b.state === "released") throw conflict(`Batch ${b.code} is released; its evaluations are final.`);
  const pending = db.select({ id: strike.id }).from(strike).where(and(eq(strike.unitId, unitId), inArray(strike.state, ["queued", "analysing"]))).get();
  if (pending) throw conflict(`A strike of unit ${u.serial} is still being analysed; it is evaluated when the analysis ends.`);
  const id = db.transaction((tx) => evaluateAndRecord(tx as unknown as Db, sqlite, actor.workshopId, unitId, actor));
  if (!id) throw conflict(`Unit ${u.serial} has no analysed strike to evaluate; measure it first.`);
  return getUnit(db, actor.workshopId, unitId);
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
  const voided = voidsByUnit(db, [u.id]).get(u.id)?.find((v) => v.strikeId === row.id);
  const { correction, appliedIn } = strikeCorrectionOf(db, workshopId, row);
  return {
    ...toSummary(row, by, fundamentalOf(spec, result, reading), voided, instrumentNames(db, workshopId, [row.recorderId, row.thermometerId])),
    correction,
    appliedIn,
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

/** The strike's correction as the unit's latest evaluation applied it, or as it will be applied. */
function strikeCorrectionOf(db: Db, workshopId: string, row: StrikeRow): { correction: StrikeCorrection; appliedIn: StrikeDetail["appliedIn"] } {
  const ev = latestEvaluations(db, [row.unitId]).get(row.unitId);
  const applied = ev?.traceability?.strikes.find((c) => c.strikeId === row.id);
  if (ev && applied) return { correction: applied, appliedIn: { evaluationId: ev.id, at: ev.createdAt } };
  const correction = strikeCorrections(db, workshopId, [row], workshopEvaluationOptions(db, workshopId)).get(row.id)!.correction;
  return { correction, appliedIn: null };
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
  const voids = new Map((voidsByUnit(db, [unitId]).get(unitId) ?? []).map((v) => [v.strikeId, v]));
  const names = instrumentNames(db, workshopId, rows.flatMap((r) => [r.s.recorderId, r.s.thermometerId]));
  const strikes = rows.map(({ s, by }) => {
    const result = results.get(s.id) ?? null;
    const reading = result ? specReading(spec, result.strikes[0]?.partials ?? []) : null;
    return toSummary(s, by?.id ? by : null, fundamentalOf(spec, result, reading), voids.get(s.id), names);
  });
  const evals = latestEvaluations(db, [unitId]);
  const ev: EvaluationView | null = evals.get(unitId) ?? null;
  const standing = standingDispositions(db, [unitId], evals).get(unitId) ?? null;
  const dispositions = db
    .select({ d: disposition, by: { id: user.id, name: user.name } })
    .from(disposition)
    .leftJoin(user, eq(user.id, disposition.decidedBy))
    .where(eq(disposition.unitId, unitId))
    .orderBy(desc(disposition.createdAt))
    .all()
    .map(({ d, by }) => ({ id: d.id, decision: d.decision, reason: d.reason, at: d.createdAt.toISOString(), by: by?.id ? by : null, evaluationId: d.evaluationId, supersedesId: d.supersedesId }));
  const supersededBy = new Map(dispositions.flatMap((d) => (d.supersedesId ? [[d.supersedesId, d.id] as const] : [])));
  const standingCert = certifiability(db, b, [u]).get(u.id)!;
  const certification: UnitDetail["certification"] = standingCert.eligible ? { eligible: true, reason: null, concession: standingCert.concession } : { eligible: false, reason: standingCert.reason, concession: null };
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
    dispositions: dispositions.map((d) => ({ ...d, supersededById: supersededBy.get(d.id) ?? null })),
    standingDispositionId: standing?.id ?? null,
    certification,
    nextUnit: nextUnmeasured(db, b.id, u.id),
  };
}

/** The first unit of the batch (in order) with no strike yet (voided ones aside), other than `exceptId`. */
export function nextUnmeasured(db: Db, batchId: string, exceptId?: string): { id: string; serial: string } | null {
  const units = db.select({ id: unit.id, serial: unit.serial }).from(unit).where(eq(unit.batchId, batchId)).orderBy(asc(unit.position)).all();
  const struck = new Set(
    units.length
      ? db
          .select({ unitId: strike.unitId })
          .from(strike)
          .leftJoin(strikeVoid, eq(strikeVoid.strikeId, strike.id))
          .where(and(inArray(strike.unitId, units.map((u) => u.id)), isNull(strikeVoid.id)))
          .all()
          .map((s) => s.unitId)
      : [],
  );
  return units.find((u) => u.id !== exceptId && !struck.has(u.id)) ?? null;
}

/**
 * Takes a strike out of the record: a void row with its reason, chained and audited, and a new
 * evaluation of the unit from the strikes that remain, all in one transaction. The maker who
 * uploaded the strike may void it, quality anyone's; never on a released batch, never twice.
 */
export function voidStrike(db: Db, sqlite: Sqlite, actor: Actor & { role: RoleName }, strikeId: string, reason: string): UnitDetail {
  const s = db.select().from(strike).where(and(eq(strike.id, strikeId), eq(strike.workshopId, actor.workshopId))).get();
  if (!s) throw notFound("That strike");
  if (s.uploadedBy !== actor.userId && !can(actor.role, "strike", "void-others")) {
    throw forbidden("Only the maker who uploaded this strike, or quality, can void it.");
  }
  const u = findUnit(db, actor.workshopId, s.unitId);
  const b = findBatch(db, actor.workshopId, u.batchId);
  if (b.state === "released") throw conflict(`Batch ${b.code} is released; its strikes can no longer be voided.`);
  const id = randomUUID();
  db.transaction((tx) => {
    const earlier = tx.select().from(strikeVoid).where(eq(strikeVoid.strikeId, strikeId)).get();
    if (earlier) {
      throw conflict(`Strike "${s.originalName}" was already voided on ${earlier.createdAt.toISOString().slice(0, 16).replace("T", " ")} UTC (${earlier.reason}). A void cannot be undone: upload the recording again if it belongs to this unit.`);
    }
    tx.insert(strikeVoid).values({ id, workshopId: actor.workshopId, strikeId, unitId: u.id, reason, voidedBy: actor.userId }).run();
    appendToChain(sqlite, actor.workshopId, "strike_void", id);
    audit(tx, actor, "strike.void", "strike", strikeId, { after: { voidId: id, unitId: u.id, originalName: s.originalName, reason } });
    // Only an analysed strike entered the evaluation; voiding a failed or waiting one changes no verdict.
    if (tx.select({ id: measurement.id }).from(measurement).where(eq(measurement.strikeId, strikeId)).get()) {
      evaluateAndRecord(tx as unknown as Db, sqlite, actor.workshopId, u.id);
    }
  });
  return getUnit(db, actor.workshopId, u.id);
}
