/**
 * The measurement chain's arithmetic against hand calculations.
 *
 * Sources of the expected numbers (derived here independently of the code under test):
 * - JCGM 100:2008 (GUM): standard uncertainty from an expanded one, U/k (§4.3.3); rectangular
 *   distribution of half-width a, u = a/√3 (§4.3.7); combined standard uncertainty of uncorrelated
 *   inputs, u_c² = Σ (cᵢ·u(xᵢ))² (§5.1.2), sensitivities cᵢ = ∂f/∂xᵢ (§5.1.3); correlated inputs add
 *   2·Σ cᵢcⱼ·u(xᵢ)u(xⱼ)·r(xᵢ,xⱼ) (§5.2.2); U = k·u_c, k = 2 (§6.2–6.3).
 * - ISO 13528:2015 §9.7: normalised error Eₙ = (x − y)/√(U_x² + U_y²).
 * - The offset's definition: o = (measured − reference)/reference × 10⁶ ppm; a recorder with offset o
 *   reads f·(1 + o·10⁻⁶), so the true frequency is f_read / (1 + o·10⁻⁶).
 * - Frequency at the reference temperature: f_ref = f / (1 + α·(T − T_ref)).
 */
import { describe, expect, it } from "vitest";
import type { Partial as MeasuredPartial } from "./schemas/analysis.ts";
import { specInputSchema } from "./schemas/spec.ts";
import { evaluateUnit, type EvaluationStrikeInput } from "./evaluation.ts";
import {
  addMonthsUtc,
  ASSUMED_TOLERANCE_WORDS,
  calibrationInForce,
  calibrationStatus,
  combineToneOffsets,
  correctForClock,
  instrumentNotes,
  strikeCorrection,
  thermometerOffsetAt,
  twoSignificant,
  type CalibrationRef,
  type ToneInput,
} from "./traceability.ts";

const partial = (frequencyHz: number, frequencyUncertaintyHz: number): MeasuredPartial => ({
  frequencyHz,
  frequencyUncertaintyHz,
  amplitudeDb: -20,
  tauS: 3,
  tauUncertaintyS: 0.01,
  t60S: 3 * Math.log(1000),
  q: Math.PI * frequencyHz * 3,
  fitR2: 0.99,
  beatHz: null,
  fitStartS: 0.1,
  fitEndS: 3,
  tauUnreliable: false,
});

const spec = specInputSchema.parse({
  name: "Budget fork",
  family: "tuning_fork",
  referenceTemperatureC: 20,
  tempCoefficientPerC: -1e-4,
  strikesRequired: 3,
  partials: [{ label: "Fundamental", isFundamental: true, targetKind: "absolute", targetHz: 440, toleranceCents: 5 }],
});

