/**
 * The mail module: every message is recorded in `mail_message` before it is handed to nodemailer,
 * then marked sent (with the transport's message id) or failed (with the reason). A failed send can
 * be retried from the stored payload; the thing it belongs to (an invitation, a certificate) stays.
 */
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import nodemailer, { type Transporter } from "nodemailer";
import type { Db } from "../db/client.ts";
import { mailMessage } from "../db/schema.ts";

export type OutgoingMail = {
  workshopId: string | null;
  kind: "invitation" | "certificate" | "certificate_notice" | "other";
  relatedId?: string;
  to: string;
  subject: string;
  text: string;
  html?: string;
  from?: string;
  replyTo?: string;
  attachments?: { filename: string; contentType: string; content: Buffer }[];
};

type StoredPayload = {
  text: string;
  html?: string;
  attachments?: { filename: string; contentType: string; contentBase64: string }[];
};

export type MailRecord = typeof mailMessage.$inferSelect;

export type Mailer = {
  send(mail: OutgoingMail): Promise<MailRecord>;
  retry(id: string): Promise<MailRecord>;
  close(): void;
};

export function createMailer(db: Db, opts: { smtpUrl: string; defaultFrom: string }): Mailer {
  const transport: Transporter = nodemailer.createTransport(opts.smtpUrl);

  async function deliver(id: string): Promise<MailRecord> {
    const row = db.select().from(mailMessage).where(eq(mailMessage.id, id)).get();
    if (!row) throw new Error(`mail ${id} not found`);
    const payload = row.payload as StoredPayload;
    try {
      const info = await transport.sendMail({
        from: row.fromAddress,
        replyTo: row.replyTo ?? undefined,
        to: row.toAddress,
        subject: row.subject,
        text: payload.text,
        html: payload.html,
        attachments: payload.attachments?.map((a) => ({
          filename: a.filename,
          contentType: a.contentType,
          content: Buffer.from(a.contentBase64, "base64"),
        })),
      });
      return db
        .update(mailMessage)
        .set({ state: "sent", error: null, transportMessageId: info.messageId, sentAt: new Date(), attempts: row.attempts + 1 })
        .where(eq(mailMessage.id, id))
        .returning()
        .get();
    } catch (error) {
      const reason = error instanceof Error ? error.message : String(error);
      return db
        .update(mailMessage)
        .set({ state: "failed", error: reason, attempts: row.attempts + 1 })
        .where(eq(mailMessage.id, id))
        .returning()
        .get();
    }
  }

  return {
    async send(mail) {
      const id = randomUUID();
      const payload: StoredPayload = {
        text: mail.text,
        html: mail.html,
        attachments: mail.attachments?.map((a) => ({
          filename: a.filename,
          contentType: a.contentType,
          contentBase64: a.content.toString("base64"),
        })),
      };
      db.insert(mailMessage)
        .values({
          id,
          workshopId: mail.workshopId,
          kind: mail.kind,
          relatedId: mail.relatedId ?? null,
          fromAddress: mail.from ?? opts.defaultFrom,
          replyTo: mail.replyTo ?? null,
          toAddress: mail.to,
          subject: mail.subject,
          payload,
          state: "sending",
        })
        .run();
      return deliver(id);
    },
    retry: deliver,
    close: () => transport.close(),
  };
}
