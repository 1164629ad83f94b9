/**
 * The measurement chain of a strike: which calibration of its recorder and thermometer was in force
 * when it was measured, what correction that calibration asks for, and what uncertainty it brings.
 * Pure functions, shared by the server (evaluation, certificates) and the client (instrument status).
 *
 * Sources:
 * - JCGM 100:2008 (GUM): a standard uncertainty from a stated expanded uncertainty U with its
 *   coverage factor k is U/k (§4.3.3); rectangular distribution a/√3 (§4.3.7); combined standard
 *   uncertainty of uncorrelated inputs as a root sum of squares (§5.1.2), of correlated inputs with
 *   the covariance terms (§5.2.2); sensitivity coefficients as partial derivatives (§5.1.3).
 * - ISO 13528:2015 §9.7 (also ISO/IEC 17043): the normalised error Eₙ = (x − y)/√(U_x² + U_y²),
 *   |Eₙ| ≤ 1 meaning two results agree within their expanded uncertainties.
 * - ISO/IEC 17025:2017 §6.5: metrological traceability through an unbroken chain of calibrations.
 */
import type {
  CalibrationStatus,
  FrequencyDependence,
  InstrumentKind,
  StrikeCorrection,
  ThermometerPoint,
  ToneResult,
  UseStatus,
} from "./schemas/instrument.ts";

/** An instrument is listed as due soon this many days before its calibration's due date. */
export const DUE_SOON_DAYS = 30;
const DAY_MS = 86_400_000;

/** A calibration's due date: `months` calendar months after it (UTC), e.g. 2026-01-31 + 1 → 2026-02-28. */
export function addMonthsUtc(at: Date, months: number): Date {
  const d = new Date(at.getTime());
  const day = d.getUTCDate();
  d.setUTCDate(1);
  d.setUTCMonth(d.getUTCMonth() + months);
  const last = new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth() + 1, 0)).getUTCDate();
  d.setUTCDate(Math.min(day, last));
  return d;
}

/** Whole days from `now` to `until` (negative when past), rounded down. */
export function daysUntil(until: Date, now: Date): number {
  return Math.floor((until.getTime() - now.getTime()) / DAY_MS);
}

/** Status of an instrument at `now` from its newest calibration (null: never calibrated). */
export function calibrationStatus(latest: { validUntil: Date } | null, now: Date): CalibrationStatus {
  if (!latest) return "never";
  if (now.getTime() > latest.validUntil.getTime()) return "expired";
  return daysUntil(latest.validUntil, now) < DUE_SOON_DAYS ? "due_soon" : "calibrated";
}

/** The calibration in force at `at`: the newest one made on or before it (or null). */
export function calibrationInForce<T extends { calibratedAt: Date }>(calibrations: T[], at: Date): T | null {
  let best: T | null = null;
  for (const c of calibrations) {
    if (c.calibratedAt.getTime() > at.getTime()) continue;
    if (!best || c.calibratedAt.getTime() >= best.calibratedAt.getTime()) best = c;
  }
  return best;
}

// ---------------------------------------------------------------------------------------------
// Recorder: clock offset from reference tones

export type ToneInput = Omit<ToneResult, "offsetPpm" | "measurementUncertaintyPpm" | "referenceUncertaintyPpm" | "uncertaintyPpm">;

/**
 * One tone's clock offset as this recorder reads it: o = (m − r)/r × 10⁶ ppm, with the standard
 * uncertainties of m (the fit) and r (the reference) carried through the sensitivities
 * ∂o/∂m = 10⁶/r and ∂o/∂r = −10⁶·m/r² (GUM §5.1.3), combined in quadrature (§5.1.2).
 */
export function toneOffset(t: ToneInput): ToneResult {
  const offsetPpm = ((t.measuredHz - t.referenceHz) / t.referenceHz) * 1e6;
  const measurementUncertaintyPpm = (t.measuredUncertaintyHz / t.referenceHz) * 1e6;
  const referenceUncertaintyPpm = ((t.measuredHz * t.referenceUncertaintyHz) / t.referenceHz ** 2) * 1e6;
  return { ...t, offsetPpm, measurementUncertaintyPpm, referenceUncertaintyPpm, uncertaintyPpm: Math.hypot(measurementUncertaintyPpm, referenceUncertaintyPpm) };
}

/** References on one certificate (one generator's timebase) share their error: fully correlated. */
const sameReference = (a: ToneResult, b: ToneResult) => a.referenceCertificate.trim().toLowerCase() === b.referenceCertificate.trim().toLowerCase();

export type RecorderCalibration = { offsetPpm: number; offsetUncertaintyPpm: number; tones: ToneResult[]; frequencyDependence: FrequencyDependence; warnings: string[] };

