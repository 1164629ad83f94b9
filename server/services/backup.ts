/** Online backup of the SQLite file, verified before it counts. */
import Database from "better-sqlite3";
import { mkdirSync, rmSync } from "node:fs";
import path from "node:path";

export async function backupDatabase(source: string, target: string): Promise<{ target: string; pages: number }> {
  mkdirSync(path.dirname(target), { recursive: true });
  const db = new Database(source, { fileMustExist: true });
  try {
    let pages = 0;
    await db.backup(target, { progress: (p) => { pages = p.totalPages; return 100; } });
    const copy = new Database(target, { readonly: true });
    const check = copy.pragma("integrity_check", { simple: true });
    copy.close();
    if (check !== "ok") {
      rmSync(target, { force: true });
      throw new Error(`the copy failed integrity_check (${String(check)}); it was removed`);
    }
    return { target, pages };
  } finally {
    db.close();
  }
}