describe("the fundamental's uncertainty budget against a hand calculation (GUM §5.1.2)", () => {
  // Three strikes on a recorder calibrated to +10 ppm (u = 0.4 ppm) and a thermometer reading
  // 0.2 °C high (u = 0.05 °C, from U = 0.1 °C at k = 2); all read 23.2 °C, i.e. 23.0 °C, ΔT = 3 °C.
  const raw = [440.1, 440.13, 440.16];
  const uFit = [0.002, 0.001, 0.003];
  const strikes: EvaluationStrikeInput[] = raw.map((f, i) => ({
    strikeId: `s${i}`,
    segment: 0,
    temperatureC: 23.2,
    partials: [partial(f, uFit[i])],
    clock: { offsetPpm: 10, standardUncertaintyPpm: 0.4 },
    thermometer: { offsetC: 0.2, standardUncertaintyC: 0.05 },
  }));
  const r = evaluateUnit(spec, strikes, { clockHalfWidthPpm: 50, thermometerHalfWidthC: 0.5, tempCoefficientRelativeHalfWidth: 0.2 });
  const b = r.fundamentalBudget!;

  // By hand: each factor is the same for the three strikes.
  const factor = 1 / (1 + 10e-6) / (1 + -1e-4 * 3);
  const fRef = raw.map((f) => f * factor);
  const median = fRef[1];
  const mean = (fRef[0] + fRef[1] + fRef[2]) / 3;
  const s = Math.sqrt(fRef.reduce((acc, f) => acc + (f - mean) ** 2, 0) / 2); // n − 1 = 2 (GUM §4.2.2)
  const expected = {
    fit: 0.002 * factor, // median of the scaled fit uncertainties
    scatter: s / Math.sqrt(3),
    clock: median * 1e-6 * 0.4, // c = f·10⁻⁶ Hz/ppm
    thermometer: 1e-4 * median * 0.05, // c = |α|·f Hz/°C
    temperature_coefficient: median * 3 * ((1e-4 * 0.2) / Math.sqrt(3)), // c = f·ΔT, u(α) = |α|·0.2/√3
  };
  const uc = Math.sqrt(Object.values(expected).reduce((acc, v) => acc + v * v, 0));

  it("lists fit, scatter, clock, thermometer and temperature coefficient with their contributions", () => {
    expect(b.label).toBe("Fundamental");
    expect(b.measuredHz).toBeCloseTo(median, 10);
    expect(b.components.map((c) => c.source)).toEqual(["fit", "scatter", "clock", "thermometer", "temperature_coefficient"]);
    for (const c of b.components) expect(c.contributionHz).toBeCloseTo(expected[c.source], 12);
    expect(b.components.find((c) => c.source === "clock")!.distribution).toBe("normal");
    expect(b.components.find((c) => c.source === "temperature_coefficient")!.distribution).toBe("rectangular");
  });

  it("combines them as a root sum of squares and expands with k = 2, equal to the evaluation's U", () => {
    expect(b.combinedHz).toBeCloseTo(uc, 12);
    expect(b.expandedHz).toBeCloseTo(2 * uc, 12);
    expect(r.requirements[0].uncertaintyHz).toBeCloseTo(uc, 12);
    expect(r.requirements[0].expandedUncertaintyHz).toBeCloseTo(2 * uc, 12);
  });

  it("uses the assumed tolerances as rectangular half-widths (a/√3, GUM §4.3.7) without calibrations", () => {
    const bare = strikes.map(({ clock: _c, thermometer: _t, ...rest }) => rest);
    const u = evaluateUnit(spec, bare, { clockHalfWidthPpm: 50, thermometerHalfWidthC: 0.5, tempCoefficientRelativeHalfWidth: 0.2 }).fundamentalBudget!;
    const fMed = raw[1] / (1 + -1e-4 * 3.2); // no clock correction; the reading taken as it is, ΔT = 3.2 °C
    expect(u.measuredHz).toBeCloseTo(fMed, 10);
    const clock = u.components.find((c) => c.source === "clock")!;
    expect(clock).toMatchObject({ distribution: "rectangular" });
    expect(clock.contributionHz).toBeCloseTo(fMed * 1e-6 * (50 / Math.sqrt(3)), 12);
    expect(u.components.find((c) => c.source === "thermometer")!.contributionHz).toBeCloseTo(1e-4 * fMed * (0.5 / Math.sqrt(3)), 12);
  });

  it("takes the largest clock uncertainty among strikes of different recorders (a recorder's error does not average out)", () => {
    const mixed = strikes.map((st, i) => (i === 2 ? { ...st, clock: undefined } : st));
    const m = evaluateUnit(spec, mixed, { clockHalfWidthPpm: 50, thermometerHalfWidthC: 0.5 }).fundamentalBudget!;
    expect(m.components.find((c) => c.source === "clock")!.standardUncertainty).toBeCloseTo(50 / Math.sqrt(3), 12);
  });
});