/**
 * One clock offset from one or more tones: the mean weighted by 1/uᵢ², whose variance includes the
 * covariance of references on the same certificate (correlation 1, GUM §5.2.2) — several tones of one
 * generator do not average its error away. With two or more tones, each pair is compared by the
 * normalised error (ISO 13528 §9.7) using only what the two do not share; a pair beyond 1 means the
 * offset depends on frequency, which a clock error cannot do, and earns a warning.
 */
export function combineToneOffsets(inputs: ToneInput[]): RecorderCalibration {
  if (inputs.length === 0) throw new RangeError("combineToneOffsets needs at least one tone");
  const tones = inputs.map(toneOffset);
  const w = tones.map((t) => 1 / t.uncertaintyPpm ** 2);
  const sw = w.reduce((s, v) => s + v, 0);
  const a = w.map((v) => v / sw);
  const offsetPpm = tones.reduce((s, t, i) => s + a[i] * t.offsetPpm, 0);
  let variance = 0;
  for (let i = 0; i < tones.length; i++) {
    variance += a[i] ** 2 * tones[i].measurementUncertaintyPpm ** 2;
    for (let j = 0; j < tones.length; j++) {
      if (i === j || sameReference(tones[i], tones[j])) variance += a[i] * a[j] * tones[i].referenceUncertaintyPpm * tones[j].referenceUncertaintyPpm;
    }
  }
  const warnings: string[] = [];
  let largest: number | null = null;
  let worstPair: [ToneResult, ToneResult] | null = null;
  for (let i = 0; i < tones.length; i++) {
    for (let j = i + 1; j < tones.length; j++) {
      const ti = tones[i];
      const tj = tones[j];
      const shared = sameReference(ti, tj) ? 2 * ti.referenceUncertaintyPpm * tj.referenceUncertaintyPpm : 0;
      const uDiff = Math.sqrt(Math.max(ti.uncertaintyPpm ** 2 + tj.uncertaintyPpm ** 2 - shared, 1e-30));
      const en = Math.abs(ti.offsetPpm - tj.offsetPpm) / (2 * uDiff);
      if (largest === null || en > largest) {
        largest = en;
        worstPair = [ti, tj];
      }
    }
  }
  const consistent = largest === null || largest <= 1;
  if (!consistent && worstPair) {
    const [p, q] = worstPair;
    warnings.push(
      `The offset depends on the frequency: ${signedPpm(p.offsetPpm)} at ${p.referenceHz} Hz but ${signedPpm(q.offsetPpm)} at ${q.referenceHz} Hz, further apart than their uncertainties allow (normalised error ${largest!.toFixed(1)}, more than 1). ` +
        "A clock error is the same at every frequency, so this is not a clock error: check that each reference is at its stated frequency (a fork at the temperature on its certificate), and that the recorder does not resample. The mean offset is stored; rely on it only once the cause is found.",
    );
  }
  return {
    offsetPpm,
    offsetUncertaintyPpm: Math.sqrt(variance),
    tones,
    frequencyDependence: { checked: tones.length > 1, largestNormalisedError: largest, slopePpmPerKHz: slope(tones), consistent },
    warnings,
  };
}

function slope(tones: ToneResult[]): number | null {
  const xs = tones.map((t) => t.referenceHz / 1000);
  if (new Set(xs).size < 2) return null;
  const mx = xs.reduce((s, x) => s + x, 0) / xs.length;
  const my = tones.reduce((s, t) => s + t.offsetPpm, 0) / tones.length;
  let sxy = 0;
  let sxx = 0;
  xs.forEach((x, i) => {
    sxy += (x - mx) * (tones[i].offsetPpm - my);
    sxx += (x - mx) ** 2;
  });
  return sxy / sxx;
}

export function signedPpm(ppm: number, decimals = 2): string {
  const s = Math.abs(ppm).toFixed(decimals);
  return `${ppm < 0 && Number(s) !== 0 ? "−" : "+"}${s} ppm`;
}

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };

/** Two significant digits; very small or large values as a × 10ⁿ. */
export function twoSignificant(x: number): string {
  if (x === 0) return "0";
  const e = Math.floor(Math.log10(Math.abs(x)));
  if (e >= -3 && e <= 4) return Number(x.toPrecision(2)).toString();
  const m = x / 10 ** e;
  return `${Number(m.toPrecision(2))}×10${String(e).split("").map((ch) => SUPERSCRIPT[ch]).join("")}`;
}

/** A frequency read by a recorder with clock offset `offsetPpm`, corrected: f / (1 + offset × 10⁻⁶). */
export function correctForClock(frequencyHz: number, offsetPpm: number): number {
  return frequencyHz / (1 + offsetPpm * 1e-6);
}

