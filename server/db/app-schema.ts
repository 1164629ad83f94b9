/**
 * Tinelog's own tables, beside the ones better-auth generates (auth-schema.ts). Every row that
 * belongs to a workshop carries `workshopId`; queries always filter on it.
 */
import { sql } from "drizzle-orm";
import { index, integer, real, sqliteTable, text, uniqueIndex, type AnySQLiteColumn } from "drizzle-orm/sqlite-core";
import { organization, user } from "./auth-schema.ts";

const now = sql`(cast(unixepoch('subsecond') * 1000 as integer))`;
const createdAt = () => integer("created_at", { mode: "timestamp_ms" }).notNull().default(now);

/** Every e-mail Tinelog tried to send: to whom, what, the transport's message id, and the outcome. */
export const mailMessage = sqliteTable(
  "mail_message",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").references(() => organization.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: ["invitation", "certificate", "certificate_notice", "other"] }).notNull(),
    relatedId: text("related_id"),
    fromAddress: text("from_address").notNull(),
    replyTo: text("reply_to"),
    toAddress: text("to_address").notNull(),
    subject: text("subject").notNull(),
    /** The message as handed to nodemailer (text, html, attachments base64), so a failed send can be retried. */
    payload: text("payload", { mode: "json" }).notNull(),
    state: text("state", { enum: ["sending", "sent", "failed"] }).notNull(),
    error: text("error"),
    transportMessageId: text("transport_message_id"),
    attempts: integer("attempts").notNull().default(0),
    createdAt: createdAt(),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("mail_message_workshop_idx").on(t.workshopId, t.createdAt)],
);

/** Raw messages received by the in-process SMTP capture server (development and tests). */
export const capturedMail = sqliteTable(
  "captured_mail",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    messageId: text("message_id"),
    envelopeFrom: text("envelope_from"),
    envelopeTo: text("envelope_to", { mode: "json" }).$type<string[]>().notNull(),
    raw: text("raw").notNull(),
    receivedAt: createdAt(),
  },
  (t) => [index("captured_mail_message_id_idx").on(t.messageId)],
);

/** Append-only record of who did what, so every change can be traced to a person. Never updated or deleted. */
export const auditEvent = sqliteTable(
  "audit_event",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    actorId: text("actor_id").references(() => user.id),
    action: text("action").notNull(),
    entity: text("entity").notNull(),
    entityId: text("entity_id").notNull(),
    before: text("before", { mode: "json" }),
    after: text("after", { mode: "json" }),
    at: createdAt(),
  },
  (t) => [index("audit_event_workshop_idx").on(t.workshopId, t.at), index("audit_event_entity_idx").on(t.workshopId, t.entityId, t.id)],
);

/**
 * Failed sign-ins counted per key (an address, or an address and an account) in a fixed window that
 * starts at the first failure. Only failures count: a successful sign-in never uses up an attempt.
 */
export const signInFailure = sqliteTable("sign_in_failure", {
  key: text("key").primaryKey(),
  count: integer("count").notNull(),
  /** When the window of this count began, ms since the epoch. */
  windowStartedAt: integer("window_started_at").notNull(),
});


/** Workshop details used on certificates and in mail (one row per workshop). */
export const workshopProfile = sqliteTable("workshop_profile", {
  workshopId: text("workshop_id").primaryKey().references(() => organization.id, { onDelete: "cascade" }),
  address: text("address").notNull().default(""),
  sendingEmail: text("sending_email").notNull().default(""),
  qualityEmail: text("quality_email").notNull().default(""),
  certificatePrefix: text("certificate_prefix").notNull().default("TL"),
  /** Instrument tolerances that enter the uncertainty of every measured frequency (see shared/evaluation.ts). */
  clockTolerancePpm: real("clock_tolerance_ppm").notNull().default(50),
  thermometerToleranceC: real("thermometer_tolerance_c").notNull().default(0.5),
  /** How well the specs' temperature coefficients are known, ± % of the coefficient (an assumption; see shared/evaluation.ts). */
  tempCoefficientTolerancePercent: real("temp_coefficient_tolerance_percent").notNull().default(20),
  updatedAt: createdAt(),
});

