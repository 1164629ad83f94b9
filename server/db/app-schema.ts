/**
 * Tinelog's own tables, beside the ones better-auth generates (auth-schema.ts). Every row that
 * belongs to a workshop carries `workshopId`; queries always filter on it.
 */
import { sql } from "drizzle-orm";
import { index, integer, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { organization, user } from "./auth-schema.ts";

const now = sql`(cast(unixepoch('subsecond') * 1000 as integer))`;
const createdAt = () => integer("created_at", { mode: "timestamp_ms" }).notNull().default(now);

/** Every e-mail Tinelog tried to send: to whom, what, the transport's message id, and the outcome. */
export const mailMessage = sqliteTable(
  "mail_message",
  {
    id: text("id").primaryKey(),
    workshopId: text("workshop_id").references(() => organization.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: ["invitation", "certificate", "other"] }).notNull(),
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

/** Append-only record of who did what (DESIGN.md §3). Never updated or deleted. */
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
  updatedAt: createdAt(),
});

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
  ratio: real("ratio"),
  toleranceCents: real("tolerance_cents").notNull(),
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
    uniqueIndex("strike_unit_sha_unique").on(t.unitId, t.sha256),
  ],
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
  },
  (t) => [index("disposition_unit_idx").on(t.unitId, t.createdAt)],
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
    kind: text("kind", { enum: ["measurement", "evaluation", "disposition", "release"] }).notNull(),
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
    uniqueIndex("certificate_number_unique").on(t.number),
    uniqueIndex("certificate_code_unique").on(t.verificationCode),
    index("certificate_unit_idx").on(t.unitId),
  ],
);