// ---------------------------------------------------------------------------------------------
// Thermometer: offset at the reading

/**
 * The thermometer's offset at a reading, °C, interpolated linearly between calibration points
 * (a point's reading is its reference temperature plus its offset). Outside the points the nearest
 * point's offset is used and `withinRange` is false.
 */
export function thermometerOffsetAt(points: ThermometerPoint[], readingC: number): { offsetC: number; withinRange: boolean } {
  if (points.length === 0) throw new RangeError("thermometerOffsetAt needs at least one calibration point");
  const byReading = [...points].map((p) => ({ reading: p.referenceC + p.offsetC, offset: p.offsetC })).sort((x, y) => x.reading - y.reading);
  const first = byReading[0];
  const last = byReading[byReading.length - 1];
  if (readingC <= first.reading) return { offsetC: first.offset, withinRange: readingC === first.reading };
  if (readingC >= last.reading) return { offsetC: last.offset, withinRange: readingC === last.reading };
  for (let i = 1; i < byReading.length; i++) {
    const lo = byReading[i - 1];
    const hi = byReading[i];
    if (readingC <= hi.reading) {
      const t = (readingC - lo.reading) / (hi.reading - lo.reading);
      return { offsetC: lo.offset + t * (hi.offset - lo.offset), withinRange: true };
    }
  }
  return { offsetC: last.offset, withinRange: false };
}

// ---------------------------------------------------------------------------------------------
// A strike's instruments

export type InstrumentRef = { id: string; kind: InstrumentKind; name: string; model: string; serial: string };
export type CalibrationRef = {
  id: string;
  number: string;
  instrumentId: string;
  calibratedAt: Date;
  validUntil: Date;
  certificateNumber: string;
  offsetPpm: number | null;
  offsetUncertaintyPpm: number | null;
  points: ThermometerPoint[] | null;
  uncertaintyC: number | null;
};

/** The workshop's assumed instrument tolerances (half-widths of rectangular distributions). */
export type AssumedTolerances = { clockHalfWidthPpm: number; thermometerHalfWidthC: number };

export type StrikeInstruments = {
  strikeId: string;
  /** When the strike was measured. */
  at: Date;
  /** The thermometer's reading as entered, °C; null when no temperature was given. */
  temperatureC: number | null;
  recorder: InstrumentRef | null;
  thermometer: InstrumentRef | null;
};

/** What the evaluation needs of one strike's instruments, beside the words. */
export type InstrumentCorrection = {
  correction: StrikeCorrection;
  /** Calibrated clock, or undefined: the assumed tolerance, no correction. */
  clock?: { offsetPpm: number; standardUncertaintyPpm: number };
  /** Calibrated thermometer, or undefined: the assumed tolerance, no correction. */
  thermometer?: { offsetC: number; standardUncertaintyC: number };
};

const calRef = (c: CalibrationRef) => ({ id: c.id, number: c.number, calibratedAt: c.calibratedAt.toISOString(), validUntil: c.validUntil.toISOString(), certificateNumber: c.certificateNumber });
const instRef = (i: InstrumentRef | null) => (i ? { id: i.id, name: i.name, model: i.model, serial: i.serial } : null);

function useOf(instrument: InstrumentRef | null, calibrations: CalibrationRef[], at: Date): { status: UseStatus; calibration: CalibrationRef | null } {
  if (!instrument) return { status: "not_named", calibration: null };
  const inForce = calibrationInForce(calibrations.filter((c) => c.instrumentId === instrument.id), at);
  if (!inForce) return { status: "uncalibrated", calibration: null };
  if (at.getTime() > inForce.validUntil.getTime()) return { status: "expired", calibration: inForce };
  return { status: "calibrated", calibration: inForce };
}

/**
 * The correction of one strike: a recorder calibrated at the time removes its offset and brings its
 * own uncertainty; an expired, uncalibrated or unnamed one leaves the frequencies as recorded and
 * brings the workshop's assumed tolerance (rectangular, GUM §4.3.7). The same for the thermometer
 * when a temperature was given; its calibration's uncertainty (U/k, GUM §4.3.3) replaces the assumed ±.
 */
