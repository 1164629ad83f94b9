/**
 * Measuring instruments and their calibrations: the recorders whose sample clock counts every
 * frequency, and the thermometers whose readings correct them to the reference temperature.
 * The same schemas validate the forms and the API requests. Uncertainties named `…Uncertainty…`
 * are standard uncertainties (k = 1); `expanded…` ones are k = 2.
 */
import { z } from "zod";

export const instrumentKinds = ["recorder", "thermometer"] as const;
export type InstrumentKind = (typeof instrumentKinds)[number];
export const instrumentKindLabels: Record<InstrumentKind, string> = { recorder: "Recorder", thermometer: "Thermometer" };

/** Where an instrument stands today (or at the time of a measurement). */
export const calibrationStatuses = ["calibrated", "due_soon", "expired", "never"] as const;
export type CalibrationStatus = (typeof calibrationStatuses)[number];
export const calibrationStatusLabels: Record<CalibrationStatus, string> = {
  calibrated: "Calibrated",
  due_soon: "Due soon",
  expired: "Expired",
  never: "Never calibrated",
};

const optionalText = (max: number, what: string) =>
  z
    .string()
    .trim()
    .max(max, `Keep the ${what} under ${max} characters.`)
    .optional()
    .transform((v) => v ?? "");

/** Body of `POST /api/instruments`. */
export const createInstrumentSchema = z.object({
  kind: z.enum(instrumentKinds, { error: 'Choose what it is: "recorder" or "thermometer".' }),
  name: z.string({ error: "Give the instrument a name, e.g. Bench recorder 1." }).trim().min(1, "Give the instrument a name, e.g. Bench recorder 1.").max(80, "Keep the name under 80 characters."),
  model: optionalText(120, "model"),
  serial: optionalText(80, "serial number"),
  validityMonths: z.coerce
    .number({ error: "Give how long a calibration stays valid, in months (e.g. 12)." })
    .int("Give whole months.")
    .min(1, "A calibration is valid for at least 1 month.")
    .max(60, "At most 60 months (5 years)."),
});
export type CreateInstrumentInput = z.infer<typeof createInstrumentSchema>;

const isoDay = z.iso.date("Give the date as YYYY-MM-DD.");

/** A date not after today (UTC), as YYYY-MM-DD; empty means today. */
const calibratedOnSchema = z
  .union([z.literal(""), isoDay])
  .optional()
  .transform((v) => (v ? v : null))
  .refine((v) => v === null || v <= new Date().toISOString().slice(0, 10), "The calibration date cannot be in the future.");

const positiveNumber = (what: string, max: number) =>
  z.coerce.number({ error: `Give ${what} as a number.` }).refine(Number.isFinite, `Give ${what} as a number.`).refine((v) => v > 0, `${what[0].toUpperCase()}${what.slice(1)} must be greater than 0.`).refine((v) => v <= max, `${what[0].toUpperCase()}${what.slice(1)} must be at most ${max}.`);

/** One value or the same field repeated (multipart sends a repeated field as an array). */
const oneOrMany = <T extends z.ZodTypeAny>(item: T) => z.union([item, z.array(item).min(1).max(8)]).transform((v) => (Array.isArray(v) ? v : [v]) as z.infer<T>[]);

/**
 * The fields beside the `audio` files of a recorder calibration (strings on the wire). Each file has
 * its reference frequency (the field repeated in file order); uncertainty and certificate may be
 * given once for all files or once per file. The reference uncertainty is the one on the
 * reference's certificate, expanded with its coverage factor (k = 2 unless `referenceCoverageFactor` says otherwise).
 */
export const recorderCalibrationFieldsSchema = z.object({
  referenceHz: oneOrMany(positiveNumber("the reference frequency in Hz", 100_000)),
  referenceUncertaintyHz: oneOrMany(positiveNumber("the reference's uncertainty in Hz", 1000)),
  referenceCoverageFactor: z.coerce.number({ error: "Give the coverage factor k as a number (usually 2)." }).min(1, "k is at least 1.").max(3, "k is at most 3.").optional().default(2),
  referenceCertificate: oneOrMany(z.string().trim().min(1, "Give the reference's certificate number.").max(80, "Keep the certificate number under 80 characters.")),
  /** What the reference is, e.g. "signal generator SG-2" or "reference fork 440 Hz". */
  referenceDescription: optionalText(160, "description of the reference"),
  calibratedOn: calibratedOnSchema,
  note: optionalText(500, "note"),
});
export type RecorderCalibrationFields = z.infer<typeof recorderCalibrationFieldsSchema>;