/** A measuring instrument of the workshop: a recorder (its sample clock) or a thermometer. */
export const instrument = sqliteTable(
  "instrument",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: ["recorder", "thermometer"] }).notNull(),
    name: text("name").notNull(),
    model: text("model").notNull().default(""),
    serial: text("serial").notNull().default(""),
    /** How long a calibration stays valid, months. */
    validityMonths: integer("validity_months").notNull(),
    createdBy: text("created_by").references(() => user.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("instrument_name_unique").on(t.workshopId, t.name)],
);

/**
 * A calibration of an instrument: appended, never changed (a new calibration is a new row). A
 * recorder's holds the clock offset measured from reference tones; a thermometer's the offsets at
 * the points of its certificate. Uncertainties are standard (k = 1).
 */
export const instrumentCalibration = sqliteTable(
  "instrument_calibration",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    instrumentId: text("instrument_id").notNull().references(() => instrument.id, { onDelete: "cascade" }),
    /** Workshop-wide record number, e.g. CAL-2026-0003. */
    number: text("number").notNull(),
    calibratedAt: integer("calibrated_at", { mode: "timestamp_ms" }).notNull(),
    validUntil: integer("valid_until", { mode: "timestamp_ms" }).notNull(),
    offsetPpm: real("offset_ppm"),
    offsetUncertaintyPpm: real("offset_uncertainty_ppm"),
    points: text("points", { mode: "json" }),
    uncertaintyC: real("uncertainty_c"),
    certificateNumber: text("certificate_number").notNull().default(""),
    /** Tones with their measurement, the frequency-dependence check, warnings, reference, who calibrated. */
    detail: text("detail", { mode: "json" }).notNull(),
    createdBy: text("created_by").references(() => user.id),
    createdAt: createdAt(),
  },
  (t) => [index("instrument_calibration_instrument_idx").on(t.instrumentId, t.calibratedAt), uniqueIndex("instrument_calibration_number_unique").on(t.workshopId, t.number)],
);

export const spec = sqliteTable(
  "spec",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    createdAt: createdAt(),
  },
  (t) => [index("spec_workshop_idx").on(t.workshopId)],
);

/** An immutable version of a spec: editing a spec appends a version. */
export const specVersion = sqliteTable(
  "spec_version",
  {
    id: text("id").primaryKey(),
    specId: text("spec_id").notNull().references(() => spec.id, { onDelete: "cascade" }),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    version: integer("version").notNull(),
    name: text("name").notNull(),
    family: text("family").notNull(),
    description: text("description").notNull().default(""),
    referenceTemperatureC: real("reference_temperature_c").notNull(),
    tempCoefficientPerC: real("temp_coefficient_per_c").notNull(),
    decisionRule: text("decision_rule").notNull(),
    strikesRequired: integer("strikes_required").notNull(),
    lengthMm: real("length_mm"),
    /** A4, Hz, for targets given as note names (ISO 16: 440 Hz). */
    referencePitchHz: real("reference_pitch_hz").notNull().default(440),
    changeNote: text("change_note").notNull().default(""),
    createdBy: text("created_by").references(() => user.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("spec_version_unique").on(t.specId, t.version)],
);

export const specPartial = sqliteTable("spec_partial", {
  id: text("id").primaryKey(),
  specVersionId: text("spec_version_id").notNull().references(() => specVersion.id, { onDelete: "cascade" }),
  position: integer("position").notNull(),
  label: text("label").notNull(),
  isFundamental: integer("is_fundamental", { mode: "boolean" }).notNull(),
  targetKind: text("target_kind").notNull(),
  targetHz: real("target_hz"),
  /** The note name the target was given as ("C#5"); targetHz holds its frequency at the reference pitch. */
  targetNote: text("target_note"),
  ratio: real("ratio"),
  toleranceCents: real("tolerance_cents").notNull(),
  /** The tolerance as it was given (cents, Hz or ppm); toleranceCents is what the evaluation uses. */
  toleranceUnit: text("tolerance_unit").notNull().default("cents"),
  toleranceValue: real("tolerance_value"),
  minT60S: real("min_t60_s"),
  minQ: real("min_q"),
  maxBeatHz: real("max_beat_hz"),
  required: integer("required", { mode: "boolean" }).notNull(),
});

export const batch = sqliteTable(
  "batch",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    code: text("code").notNull(),
    specVersionId: text("spec_version_id").notNull().references(() => specVersion.id),
    quantity: integer("quantity").notNull(),
    state: text("state", { enum: ["open", "in_review", "released"] }).notNull().default("open"),
    notes: text("notes").notNull().default(""),
    createdBy: text("created_by").references(() => user.id),
    createdAt: createdAt(),
    releasedBy: text("released_by").references(() => user.id),
    releasedAt: integer("released_at", { mode: "timestamp_ms" }),
  },
  (t) => [uniqueIndex("batch_code_unique").on(t.workshopId, t.code)],
);

