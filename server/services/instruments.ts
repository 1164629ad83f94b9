/**
 * Instruments and their calibrations: recorders calibrated from reference-tone recordings measured
 * by the analysis engine, thermometers from the points of their certificates. Calibrations are
 * appended (never changed) and sealed in the workshop's hash chain; evaluations resolve, per strike,
 * the calibration in force when it was measured (shared/traceability.ts).
 */
import { randomUUID } from "node:crypto";
import { mkdirSync, renameSync, rmSync } from "node:fs";
import path from "node:path";
import { and, asc, desc, eq, inArray, like, max } from "drizzle-orm";
import type {
  CalibrationView,
  CreateInstrumentInput,
  InstrumentDetail,
  InstrumentDue,
  InstrumentKind,
  InstrumentSummary,
  RecorderCalibrationFields,
  ThermometerCalibrationInput,
  ThermometerPoint,
  ToneResult,
} from "../../shared/schemas/instrument.ts";
import { thermometerCalibrationSchema } from "../../shared/schemas/instrument.ts";
import { SAMPLE_CLOCK_HALF_WIDTH_PPM, TEMPERATURE_COEFFICIENT_RELATIVE_HALF_WIDTH, THERMOMETER_HALF_WIDTH_C, type EvaluationOptions } from "../../shared/evaluation.ts";
import {
  addMonthsUtc,
  calibrationStatus,
  combineToneOffsets,
  daysUntil,
  strikeCorrection,
  type AssumedTolerances,
  type CalibrationRef,
  type InstrumentCorrection,
  type InstrumentRef,
  type ToneInput,
} from "../../shared/traceability.ts";
import type { ReferenceToneMeasurement } from "../analysis/reference-tone.ts";
import type { Db, Sqlite } from "../db/client.ts";
import { instrument, instrumentCalibration, strike, user, workshopProfile } from "../db/schema.ts";
import { badRequest, conflict, HttpError, notFound } from "../http-error.ts";
import { audit, type Actor } from "./audit.ts";
import { appendToChain } from "./ledger-chain.ts";

type InstrumentRow = typeof instrument.$inferSelect;
type CalibrationRow = typeof instrumentCalibration.$inferSelect;

/** What a calibration row keeps in its `detail` column. */
type CalibrationDetail = {
  tones?: ToneResult[];
  frequencyDependence?: CalibrationView["frequencyDependence"];
  referenceDescription?: string;
  calibratedBy?: string;
  note?: string;
  warnings?: string[];
  /** Stored reference recordings, relative to DATA_DIR/calibrations. */
  files?: string[];
  coverageFactor?: number;
};

export function findInstrument(db: Db, workshopId: string, id: string): InstrumentRow {
  const row = db.select().from(instrument).where(and(eq(instrument.id, id), eq(instrument.workshopId, workshopId))).get();
  if (!row) throw notFound("That instrument");
  return row;
}

export function createInstrument(db: Db, actor: Actor, input: CreateInstrumentInput): { id: string } {
  const clash = db.select({ id: instrument.id }).from(instrument).where(and(eq(instrument.workshopId, actor.workshopId), eq(instrument.name, input.name))).get();
  if (clash) throw conflict(`An instrument named “${input.name}” exists already; give this one another name (add its serial or place, e.g. “${input.name} 2”).`, { name: "Name in use" });
  const id = randomUUID();
  db.transaction((tx) => {
    tx.insert(instrument).values({ id, workshopId: actor.workshopId, kind: input.kind, name: input.name, model: input.model, serial: input.serial, validityMonths: input.validityMonths, createdBy: actor.userId }).run();
    audit(tx, actor, "instrument.create", "instrument", id, { after: input });
  });
  return { id };
}

