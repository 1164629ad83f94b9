/**
 * `npm run backup [-- TARGET]`: an online backup of the SQLite database with better-sqlite3's backup
 * API (safe while the server runs), checked with `PRAGMA integrity_check` before it is reported good.
 * The signing keys and stored recordings live beside the database in DATA_DIR: copy that folder too.
 */
import path from "node:path";
import { loadEnv } from "../env.ts";
import { backupDatabase } from "../services/backup.ts";

const env = loadEnv();
const target = process.argv[2] ?? path.join(env.DATA_DIR, "backups", `tinelog-${new Date().toISOString().replace(/[:.]/g, "-")}.db`);
try {
  const r = await backupDatabase(env.databaseFile, target);
  console.log(`Backup written to ${r.target} (${r.pages} pages, integrity_check: ok)`);
} catch (error) {
  console.error(`backup failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
}
