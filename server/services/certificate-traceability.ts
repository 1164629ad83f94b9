/**
 * The certificate's "Measurement traceability" section, from what the unit's evaluation stored: the
 * recorder and thermometer of its strikes with the calibrations they used, what those were
 * calibrated against, and the fundamental's uncertainty budget. Traceability is stated only when
 * every instrument was within a valid calibration when the unit was measured; otherwise the
 * certificate says why not.
 */
import { and, eq, inArray } from "drizzle-orm";
import type { CertificateInstrument, CertificateTraceability } from "../../shared/schemas/certificate.ts";
import type { EvaluationView } from "../../shared/schemas/evaluation.ts";
import { budgetComponentLabels, type BudgetComponent, type StrikeCorrection, type ThermometerPoint, type ToneResult } from "../../shared/schemas/instrument.ts";
import { signedPpm, twoSignificant } from "../../shared/traceability.ts";
import type { Db } from "../db/client.ts";
import { instrumentCalibration } from "../db/schema.ts";

const UNIT_WORDS: Record<BudgetComponent["unit"], string> = { Hz: "Hz", ppm: "ppm", "°C": "°C", "1/°C": "/°C" };
const SENSITIVITY_UNIT: Record<BudgetComponent["unit"], string> = { Hz: "", ppm: " Hz/ppm", "°C": " Hz/°C", "1/°C": " Hz·°C" };

const day = (iso: string) => iso.slice(0, 10);
const hz = (f: number) => `${Number(f.toPrecision(7))} Hz`;

type CalibrationDetailRow = { id: string; tones?: ToneResult[]; referenceDescription?: string; calibratedBy?: string; coverageFactor?: number; points: ThermometerPoint[] | null; uncertaintyC: number | null; offsetPpm: number | null; offsetUncertaintyPpm: number | null };

function calibrationDetails(db: Db, workshopId: string, ids: string[]): Map<string, CalibrationDetailRow> {
  if (!ids.length) return new Map();
  const rows = db.select().from(instrumentCalibration).where(and(eq(instrumentCalibration.workshopId, workshopId), inArray(instrumentCalibration.id, ids))).all();
  return new Map(
    rows.map((r) => {
      const d = r.detail as Omit<CalibrationDetailRow, "id" | "points" | "uncertaintyC" | "offsetPpm" | "offsetUncertaintyPpm">;
      return [r.id, { id: r.id, ...d, points: (r.points as ThermometerPoint[] | null) ?? null, uncertaintyC: r.uncertaintyC, offsetPpm: r.offsetPpm, offsetUncertaintyPpm: r.offsetUncertaintyPpm }];
    }),
  );
}

function recorderEntry(c: StrikeCorrection["recorder"], details: Map<string, CalibrationDetailRow>, assumedPpm: number): CertificateInstrument {
  const cal = c.calibration;
  const d = cal ? details.get(cal.id) : undefined;
  const tones = d?.tones ?? [];
  const reference =
    tones.length > 0
      ? tones.map((t) => `reference tone ${hz(t.referenceHz)} ± ${twoSignificant(2 * t.referenceUncertaintyHz)} Hz (k = 2), certificate ${t.referenceCertificate}`).join("; ") + (d?.referenceDescription ? ` — ${d.referenceDescription}` : "")
      : "reference tones as recorded with the calibration";
  let result = "";
  if (cal && d && d.offsetPpm !== null && d.offsetUncertaintyPpm !== null) {
    result =
      c.status === "calibrated"
        ? `clock offset ${signedPpm(d.offsetPpm)}, U = ${twoSignificant(2 * d.offsetUncertaintyPpm)} ppm (k = 2); frequencies corrected for it`
        : `expired on ${day(cal.validUntil)}: not applied; the assumed ±${assumedPpm} ppm was used instead`;
  }
  return {
    role: "recorder",
    name: c.instrument?.name ?? "not recorded",
    model: c.instrument?.model ?? "",
    serial: c.instrument?.serial ?? "",
    status: c.status,
    calibration: cal ? { number: cal.number, calibratedOn: day(cal.calibratedAt), validUntil: day(cal.validUntil), result: result || "as recorded", reference } : null,
  };
}

