/**
 * Reads mail as the in-process SMTP capture stored it (raw, as it crossed the wire), for tests that
 * follow a link from a message: address confirmation, password reset.
 */
import Database from "better-sqlite3";
import path from "node:path";
import { simpleParser } from "mailparser";

type Source = { sqlite: Database.Database } | { dataDir: string };

function rows(source: Source): { id: number; envelope_to: string; raw: string }[] {
  const db = "sqlite" in source ? source.sqlite : new Database(path.join(source.dataDir, "tinelog.db"), { readonly: true });
  try {
    return db.prepare("SELECT id, envelope_to, raw FROM captured_mail ORDER BY id").all() as { id: number; envelope_to: string; raw: string }[];
  } finally {
    if (!("sqlite" in source)) db.close();
  }
}

/**
 * Waits (up to 10 s) for a message to `to` whose subject matches `subject`, newer than message id
 * `after`, and returns its id, subject and plain text.
 */
export async function waitForMail(source: Source, to: string, subject: RegExp, after = 0): Promise<{ id: number; subject: string; text: string }> {
  const deadline = Date.now() + 10_000;
  for (;;) {
    for (const row of rows(source).reverse()) {
      if (row.id <= after || !(JSON.parse(row.envelope_to) as string[]).includes(to)) continue;
      const parsed = await simpleParser(row.raw);
      if (subject.test(parsed.subject ?? "")) return { id: row.id, subject: parsed.subject ?? "", text: parsed.text ?? "" };
    }
    if (Date.now() > deadline) throw new Error(`No mail to ${to} matching ${subject} arrived within 10 s`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** The id of the newest captured message (0 when none), to wait for what comes after it. */
export function lastMailId(source: Source): number {
  return rows(source).at(-1)?.id ?? 0;
}

/** The first link in `text` whose path contains `part`. */
export function linkIn(text: string, part: string): string {
  const link = text.match(/https?:\/\/\S+/g)?.find((l) => l.includes(part));
  if (!link) throw new Error(`No link with ${part} in:\n${text}`);
  return link;
}