export const unit = sqliteTable(
  "unit",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    batchId: text("batch_id").notNull().references(() => batch.id, { onDelete: "cascade" }),
    serial: text("serial").notNull(),
    position: integer("position").notNull(),
    customerName: text("customer_name"),
    customerEmail: text("customer_email"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("unit_serial_unique").on(t.workshopId, t.serial), index("unit_batch_idx").on(t.batchId, t.position)],
);

/** One uploaded recording and its analysis job state (the durable queue lives here). */
export const strike = sqliteTable(
  "strike",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    unitId: text("unit_id").notNull().references(() => unit.id, { onDelete: "cascade" }),
    uploadedBy: text("uploaded_by").references(() => user.id),
    uploadedAt: createdAt(),
    originalName: text("original_name").notNull(),
    sha256: text("sha256").notNull(),
    fileKey: text("file_key").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    sampleRate: integer("sample_rate"),
    channels: integer("channels"),
    bitsPerSample: integer("bits_per_sample"),
    encoding: text("encoding"),
    durationS: real("duration_s"),
    temperatureC: real("temperature_c"),
    support: text("support"),
    /** The recorder the strike was recorded with, and the thermometer its temperature was read on. */
    recorderId: text("recorder_id").references(() => instrument.id),
    thermometerId: text("thermometer_id").references(() => instrument.id),
    state: text("state", { enum: ["queued", "analysing", "done", "failed"] }).notNull().default("queued"),
    failureCode: text("failure_code"),
    failureReason: text("failure_reason"),
    attempts: integer("attempts").notNull().default(0),
    startedAt: integer("started_at", { mode: "timestamp_ms" }),
    finishedAt: integer("finished_at", { mode: "timestamp_ms" }),
  },
  (t) => [
    index("strike_unit_idx").on(t.unitId, t.uploadedAt),
    index("strike_state_idx").on(t.state),
    // Not unique: a voided strike's recording may be uploaded again (the service refuses live duplicates).
    index("strike_unit_sha_idx").on(t.unitId, t.sha256),
  ],
);

/**
 * A strike taken out of the record (a wrong file, another unit's recording): the strike and its
 * measurement stay, struck through, and the unit is evaluated again without it. One void per
 * strike, never undone; appended, chained and audited like the rest of the quality record.
 */
export const strikeVoid = sqliteTable(
  "strike_void",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    strikeId: text("strike_id").notNull().references(() => strike.id, { onDelete: "cascade" }),
    unitId: text("unit_id").notNull().references(() => unit.id, { onDelete: "cascade" }),
    reason: text("reason").notNull(),
    voidedBy: text("voided_by").references(() => user.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("strike_void_strike_unique").on(t.strikeId), index("strike_void_unit_idx").on(t.unitId)],
);

