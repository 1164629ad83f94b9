/** Reads the outbox: mail rows of one workshop, each with the message as captured over SMTP. */
import { createHash } from "node:crypto";
import { and, desc, eq, inArray } from "drizzle-orm";
import { simpleParser } from "mailparser";
import type { Db } from "../db/client.ts";
import { capturedMail, mailMessage } from "../db/schema.ts";

export type OutboxMessage = Awaited<ReturnType<typeof toMessage>>;

async function toMessage(row: typeof mailMessage.$inferSelect, raw: string | undefined) {
  const base = {
    id: row.id,
    kind: row.kind,
    relatedId: row.relatedId,
    state: row.state,
    error: row.error,
    attempts: row.attempts,
    from: row.fromAddress,
    replyTo: row.replyTo,
    to: [row.toAddress],
    subject: row.subject,
    date: (row.sentAt ?? row.createdAt).toISOString(),
    captured: raw !== undefined,
  };
  if (raw === undefined) {
    const p = row.payload as { text: string; html?: string; attachments?: { filename: string; contentType: string; contentBase64: string }[] };
    const files = (p.attachments ?? []).map((a) => ({ filename: a.filename, contentType: a.contentType, content: Buffer.from(a.contentBase64, "base64") }));
    return { ...base, text: p.text, html: p.html ?? null, ...describe(files) };
  }
  const parsed = await simpleParser(raw);
  const files = parsed.attachments.map((a) => ({ filename: a.filename ?? "attachment", contentType: a.contentType, content: a.content }));
  return { ...base, text: parsed.text ?? "", html: parsed.html || null, ...describe(files) };
}

function describe(files: { filename: string; contentType: string; content: Buffer }[]) {
  return {
    attachments: files.map((f, index) => ({
      index,
      filename: f.filename,
      contentType: f.contentType,
      size: f.content.length,
      sha256: createHash("sha256").update(f.content).digest("hex"),
    })),
    attachmentData: files,
  };
}

function capturedFor(db: Db, ids: string[]) {
  if (!ids.length) return new Map<string, string>();
  const rows = db.select({ messageId: capturedMail.messageId, raw: capturedMail.raw }).from(capturedMail).where(inArray(capturedMail.messageId, ids)).all();
  return new Map(rows.map((r) => [r.messageId!, r.raw]));
}

type MailKind = (typeof mailMessage.$inferSelect)["kind"];

/** Certificates, batch certificates and the notices of their withdrawal. */
export const CERTIFICATE_MAIL_KINDS: MailKind[] = ["certificate", "certificate_notice"];

/** `kinds`: only these kinds (null: every kind). */
const scope = (workshopId: string, kinds: MailKind[] | null) => and(eq(mailMessage.workshopId, workshopId), kinds ? inArray(mailMessage.kind, kinds) : undefined);

export async function listOutbox(db: Db, workshopId: string, kinds: MailKind[] | null = null) {
  const rows = db.select().from(mailMessage).where(scope(workshopId, kinds)).orderBy(desc(mailMessage.createdAt)).limit(200).all();
  const raws = capturedFor(db, rows.flatMap((r) => (r.transportMessageId ? [r.transportMessageId] : [])));
  const messages = await Promise.all(rows.map((r) => toMessage(r, r.transportMessageId ? raws.get(r.transportMessageId) : undefined)));
  return messages.map(({ attachmentData: _omit, ...m }) => m);
}

export async function getOutboxMessage(db: Db, workshopId: string, id: string, kinds: MailKind[] | null = null) {
  const row = db.select().from(mailMessage).where(and(eq(mailMessage.id, id), scope(workshopId, kinds))).get();
  if (!row) return null;
  const raw = row.transportMessageId ? capturedFor(db, [row.transportMessageId]).get(row.transportMessageId) : undefined;
  return toMessage(row, raw);
}