describe("one clock offset from several reference tones", () => {
  const tone = (referenceHz: number, offsetPpm: number, uMeasPpm: number, uRefPpm: number, certificate: string): ToneInput => ({
    referenceHz,
    referenceUncertaintyHz: (uRefPpm * referenceHz) / 1e6,
    referenceCertificate: certificate,
    measuredHz: referenceHz * (1 + offsetPpm * 1e-6),
    measuredUncertaintyHz: (uMeasPpm * referenceHz) / 1e6,
    snrDb: 60,
    clearanceDb: 50,
    decays: false,
    durationS: 5,
    sampleRate: 48000,
    originalName: "t.wav",
    sha256: "0",
  });

  it("weights equal tones equally; one certificate's error stays whole (correlation 1, GUM §5.2.2)", () => {
    const c = combineToneOffsets([tone(440, 10.0, 0.1, 0.5, "GEN-1"), tone(1000, 10.2, 0.1, 0.5, "gen-1 ")]);
    expect(c.offsetPpm).toBeCloseTo(10.1, 4);
    // u² = Σ aᵢ²·u_meas,ᵢ² + (Σ aᵢ·u_ref,ᵢ)² = 2·0.25·0.01 + 0.5² = 0.255
    expect(c.offsetUncertaintyPpm).toBeCloseTo(Math.sqrt(0.255), 4);
    // Eₙ = |Δo| / (2·√(u₁² + u₂² − 2·u_ref,₁·u_ref,₂)) = 0.2 / (2·√0.02) = 0.707: consistent.
    expect(c.frequencyDependence.largestNormalisedError).toBeCloseTo(0.2 / (2 * Math.sqrt(0.02)), 3);
    expect(c.frequencyDependence.consistent).toBe(true);
    expect(c.frequencyDependence.slopePpmPerKHz).toBeCloseTo(0.2 / 0.56, 3);
  });

  it("averages independent references (different certificates) as uncorrelated", () => {
    const c = combineToneOffsets([tone(440, 10.0, 0.1, 0.5, "GEN-1"), tone(1000, 10.2, 0.1, 0.5, "FORK-9")]);
    // u² = Σ aᵢ²·(u_meas,ᵢ² + u_ref,ᵢ²) = 2·0.25·0.26 = 0.13
    expect(c.offsetUncertaintyPpm).toBeCloseTo(Math.sqrt(0.13), 4);
  });

  it("flags an offset that depends on frequency (Eₙ > 1) with a warning in words", () => {
    const c = combineToneOffsets([tone(440, 10, 0.1, 0.2, "A"), tone(1000, 14, 0.1, 0.2, "A")]);
    expect(c.frequencyDependence.consistent).toBe(false);
    expect(c.warnings[0]).toMatch(/\+10\.00 ppm at 440 Hz but \+14\.00 ppm at 1000 Hz.*not a clock error/);
  });

  it("corrects a frequency read at +73 ppm back to the reference", () => {
    expect(correctForClock(1000 * (1 + 73e-6), 73)).toBeCloseTo(1000, 10);
  });
});

describe("thermometer offsets between calibration points", () => {
  const points = [
    { referenceC: 30, offsetC: 0.4 },
    { referenceC: 20, offsetC: 0.2 },
  ];
  it("interpolates linearly on the reading (a point reads reference + offset)", () => {
    // Readings 20.2 and 30.4: at 25.3 the offset is 0.2 + 0.2·(25.3 − 20.2)/(30.4 − 20.2) = 0.3 °C.
    expect(thermometerOffsetAt(points, 25.3)).toEqual({ offsetC: expect.closeTo(0.3, 12), withinRange: true });
  });
  it("holds the nearest point's offset outside the points, saying so", () => {
    expect(thermometerOffsetAt(points, 12)).toEqual({ offsetC: 0.2, withinRange: false });
    expect(thermometerOffsetAt(points, 35)).toEqual({ offsetC: 0.4, withinRange: false });
  });
});

