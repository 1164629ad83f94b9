/**
 * In-process SMTP capture server for development and tests: with no SMTP_URL, nodemailer sends over
 * real SMTP to this listener on 127.0.0.1, which stores each raw message in SQLite. The outbox screen
 * reads them back, so what a test sees is exactly what crossed the wire.
 */
import { SMTPServer } from "smtp-server";
import type { AddressInfo } from "node:net";
import type { Db } from "../db/client.ts";
import { capturedMail } from "../db/schema.ts";

export type CaptureServer = { port: number; close(): Promise<void> };

const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;

function headerMessageId(raw: string): string | null {
  const head = raw.slice(0, raw.search(/\r?\n\r?\n/) >>> 0 || raw.length);
  const m = /^message-id:\s*(<[^>\r\n]+>)/im.exec(head);
  return m ? m[1] : null;
}

export async function startCaptureServer(db: Db): Promise<CaptureServer> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
          return callback(Object.assign(new Error("Message too large"), { responseCode: 552 }));
        }
        const raw = Buffer.concat(chunks).toString("utf8");
        try {
          db.insert(capturedMail)
            .values({
              messageId: headerMessageId(raw),
              envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
              envelopeTo: session.envelope.rcptTo.map((r) => r.address),
              raw,
            })
            .run();
          callback();
        } catch (error) {
          callback(error as Error);
        }
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => resolve());
  });
  const port = (server.server.address() as AddressInfo).port;
  return { port, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}