function calibrationView(row: CalibrationRow, kind: InstrumentKind, by: { id: string; name: string } | null): CalibrationView {
  const d = row.detail as CalibrationDetail;
  const k = 2;
  return {
    id: row.id,
    number: row.number,
    instrumentId: row.instrumentId,
    kind,
    calibratedAt: row.calibratedAt.toISOString(),
    validUntil: row.validUntil.toISOString(),
    offsetPpm: row.offsetPpm,
    offsetUncertaintyPpm: row.offsetUncertaintyPpm,
    expandedOffsetUncertaintyPpm: row.offsetUncertaintyPpm === null ? null : k * row.offsetUncertaintyPpm,
    tones: d.tones ?? null,
    frequencyDependence: d.frequencyDependence ?? null,
    points: (row.points as ThermometerPoint[] | null) ?? null,
    uncertaintyC: row.uncertaintyC,
    expandedUncertaintyC: row.uncertaintyC === null ? null : k * row.uncertaintyC,
    certificateNumber: row.certificateNumber,
    referenceDescription: d.referenceDescription ?? "",
    calibratedBy: d.calibratedBy ?? "",
    note: d.note ?? "",
    warnings: d.warnings ?? [],
    createdAt: row.createdAt.toISOString(),
    createdBy: by,
  };
}

function calibrationRows(db: Db, workshopId: string, instrumentIds?: string[]) {
  if (instrumentIds && instrumentIds.length === 0) return [];
  return db
    .select({ c: instrumentCalibration, by: { id: user.id, name: user.name } })
    .from(instrumentCalibration)
    .leftJoin(user, eq(user.id, instrumentCalibration.createdBy))
    .where(instrumentIds ? and(eq(instrumentCalibration.workshopId, workshopId), inArray(instrumentCalibration.instrumentId, instrumentIds)) : eq(instrumentCalibration.workshopId, workshopId))
    .orderBy(desc(instrumentCalibration.calibratedAt), desc(instrumentCalibration.createdAt))
    .all();
}

function summarise(row: InstrumentRow, history: CalibrationView[], now: Date): InstrumentSummary {
  // The newest calibration by date is the one in force now (history is newest first).
  const latest = history.find((c) => new Date(c.calibratedAt).getTime() <= now.getTime()) ?? null;
  const validUntil = latest ? new Date(latest.validUntil) : null;
  return {
    id: row.id,
    kind: row.kind,
    name: row.name,
    model: row.model,
    serial: row.serial,
    validityMonths: row.validityMonths,
    status: calibrationStatus(validUntil ? { validUntil } : null, now),
    dueInDays: validUntil ? daysUntil(validUntil, now) : null,
    latest,
    calibrations: history.length,
    createdAt: row.createdAt.toISOString(),
  };
}

export function listInstruments(db: Db, workshopId: string, now = new Date()): InstrumentSummary[] {
  const rows = db.select().from(instrument).where(eq(instrument.workshopId, workshopId)).orderBy(asc(instrument.kind), asc(instrument.name)).all();
  const kinds = new Map(rows.map((r) => [r.id, r.kind]));
  const byInstrument = new Map<string, CalibrationView[]>();
  for (const { c, by } of calibrationRows(db, workshopId)) {
    const list = byInstrument.get(c.instrumentId) ?? [];
    list.push(calibrationView(c, kinds.get(c.instrumentId) ?? "recorder", by?.id ? by : null));
    byInstrument.set(c.instrumentId, list);
  }
  return rows.map((r) => summarise(r, byInstrument.get(r.id) ?? [], now));
}

export function getInstrument(db: Db, workshopId: string, id: string, now = new Date()): InstrumentDetail {
  const row = findInstrument(db, workshopId, id);
  const history = calibrationRows(db, workshopId, [id]).map(({ c, by }) => calibrationView(c, row.kind, by?.id ? by : null));
  return { ...summarise(row, history, now), history };
}

/** Instruments due for calibration within 30 days, or overdue, soonest first (the dashboard's list). */
export function instrumentsDue(db: Db, workshopId: string, now = new Date()): InstrumentDue[] {
  return listInstruments(db, workshopId, now)
    .filter((i) => i.status === "due_soon" || i.status === "expired")
    .sort((a, b) => (a.dueInDays ?? 0) - (b.dueInDays ?? 0))
    .map((i) => ({ id: i.id, kind: i.kind, name: i.name, status: i.status, validUntil: i.latest?.validUntil ?? null, dueInDays: i.dueInDays }));
}

