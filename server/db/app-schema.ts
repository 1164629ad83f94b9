/**
 * Tinelog's own tables, beside the ones better-auth generates (auth-schema.ts). Every row that
 * belongs to a workshop carries `workshopId`; queries always filter on it.
 */
import { sql } from "drizzle-orm";
import { index, integer, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
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
  (t) => [index("audit_event_workshop_idx").on(t.workshopId, t.at)],
);

export { uniqueIndex };