/** The analysis of a strike: appended once, never updated (re-analysis would append). */
export const measurement = sqliteTable(
  "measurement",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    strikeId: text("strike_id").notNull().references(() => strike.id, { onDelete: "cascade" }),
    analyserVersion: text("analyser_version").notNull(),
    result: text("result", { mode: "json" }).notNull(),
    plot: text("plot", { mode: "json" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("measurement_strike_unique").on(t.strikeId)],
);

/** Measured partials, one row each, for queries across the ledger. */
export const partial = sqliteTable(
  "partial",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    measurementId: text("measurement_id").notNull().references(() => measurement.id, { onDelete: "cascade" }),
    segment: integer("segment").notNull(),
    position: integer("position").notNull(),
    frequencyHz: real("frequency_hz").notNull(),
    frequencyUncertaintyHz: real("frequency_uncertainty_hz").notNull(),
    amplitudeDb: real("amplitude_db").notNull(),
    tauS: real("tau_s").notNull(),
    tauUncertaintyS: real("tau_uncertainty_s").notNull(),
    t60S: real("t60_s").notNull(),
    q: real("q").notNull(),
    fitR2: real("fit_r2").notNull(),
    beatHz: real("beat_hz"),
    tauUnreliable: integer("tau_unreliable", { mode: "boolean" }).notNull(),
  },
  (t) => [index("partial_measurement_idx").on(t.measurementId)],
);

/** A unit's verdict against its spec version; appended after every finished strike. */
export const evaluation = sqliteTable(
  "evaluation",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    unitId: text("unit_id").notNull().references(() => unit.id, { onDelete: "cascade" }),
    specVersionId: text("spec_version_id").notNull().references(() => specVersion.id),
    verdict: text("verdict", { enum: ["within_tolerance", "out_of_tolerance", "inconclusive"] }).notNull(),
    detail: text("detail", { mode: "json" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("evaluation_unit_idx").on(t.unitId, t.createdAt)],
);

export const disposition = sqliteTable(
  "disposition",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    unitId: text("unit_id").notNull().references(() => unit.id, { onDelete: "cascade" }),
    evaluationId: text("evaluation_id").references(() => evaluation.id),
    decision: text("decision", { enum: ["use_as_is", "rework", "scrap", "retest"] }).notNull(),
    reason: text("reason").notNull(),
    decidedBy: text("decided_by").references(() => user.id),
    createdAt: createdAt(),
    /** The disposition this one replaces (a correction before release); null for a first decision. */
    supersedesId: text("supersedes_id").references((): AnySQLiteColumn => disposition.id),
  },
  (t) => [index("disposition_unit_idx").on(t.unitId, t.createdAt), uniqueIndex("disposition_supersedes_unique").on(t.supersedesId)],
);

/**
 * The hash chain over the quality record: every measurement, evaluation, disposition and release
 * appends one entry holding the sha256 of the row's canonical content and of the previous entry of
 * the same workshop. `npm run verify-ledger` walks it; triggers forbid UPDATE and DELETE.
 */
export const ledgerEntry = sqliteTable(
  "ledger_entry",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    seq: integer("seq").notNull(),
    kind: text("kind", { enum: ["measurement", "evaluation", "disposition", "release", "strike_void", "certificate_withdrawal", "calibration"] }).notNull(),
    entityId: text("entity_id").notNull(),
    contentHash: text("content_hash").notNull(),
    prevHash: text("prev_hash").notNull(),
    hash: text("hash").notNull(),
    at: createdAt(),
  },
  (t) => [uniqueIndex("ledger_entry_seq_unique").on(t.workshopId, t.seq)],
);