/** The next record number of the year in the workshop: CAL-YYYY-NNNN. */
function nextCalibrationNumber(db: Db, workshopId: string, at: Date): string {
  const stem = `CAL-${at.getUTCFullYear()}-`;
  const [{ last }] = db.select({ last: max(instrumentCalibration.number) }).from(instrumentCalibration).where(and(eq(instrumentCalibration.workshopId, workshopId), like(instrumentCalibration.number, `${stem}%`))).all();
  const n = last ? Number(last.slice(stem.length)) + 1 : 1;
  return `${stem}${String(n).padStart(4, "0")}`;
}

/** When the calibration counts from: now for today (or no date), else the start of the given UTC day. */
function calibrationTime(calibratedOn: string | null, now: Date): Date {
  if (!calibratedOn || calibratedOn === now.toISOString().slice(0, 10)) return now;
  return new Date(`${calibratedOn}T00:00:00.000Z`);
}

type NewCalibration = {
  calibratedAt: Date;
  validUntil: Date;
  offsetPpm?: number;
  offsetUncertaintyPpm?: number;
  points?: ThermometerPoint[];
  uncertaintyC?: number;
  certificateNumber: string;
  detail: CalibrationDetail;
};

function insertCalibration(db: Db, sqlite: Sqlite, actor: Actor, inst: InstrumentRow, c: NewCalibration): CalibrationView {
  const id = randomUUID();
  return db.transaction((tx) => {
    const number = nextCalibrationNumber(tx as unknown as Db, actor.workshopId, c.calibratedAt);
    const row = tx
      .insert(instrumentCalibration)
      .values({
        id,
        workshopId: actor.workshopId,
        instrumentId: inst.id,
        number,
        calibratedAt: c.calibratedAt,
        validUntil: c.validUntil,
        offsetPpm: c.offsetPpm ?? null,
        offsetUncertaintyPpm: c.offsetUncertaintyPpm ?? null,
        points: c.points ?? null,
        uncertaintyC: c.uncertaintyC ?? null,
        certificateNumber: c.certificateNumber,
        detail: c.detail,
        createdBy: actor.userId,
      })
      .returning()
      .get();
    appendToChain(sqlite, actor.workshopId, "calibration", id);
    audit(tx, actor, "instrument.calibrate", "instrument", inst.id, {
      after: { calibrationId: id, number, offsetPpm: c.offsetPpm ?? null, offsetUncertaintyPpm: c.offsetUncertaintyPpm ?? null, points: c.points ?? null, uncertaintyC: c.uncertaintyC ?? null, validUntil: c.validUntil.toISOString() },
    });
    return calibrationView(row, inst.kind, null);
  });
}

/** A reference recording as measured, with where it came from. */
export type MeasuredTone = ToneInput & { storedPath: string };

/**
 * A measured reference recording with its reference: the certificate states an expanded uncertainty U
 * with its coverage factor k, so the standard uncertainty is U/k (GUM §4.3.3).
 */
export function measuredTone(
  m: ReferenceToneMeasurement,
  reference: { referenceHz: number; expandedUncertaintyHz: number; coverageFactor: number; certificate: string },
  file: { originalName: string; sha256: string; storedPath: string },
): MeasuredTone {
  return {
    referenceHz: reference.referenceHz,
    referenceUncertaintyHz: reference.expandedUncertaintyHz / reference.coverageFactor,
    referenceCertificate: reference.certificate,
    measuredHz: m.frequencyHz,
    measuredUncertaintyHz: m.frequencyUncertaintyHz,
    snrDb: m.snrDb,
    clearanceDb: m.clearanceDb,
    decays: m.decays,
    durationS: m.durationS,
    sampleRate: m.sampleRate,
    ...file,
  };
}

/**
 * A recorder calibration from its measured reference tones: one offset (GUM-combined with the
 * references' uncertainties) and the frequency-dependence check. The recordings are kept beside the
 * database as the calibration's evidence.
 */
