/**
 * The SQLite connection. WAL for concurrent readers, synchronous=FULL because the ledger is a quality
 * record (a committed row must survive power loss), foreign keys on, and a busy timeout so a second
 * writer waits rather than failing. The settings are read back and asserted: a build of SQLite that
 * ignored one would otherwise go unnoticed.
 */
import Database from "better-sqlite3";
import { drizzle } from "drizzle-orm/better-sqlite3";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { mkdirSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import * as schema from "./schema.ts";

export type Db = ReturnType<typeof drizzle<typeof schema>>;
export type Sqlite = Database.Database;

const migrationsFolder = fileURLToPath(new URL("../../drizzle", import.meta.url));

export function openDatabase(file: string): { db: Db; sqlite: Sqlite } {
  mkdirSync(path.dirname(file), { recursive: true });
  const sqlite = new Database(file);
  sqlite.pragma("journal_mode = WAL");
  sqlite.pragma("synchronous = FULL");
  sqlite.pragma("foreign_keys = ON");
  sqlite.pragma("busy_timeout = 5000");
  assertPragmas(sqlite);
  const db = drizzle(sqlite, { schema });
  migrate(db, { migrationsFolder });
  return { db, sqlite };
}

/** Throws when a pragma the ledger relies on did not take effect. */
export function assertPragmas(sqlite: Sqlite): void {
  const got = {
    journal_mode: String(sqlite.pragma("journal_mode", { simple: true })).toLowerCase(),
    synchronous: Number(sqlite.pragma("synchronous", { simple: true })),
    foreign_keys: Number(sqlite.pragma("foreign_keys", { simple: true })),
    busy_timeout: Number(sqlite.pragma("busy_timeout", { simple: true })),
  };
  const wrong: string[] = [];
  if (got.journal_mode !== "wal") wrong.push(`journal_mode is ${got.journal_mode}, expected wal`);
  if (got.synchronous !== 2) wrong.push(`synchronous is ${got.synchronous}, expected 2 (FULL)`);
  if (got.foreign_keys !== 1) wrong.push("foreign_keys is off");
  if (got.busy_timeout < 1000) wrong.push(`busy_timeout is ${got.busy_timeout} ms, expected ≥ 1000`);
  if (wrong.length) throw new Error(`SQLite settings not in force: ${wrong.join("; ")}`);
}