/** One calibration point of a thermometer: at the reference temperature, it read `offsetC` too high (negative: too low). */
export const thermometerPointSchema = z.object({
  referenceC: z.number({ error: "Give the reference temperature in °C." }).min(-50, "At least −50 °C.").max(150, "At most 150 °C."),
  offsetC: z.number({ error: "Give the offset (reading − reference) in °C." }).min(-10, "An offset beyond ±10 °C is not a usable thermometer.").max(10, "An offset beyond ±10 °C is not a usable thermometer."),
});
export type ThermometerPoint = z.infer<typeof thermometerPointSchema>;

/** Body of a thermometer calibration (JSON): the numbers of its calibration certificate. */
export const thermometerCalibrationSchema = z
  .object({
    points: z.array(thermometerPointSchema).min(1, "Give at least one calibration point.").max(12, "At most 12 calibration points."),
    /** Expanded uncertainty of the calibration as on the certificate, °C. */
    uncertaintyC: z.number({ error: "Give the calibration's uncertainty in °C." }).positive("The uncertainty must be greater than 0 °C.").max(5, "At most 5 °C."),
    coverageFactor: z.number().min(1, "k is at least 1.").max(3, "k is at most 3.").optional().default(2),
    certificateNumber: z.string({ error: "Give the calibration certificate's number." }).trim().min(1, "Give the calibration certificate's number.").max(80, "Keep the certificate number under 80 characters."),
    /** Who calibrated it (a laboratory, or the workshop against its reference thermometer). */
    calibratedBy: optionalText(160, "name of who calibrated it"),
    calibratedOn: calibratedOnSchema,
    /** The due date on the certificate; absent: the calibration date plus the instrument's validity. */
    dueOn: z.union([z.literal(""), isoDay]).optional().transform((v) => (v ? v : null)),
    note: optionalText(500, "note"),
  })
  .superRefine((v, ctx) => {
    const seen = new Set<number>();
    v.points.forEach((p, i) => {
      if (seen.has(p.referenceC)) ctx.addIssue({ code: "custom", path: ["points", i, "referenceC"], message: "Each point needs its own reference temperature." });
      seen.add(p.referenceC);
    });
    if (v.dueOn && v.calibratedOn && v.dueOn <= v.calibratedOn) ctx.addIssue({ code: "custom", path: ["dueOn"], message: "The due date must come after the calibration date." });
  });
export type ThermometerCalibrationInput = z.input<typeof thermometerCalibrationSchema>;

/** One reference tone of a recorder calibration, as measured. */
export type ToneResult = {
  referenceHz: number;
  /** Standard uncertainty (k = 1) of the reference frequency, Hz. */
  referenceUncertaintyHz: number;
  referenceCertificate: string;
  /** The tone as this recorder reads it, Hz, and the fit's standard uncertainty. */
  measuredHz: number;
  measuredUncertaintyHz: number;
  /** (measured − reference) / reference × 10⁶. */
  offsetPpm: number;
  /** Standard uncertainties of the offset from the measurement, from the reference, and combined, ppm. */
  measurementUncertaintyPpm: number;
  referenceUncertaintyPpm: number;
  uncertaintyPpm: number;
  snrDb: number;
  clearanceDb: number;
  decays: boolean;
  durationS: number;
  sampleRate: number;
  originalName: string;
  sha256: string;
};

/** Whether the tones of one calibration agree on one offset (a clock error is the same at every frequency). */
export type FrequencyDependence = {
  /** False with a single tone: nothing to compare. */
  checked: boolean;
  /** Largest normalised error |oᵢ − oⱼ| / √(Uᵢ² + Uⱼ²) between two tones (k = 2); ≤ 1 agrees. */
  largestNormalisedError: number | null;
  /** Least-squares slope of offset against frequency, ppm per kHz. */
  slopePpmPerKHz: number | null;
  consistent: boolean;
};

export type CalibrationView = {
  id: string;
  number: string;
  instrumentId: string;
  kind: InstrumentKind;
  calibratedAt: string;
  validUntil: string;
  /** Recorder: the clock offset (measured − reference)/reference × 10⁶ and its standard uncertainty, ppm. */
  offsetPpm: number | null;
  offsetUncertaintyPpm: number | null;
  /** Expanded uncertainty of the offset (k = 2), ppm. */
  expandedOffsetUncertaintyPpm: number | null;
  tones: ToneResult[] | null;
  frequencyDependence: FrequencyDependence | null;
  /** Thermometer: offsets at the calibration points, and the standard uncertainty, °C. */
  points: ThermometerPoint[] | null;
  uncertaintyC: number | null;
  expandedUncertaintyC: number | null;
  certificateNumber: string;
  referenceDescription: string;
  calibratedBy: string;
  note: string;
  warnings: string[];
  createdAt: string;
  createdBy: { id: string; name: string } | null;
};