export function recordRecorderCalibration(
  deps: { db: Db; sqlite: Sqlite; dataDir: string },
  actor: Actor,
  inst: InstrumentRow,
  tones: MeasuredTone[],
  fields: Pick<RecorderCalibrationFields, "calibratedOn" | "referenceDescription" | "note" | "referenceCoverageFactor">,
  now = new Date(),
): CalibrationView {
  if (inst.kind !== "recorder") throw badRequest(`“${inst.name}” is a thermometer: give the points of its calibration certificate instead of a reference recording.`);
  const combined = combineToneOffsets(tones.map(({ storedPath: _stored, ...tone }) => tone));
  const calibratedAt = calibrationTime(fields.calibratedOn, now);
  const dir = path.join(deps.dataDir, "calibrations", actor.workshopId);
  mkdirSync(dir, { recursive: true });
  const files = tones.map((t) => {
    const key = `${actor.workshopId}/${randomUUID()}.wav`;
    renameSync(t.storedPath, path.join(deps.dataDir, "calibrations", key));
    return key;
  });
  const certificates = [...new Set(combined.tones.map((t) => t.referenceCertificate))];
  try {
    return insertCalibration(deps.db, deps.sqlite, actor, inst, {
      calibratedAt,
      validUntil: addMonthsUtc(calibratedAt, inst.validityMonths),
      offsetPpm: combined.offsetPpm,
      offsetUncertaintyPpm: combined.offsetUncertaintyPpm,
      certificateNumber: certificates.join(", "),
      detail: {
        tones: combined.tones,
        frequencyDependence: combined.frequencyDependence,
        referenceDescription: fields.referenceDescription,
        note: fields.note,
        warnings: combined.warnings,
        files,
        coverageFactor: fields.referenceCoverageFactor,
      },
    });
  } catch (error) {
    // No row, no evidence files: they must not stay behind without it.
    for (const key of files) rmSync(path.join(deps.dataDir, "calibrations", key), { force: true });
    throw error;
  }
}

/** A thermometer calibration from its certificate: offsets at the points, U/k as its standard uncertainty (GUM §4.3.3). */
export function recordThermometerCalibration(deps: { db: Db; sqlite: Sqlite }, actor: Actor, inst: InstrumentRow, body: unknown, now = new Date()): CalibrationView {
  if (inst.kind !== "thermometer") throw badRequest(`“${inst.name}” is a recorder: calibrate it with a recording of a reference tone (multipart, field "audio").`);
  const input = thermometerCalibrationSchema.parse(body);
  const calibratedAt = calibrationTime(input.calibratedOn, now);
  const validUntil = input.dueOn ? new Date(`${input.dueOn}T23:59:59.999Z`) : addMonthsUtc(calibratedAt, inst.validityMonths);
  return insertCalibration(deps.db, deps.sqlite, actor, inst, {
    calibratedAt,
    validUntil,
    points: [...input.points].sort((a, b) => a.referenceC - b.referenceC),
    uncertaintyC: input.uncertaintyC / input.coverageFactor,
    certificateNumber: input.certificateNumber,
    detail: { calibratedBy: input.calibratedBy, note: input.note, coverageFactor: input.coverageFactor, warnings: [] },
  });
}

// ---------------------------------------------------------------------------------------------
// Strikes and their instruments

/** Checks the instruments named with an upload: each must be this workshop's, of the right kind. */
export function checkStrikeInstruments(db: Db, workshopId: string, ids: { recorderId: string | null; thermometerId: string | null }, temperatureC: number | null): void {
  const check = (id: string | null, kind: InstrumentKind, field: "recorderId" | "thermometerId") => {
    if (!id) return;
    const row = db.select().from(instrument).where(and(eq(instrument.id, id), eq(instrument.workshopId, workshopId))).get();
    if (!row) throw new HttpError(404, "not_found", `That ${kind} was not found in this workshop; choose one from the workshop's instruments.`, { [field]: `No ${kind} with this id in the workshop` });
    if (row.kind !== kind) throw badRequest(`“${row.name}” is a ${row.kind}, not a ${kind}; choose a ${kind} in “${field}”.`, { [field]: `Not a ${kind}` });
  };
  check(ids.recorderId, "recorder", "recorderId");
  check(ids.thermometerId, "thermometer", "thermometerId");
  if (ids.thermometerId && temperatureC === null) {
    throw badRequest("A thermometer was named but no temperature given: enter the temperature read on it, or leave the thermometer out.", { temperatureC: "Give the reading of the thermometer named" });
  }
}