describe("due dates and the calibration in force", () => {
  const now = new Date("2026-06-15T12:00:00Z");
  it("adds calendar months, keeping the day where the month has it", () => {
    expect(addMonthsUtc(new Date("2026-01-31T00:00:00Z"), 1).toISOString()).toBe("2026-02-28T00:00:00.000Z");
    expect(addMonthsUtc(new Date("2025-06-15T12:00:00Z"), 12).toISOString()).toBe("2026-06-15T12:00:00.000Z");
  });
  it("says calibrated, due soon within 30 days, expired after the due date, never without one", () => {
    expect(calibrationStatus(null, now)).toBe("never");
    expect(calibrationStatus({ validUntil: new Date("2026-08-01T00:00:00Z") }, now)).toBe("calibrated");
    expect(calibrationStatus({ validUntil: new Date("2026-07-10T00:00:00Z") }, now)).toBe("due_soon");
    expect(calibrationStatus({ validUntil: new Date("2026-06-15T11:59:59Z") }, now)).toBe("expired");
  });
  it("picks the newest calibration made on or before the measurement", () => {
    const cals = [{ calibratedAt: new Date("2026-01-01") }, { calibratedAt: new Date("2026-05-01") }, { calibratedAt: new Date("2026-07-01") }];
    expect(calibrationInForce(cals, now)).toBe(cals[1]);
    expect(calibrationInForce(cals, new Date("2025-12-31"))).toBeNull();
  });
});

describe("a strike's correction and the words of the evaluation", () => {
  const recorder = { id: "r1", kind: "recorder" as const, name: "Bench A", model: "", serial: "" };
  const cal = (o: Partial<CalibrationRef>): CalibrationRef => ({
    id: "c1",
    number: "CAL-2026-0001",
    instrumentId: "r1",
    calibratedAt: new Date("2026-01-01T00:00:00Z"),
    validUntil: new Date("2027-01-01T00:00:00Z"),
    certificateNumber: "GEN-1",
    offsetPpm: 18,
    offsetUncertaintyPpm: 0.3,
    points: null,
    uncertaintyC: null,
    ...o,
  });
  const assumed = { clockHalfWidthPpm: 50, thermometerHalfWidthC: 0.5 };
  const at = new Date("2026-06-01T00:00:00Z");

  it("applies a calibration in force", () => {
    const c = strikeCorrection({ strikeId: "s", at, temperatureC: null, recorder, thermometer: null }, [cal({})], assumed);
    expect(c.clock).toEqual({ offsetPpm: 18, standardUncertaintyPpm: 0.3 });
    expect(c.correction.recorder).toMatchObject({ status: "calibrated", offsetPpm: 18, assumed: false });
    expect(instrumentNotes([c.correction], assumed)).toEqual({ notes: [], traceable: true });
  });

  it("uses the assumed tolerance for an expired, an uncalibrated and an unnamed recorder, and says so", () => {
    const expired = strikeCorrection({ strikeId: "s1", at, temperatureC: null, recorder, thermometer: null }, [cal({ validUntil: new Date("2026-05-01T00:00:00Z") })], assumed);
    expect(expired.clock).toBeUndefined();
    expect(expired.correction.recorder).toMatchObject({ status: "expired", offsetPpm: 0, assumed: true });
    expect(expired.correction.recorder.standardUncertaintyPpm).toBeCloseTo(50 / Math.sqrt(3), 12);
    const never = strikeCorrection({ strikeId: "s2", at, temperatureC: null, recorder: { ...recorder, id: "r2", name: "Spare" }, thermometer: null }, [cal({})], assumed);
    const unnamed = strikeCorrection({ strikeId: "s3", at, temperatureC: 21, recorder: null, thermometer: null }, [], assumed);
    const { notes, traceable } = instrumentNotes([expired.correction, never.correction, unnamed.correction], assumed);
    expect(traceable).toBe(false);
    expect(notes).toHaveLength(4);
    for (const n of notes) expect(n).toContain(ASSUMED_TOLERANCE_WORDS);
    expect(notes[0]).toMatch(/Recorder “Bench A”: calibration CAL-2026-0001 expired on 2026-05-01/);
    expect(notes[3]).toMatch(/No thermometer named for strike 3.*±0.5 °C/);
  });
});

describe("two significant digits", () => {
  it("writes small values with a power of ten", () => {
    expect(twoSignificant(0.012690231)).toBe("0.013");
    expect(twoSignificant(6.1e-7)).toBe("6.1×10⁻⁷");
    expect(twoSignificant(732.67)).toBe("730");
  });
});