export type InstrumentSummary = {
  id: string;
  kind: InstrumentKind;
  name: string;
  model: string;
  serial: string;
  validityMonths: number;
  status: CalibrationStatus;
  /** Days until the current calibration's due date (negative: overdue); null when never calibrated. */
  dueInDays: number | null;
  latest: CalibrationView | null;
  calibrations: number;
  createdAt: string;
};

export type InstrumentDetail = InstrumentSummary & { history: CalibrationView[] };

/** `201` answer of a calibration upload (more fields than the four the contract names). */
export type CalibrationCreated = { id: string; offsetPpm: number | null; offsetUncertaintyPpm: number | null; validUntil: string; calibration: CalibrationView };

/** How an instrument stood for one measurement. */
export type UseStatus = "calibrated" | "expired" | "uncalibrated" | "not_named";

/** The correction a strike's frequencies (and temperature) received in an evaluation. */
export type StrikeCorrection = {
  strikeId: string;
  recorder: {
    instrument: { id: string; name: string; model: string; serial: string } | null;
    status: UseStatus;
    calibration: { id: string; number: string; calibratedAt: string; validUntil: string; certificateNumber: string } | null;
    /** Offset removed from every frequency, ppm (0 when none applied); f_corrected = f_recorded / (1 + offset × 10⁻⁶). */
    offsetPpm: number;
    /** Standard uncertainty of the clock used in the budget, ppm. */
    standardUncertaintyPpm: number;
    /** True when the workshop's assumed tolerance was used instead of a calibration. */
    assumed: boolean;
  };
  /** Null when the strike has no temperature (no correction, no thermometer). */
  thermometer: {
    instrument: { id: string; name: string; model: string; serial: string } | null;
    status: UseStatus;
    calibration: { id: string; number: string; calibratedAt: string; validUntil: string; certificateNumber: string } | null;
    readingC: number;
    /** Offset of the reading removed, °C; corrected = reading − offset. */
    offsetC: number;
    correctedC: number;
    standardUncertaintyC: number;
    assumed: boolean;
    /** False when the reading lies outside the calibrated points (the nearest point's offset is used). */
    withinCalibratedRange: boolean;
  } | null;
};

/** One component of an uncertainty budget (GUM's table of input quantities). */
export type BudgetComponent = {
  source: "fit" | "scatter" | "clock" | "thermometer" | "temperature_coefficient";
  /** How the value was obtained, in plain words. */
  basis: string;
  distribution: "normal" | "rectangular";
  /** Standard uncertainty of the input, in `unit`. */
  standardUncertainty: number;
  unit: "Hz" | "ppm" | "°C" | "1/°C";
  /** Sensitivity coefficient: Hz of frequency per `unit` of the input. */
  sensitivity: number;
  /** |sensitivity| × standard uncertainty, Hz. */
  contributionHz: number;
};

/** The components' names, as the screens and the certificate show them. */
export const budgetComponentLabels: Record<BudgetComponent["source"], string> = {
  fit: "Frequency fit",
  scatter: "Scatter of strikes",
  clock: "Recording clock",
  thermometer: "Thermometer reading",
  temperature_coefficient: "Temperature coefficient",
};

export type UncertaintyBudget = {
  label: string;
  measuredHz: number;
  components: BudgetComponent[];
  /** Combined standard uncertainty (root sum of squares), Hz. */
  combinedHz: number;
  coverageFactor: number;
  expandedHz: number;
};

/** What an evaluation stores about its instruments: per strike, the instruments used and notes. */
export type EvaluationTraceability = {
  strikes: StrikeCorrection[];
  /** Plain-words notes, e.g. "Recorder “Spare”: uncalibrated instrument: assumed tolerance used (±50 ppm)." */
  notes: string[];
  /** True when every strike's recorder (and thermometer, where a temperature was given) was in calibration. */
  traceable: boolean;
  budget: UncertaintyBudget | null;
};

/** `GET /api/dashboard` lists these: instruments whose calibration is due within 30 days, or overdue. */
export type InstrumentDue = { id: string; kind: InstrumentKind; name: string; status: CalibrationStatus; validUntil: string | null; dueInDays: number | null };