/** The workshop's assumed tolerances (its instrument settings), used where a calibration is missing or expired. */
export function workshopEvaluationOptions(db: Db, workshopId: string): Required<EvaluationOptions> & AssumedTolerances {
  const p = db.select().from(workshopProfile).where(eq(workshopProfile.workshopId, workshopId)).get();
  return {
    clockHalfWidthPpm: p?.clockTolerancePpm ?? SAMPLE_CLOCK_HALF_WIDTH_PPM,
    thermometerHalfWidthC: p?.thermometerToleranceC ?? THERMOMETER_HALF_WIDTH_C,
    tempCoefficientRelativeHalfWidth: (p?.tempCoefficientTolerancePercent ?? TEMPERATURE_COEFFICIENT_RELATIVE_HALF_WIDTH * 100) / 100,
  };
}

type StrikeRow = typeof strike.$inferSelect;

const toRef = (r: InstrumentRow): InstrumentRef => ({ id: r.id, kind: r.kind, name: r.name, model: r.model, serial: r.serial });
const toCalRef = (c: CalibrationRow): CalibrationRef => ({
  id: c.id,
  number: c.number,
  instrumentId: c.instrumentId,
  calibratedAt: c.calibratedAt,
  validUntil: c.validUntil,
  certificateNumber: c.certificateNumber,
  offsetPpm: c.offsetPpm,
  offsetUncertaintyPpm: c.offsetUncertaintyPpm,
  points: (c.points as ThermometerPoint[] | null) ?? null,
  uncertaintyC: c.uncertaintyC,
});

/** Each strike's correction from the calibrations of its instruments in force when it was uploaded. */
export function strikeCorrections(db: Db, workshopId: string, strikes: StrikeRow[], assumed: AssumedTolerances): Map<string, InstrumentCorrection> {
  const ids = [...new Set(strikes.flatMap((s) => [s.recorderId, s.thermometerId]).filter((v): v is string => !!v))];
  const instruments = new Map(ids.length ? db.select().from(instrument).where(and(eq(instrument.workshopId, workshopId), inArray(instrument.id, ids))).all().map((r) => [r.id, toRef(r)]) : []);
  const calibrations = ids.length ? db.select().from(instrumentCalibration).where(and(eq(instrumentCalibration.workshopId, workshopId), inArray(instrumentCalibration.instrumentId, ids))).all().map(toCalRef) : [];
  const out = new Map<string, InstrumentCorrection>();
  for (const s of strikes) {
    out.set(
      s.id,
      strikeCorrection(
        { strikeId: s.id, at: s.uploadedAt, temperatureC: s.temperatureC, recorder: s.recorderId ? instruments.get(s.recorderId) ?? null : null, thermometer: s.thermometerId ? instruments.get(s.thermometerId) ?? null : null },
        calibrations,
        assumed,
      ),
    );
  }
  return out;
}

/** Instruments of the workshop by id (names for strike lists). */
export function instrumentNames(db: Db, workshopId: string, ids: (string | null)[]): Map<string, { id: string; name: string }> {
  const wanted = [...new Set(ids.filter((v): v is string => !!v))];
  if (!wanted.length) return new Map();
  return new Map(db.select({ id: instrument.id, name: instrument.name }).from(instrument).where(and(eq(instrument.workshopId, workshopId), inArray(instrument.id, wanted))).all().map((r) => [r.id, r]));
}

export type { ThermometerCalibrationInput };