export function strikeCorrection(s: StrikeInstruments, calibrations: CalibrationRef[], assumed: AssumedTolerances): InstrumentCorrection {
  const rec = useOf(s.recorder, calibrations, s.at);
  const recCal = rec.status === "calibrated" ? rec.calibration : null;
  const clock = recCal && recCal.offsetPpm !== null && recCal.offsetUncertaintyPpm !== null ? { offsetPpm: recCal.offsetPpm, standardUncertaintyPpm: recCal.offsetUncertaintyPpm } : undefined;
  const correction: StrikeCorrection = {
    strikeId: s.strikeId,
    recorder: {
      instrument: instRef(s.recorder),
      status: rec.status,
      calibration: rec.calibration ? calRef(rec.calibration) : null,
      offsetPpm: clock?.offsetPpm ?? 0,
      standardUncertaintyPpm: clock?.standardUncertaintyPpm ?? assumed.clockHalfWidthPpm / Math.sqrt(3),
      assumed: !clock,
    },
    thermometer: null,
  };
  let thermometer: InstrumentCorrection["thermometer"];
  if (s.temperatureC !== null) {
    const th = useOf(s.thermometer, calibrations, s.at);
    const thCal = th.status === "calibrated" && th.calibration?.points?.length && th.calibration.uncertaintyC !== null ? th.calibration : null;
    const at = thCal ? thermometerOffsetAt(thCal.points!, s.temperatureC) : { offsetC: 0, withinRange: true };
    if (thCal) thermometer = { offsetC: at.offsetC, standardUncertaintyC: thCal.uncertaintyC! };
    correction.thermometer = {
      instrument: instRef(s.thermometer),
      status: th.status,
      calibration: th.calibration ? calRef(th.calibration) : null,
      readingC: s.temperatureC,
      offsetC: at.offsetC,
      correctedC: s.temperatureC - at.offsetC,
      standardUncertaintyC: thermometer?.standardUncertaintyC ?? assumed.thermometerHalfWidthC / Math.sqrt(3),
      assumed: !thermometer,
      withinCalibratedRange: at.withinRange,
    };
  }
  return { correction, clock, thermometer };
}

/** The sentence every evaluation carries for an instrument without a valid calibration. */
export const ASSUMED_TOLERANCE_WORDS = "uncalibrated instrument: assumed tolerance used";

const fmtDay = (iso: string) => iso.slice(0, 10);
const plusMinus = (v: number, unit: string) => `±${Number(v.toFixed(3))} ${unit}`;

/**
 * Plain-words notes on a unit's instruments, one per instrument (or missing one) whose assumed
 * tolerance was used, and one per thermometer reading outside its calibrated points; and whether
 * the chain holds for every strike (traceability can be stated only then).
 */
export function instrumentNotes(corrections: StrikeCorrection[], assumed: AssumedTolerances): { notes: string[]; traceable: boolean } {
  const notes: string[] = [];
  const seen = new Set<string>();
  const add = (key: string, text: string) => {
    if (seen.has(key)) return;
    seen.add(key);
    notes.push(text);
  };
  let traceable = corrections.length > 0;
  const strikeNo = (id: string) => corrections.findIndex((c) => c.strikeId === id) + 1;
  for (const c of corrections) {
    const r = c.recorder;
    if (r.assumed) {
      traceable = false;
      const tol = plusMinus(assumed.clockHalfWidthPpm, "ppm");
      if (!r.instrument) add("rec:none", `No recorder named for strike ${strikeNo(c.strikeId)}: ${ASSUMED_TOLERANCE_WORDS} (${tol} for the recording clock).`);
      else if (r.status === "expired") add(`rec:${r.instrument.id}`, `Recorder “${r.instrument.name}”: calibration ${r.calibration!.number} expired on ${fmtDay(r.calibration!.validUntil)} — ${ASSUMED_TOLERANCE_WORDS} (${tol}), no offset corrected.`);
      else add(`rec:${r.instrument.id}`, `Recorder “${r.instrument.name}”: ${ASSUMED_TOLERANCE_WORDS} (${tol}), no offset corrected.`);
    }
    const t = c.thermometer;
    if (t) {
      if (t.assumed) {
        traceable = false;
        const tol = plusMinus(assumed.thermometerHalfWidthC, "°C");
        if (!t.instrument) add("th:none", `No thermometer named for strike ${strikeNo(c.strikeId)}: ${ASSUMED_TOLERANCE_WORDS} (${tol}).`);
        else if (t.status === "expired") add(`th:${t.instrument.id}`, `Thermometer “${t.instrument.name}”: calibration ${t.calibration!.number} expired on ${fmtDay(t.calibration!.validUntil)} — ${ASSUMED_TOLERANCE_WORDS} (${tol}), no offset corrected.`);
        else add(`th:${t.instrument.id}`, `Thermometer “${t.instrument.name}”: ${ASSUMED_TOLERANCE_WORDS} (${tol}), no offset corrected.`);
      } else if (!t.withinCalibratedRange) {
        add(`th-range:${t.instrument!.id}`, `Thermometer “${t.instrument!.name}”: the reading ${t.readingC} °C lies outside its calibrated points; the nearest point's offset was used.`);
      }
    }
  }
  return { notes, traceable };
}