function thermometerEntry(c: NonNullable<StrikeCorrection["thermometer"]>, details: Map<string, CalibrationDetailRow>, assumedC: number): CertificateInstrument {
  const cal = c.calibration;
  const d = cal ? details.get(cal.id) : undefined;
  let result = "as recorded";
  if (cal && d?.points && d.uncertaintyC !== null) {
    const points = d.points.map((p) => `${p.offsetC >= 0 ? "+" : "−"}${Math.abs(p.offsetC).toFixed(2)} °C at ${p.referenceC} °C`).join(", ");
    result =
      c.status === "calibrated"
        ? `offset ${points}; U = ${twoSignificant(2 * d.uncertaintyC)} °C (k = 2); readings corrected for it`
        : `expired on ${day(cal.validUntil)}: not applied; the assumed ±${assumedC} °C was used instead`;
  }
  return {
    role: "thermometer",
    name: c.instrument?.name ?? "not recorded",
    model: c.instrument?.model ?? "",
    serial: c.instrument?.serial ?? "",
    status: c.status,
    calibration: cal
      ? { number: cal.number, calibratedOn: day(cal.calibratedAt), validUntil: day(cal.validUntil), result, reference: `calibration certificate ${cal.certificateNumber}${d?.calibratedBy ? `, ${d.calibratedBy}` : ""}` }
      : null,
  };
}

function why(i: CertificateInstrument): string | null {
  const what = i.role === "recorder" ? "Recorder" : "Thermometer";
  if (i.status === "expired") return `${what} “${i.name}” was past its calibration due date (${i.calibration!.validUntil}) when the unit was measured.`;
  if (i.status === "uncalibrated") return `${what} “${i.name}” had no calibration when the unit was measured.`;
  if (i.status === "not_named") return `The ${i.role} of a strike was not recorded.`;
  return null;
}

/** The certificate's traceability section from the evaluation it reports. */
export function certificateTraceability(db: Db, workshopId: string, ev: EvaluationView): CertificateTraceability {
  const t = ev.traceability;
  if (!t) {
    return { traceable: false, statement: "Traceability is not stated: the measuring instruments were not recorded with this evaluation.", instruments: [], budget: null };
  }
  const assumedPpm = ev.assumptions?.clockHalfWidthPpm ?? 50;
  const assumedC = ev.assumptions?.thermometerHalfWidthC ?? 0.5;
  const ids = t.strikes.flatMap((s) => [s.recorder.calibration?.id, s.thermometer?.calibration?.id]).filter((v): v is string => !!v);
  const details = calibrationDetails(db, workshopId, [...new Set(ids)]);
  // One entry per instrument and calibration (strikes of one recorder share it).
  const entries = new Map<string, CertificateInstrument>();
  for (const s of t.strikes) {
    const r = recorderEntry(s.recorder, details, assumedPpm);
    entries.set(`r:${s.recorder.instrument?.id ?? "none"}:${s.recorder.calibration?.id ?? s.recorder.status}`, r);
    if (s.thermometer) {
      const th = thermometerEntry(s.thermometer, details, assumedC);
      entries.set(`t:${s.thermometer.instrument?.id ?? "none"}:${s.thermometer.calibration?.id ?? s.thermometer.status}`, th);
    }
  }
  const instruments = [...entries.values()];
  const reasons = instruments.map(why).filter((v): v is string => v !== null);
  const traceable = t.traceable && reasons.length === 0;
  const statement = traceable
    ? "Each instrument below was within a valid calibration when the unit was measured. The recorder's sample clock was calibrated against the reference tones named, and the thermometer against the certificate named; those references carry the chain further through their own certificates. The uncertainty below is built from these calibrations."
    : `Traceability is not stated for these results. ${reasons.join(" ")} Where a calibration was missing or expired, the workshop's assumed tolerance entered the uncertainty instead of a calibration (see the budget).`;
  const b = t.budget;
  return {
    traceable,
    statement,
    instruments,
    budget: b
      ? {
          label: b.label,
          measuredHz: b.measuredHz,
          lines: b.components.map((c) => ({
            component: budgetComponentLabels[c.source],
            basis: c.basis,
            distribution: c.distribution,
            standardUncertainty: `${twoSignificant(c.standardUncertainty)} ${UNIT_WORDS[c.unit]}`,
            sensitivity: `${twoSignificant(c.sensitivity)}${SENSITIVITY_UNIT[c.unit]}`,
            contributionHz: c.contributionHz,
          })),
          combinedHz: b.combinedHz,
          coverageFactor: b.coverageFactor,
          expandedHz: b.expandedHz,
        }
      : null,
  };
}

/**
 * The temperatures the results were corrected from, °C: the readings corrected for their
 * thermometer's calibration where the evaluation applied one, else the readings as entered.
 */
export function measuredTemperatures(ev: EvaluationView, readings: (number | null)[]): number[] {
  const corrected = ev.traceability?.strikes.map((s) => s.thermometer?.correctedC ?? null).filter((t): t is number => t !== null);
  return corrected && corrected.length ? corrected : readings.filter((t): t is number => t !== null);
}