/** Test certificates (issue and amendment); the PDF lives in DATA_DIR, its sha256 here. */
export const certificate = sqliteTable(
  "certificate",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    unitId: text("unit_id").notNull().references(() => unit.id),
    evaluationId: text("evaluation_id").notNull().references(() => evaluation.id),
    number: text("number").notNull(),
    verificationCode: text("verification_code").notNull(),
    recipientEmail: text("recipient_email").notNull(),
    recipientName: text("recipient_name"),
    issuedBy: text("issued_by").references(() => user.id),
    issuedAt: integer("issued_at", { mode: "timestamp_ms" }).notNull(),
    /** The signed canonical data (JSON text exactly as signed). */
    canonical: text("canonical").notNull(),
    signature: text("signature").notNull(),
    pdfSha256: text("pdf_sha256").notNull(),
    pdfKey: text("pdf_key").notNull(),
    amendsId: text("amends_id"),
    amendReason: text("amend_reason"),
    supersededById: text("superseded_by_id"),
    createdAt: createdAt(),
  },
  (t) => [
    // Each workshop numbers its own certificates: two workshops may use the same prefix.
    uniqueIndex("certificate_workshop_number_unique").on(t.workshopId, t.number),
    uniqueIndex("certificate_code_unique").on(t.verificationCode),
    index("certificate_unit_idx").on(t.unitId),
  ],
);

/**
 * One certificate for a consignment: every unit of a released batch that may carry a certificate,
 * with its results. Signed and stored like a unit certificate; numbered in the same series.
 */
export const batchCertificate = sqliteTable(
  "batch_certificate",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    batchId: text("batch_id").notNull().references(() => batch.id),
    number: text("number").notNull(),
    verificationCode: text("verification_code").notNull(),
    recipientEmail: text("recipient_email").notNull(),
    recipientName: text("recipient_name"),
    issuedBy: text("issued_by").references(() => user.id),
    issuedAt: integer("issued_at", { mode: "timestamp_ms" }).notNull(),
    canonical: text("canonical").notNull(),
    signature: text("signature").notNull(),
    pdfSha256: text("pdf_sha256").notNull(),
    pdfKey: text("pdf_key").notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("batch_certificate_workshop_number_unique").on(t.workshopId, t.number),
    uniqueIndex("batch_certificate_code_unique").on(t.verificationCode),
    index("batch_certificate_batch_idx").on(t.batchId),
  ],
);

/**
 * A certificate taken back (unit or batch certificate, by id): the certificate stays on record and
 * its verification page says when and why it was withdrawn. One per certificate, never undone.
 */
export const certificateWithdrawal = sqliteTable(
  "certificate_withdrawal",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    /** A `certificate.id` or a `batch_certificate.id` (ids are UUIDs, unique across both). */
    certificateId: text("certificate_id").notNull(),
    reason: text("reason").notNull(),
    withdrawnBy: text("withdrawn_by").references(() => user.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("certificate_withdrawal_certificate_unique").on(t.certificateId)],
);

/**
 * A predicted mode list of a spec version, imported from a modal analysis: the model of the part
 * free or as held, with the modulus and density the model assumed. Design data, not measurements:
 * a new import of the same condition supersedes the previous list (which stays, for the record).
 */
export const modeList = sqliteTable(
  "mode_list",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").notNull().references(() => organization.id, { onDelete: "cascade" }),
    specVersionId: text("spec_version_id").notNull().references(() => specVersion.id, { onDelete: "cascade" }),
    condition: text("condition", { enum: ["free", "held"] }).notNull(),
    name: text("name").notNull().default(""),
    sourceName: text("source_name"),
    youngsModulusGPa: real("youngs_modulus_gpa"),
    densityKgM3: real("density_kg_m3"),
    createdBy: text("created_by").references(() => user.id),
    createdAt: createdAt(),
  },
  (t) => [index("mode_list_version_idx").on(t.specVersionId, t.condition, t.createdAt)],
);

export const predictedMode = sqliteTable(
  "predicted_mode",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    listId: text("list_id").notNull().references(() => modeList.id, { onDelete: "cascade" }),
    mode: integer("mode").notNull(),
    frequencyHz: real("frequency_hz").notNull(),
    label: text("label").notNull().default(""),
    kind: text("kind", { enum: ["rigid_body", "balanced", "unbalanced", "support"] }),
  },
  (t) => [uniqueIndex("predicted_mode_unique").on(t.listId, t.mode)],
);
