/**
 * The quality record survives: the pragmas are in force, an online backup restores into a fresh
 * server with the ledger intact, and a byte changed behind Tinelog's back is found by the hash chain.
 */
import { execFileSync, spawnSync } from "node:child_process";
import { copyFileSync, cpSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { backupDatabase } from "../../server/services/backup.ts";
import { verifyChain } from "../../server/services/ledger-chain.ts";
import { startTestApp, type TestApp } from "../support/app.ts";

const tsx = path.resolve("node_modules/.bin/tsx");
let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "1" });
  await t.runtime.queue.drained();
});
afterAll(async () => t.close());

describe("SQLite settings", () => {
  it("runs with WAL, synchronous FULL, foreign keys and a busy timeout", () => {
    const s = t.runtime.sqlite;
    expect(s.pragma("journal_mode", { simple: true })).toBe("wal");
    expect(s.pragma("synchronous", { simple: true })).toBe(2);
    expect(s.pragma("foreign_keys", { simple: true })).toBe(1);
    expect(Number(s.pragma("busy_timeout", { simple: true }))).toBeGreaterThanOrEqual(1000);
  });

  it("refuses to change or delete a measurement (append-only triggers)", () => {
    expect(() => t.runtime.sqlite.prepare("UPDATE measurement SET analyser_version = 'x'").run()).toThrow(/append-only/);
    expect(() => t.runtime.sqlite.prepare("DELETE FROM evaluation").run()).toThrow(/append-only/);
  });
});

describe("backup and restore drill", () => {
  it("backs up online, checks the copy, and a fresh server reads the ledger back from it", async () => {
    const target = path.join(mkdtempSync(path.join(tmpdir(), "tinelog-backup-")), "copy.db");
    const r = await backupDatabase(t.env.databaseFile, target);
    expect(r.pages).toBeGreaterThan(0);

    // Restore: a new DATA_DIR with the copy as its database (and the keys and recordings beside it).
    const restored = mkdtempSync(path.join(tmpdir(), "tinelog-restore-"));
    copyFileSync(target, path.join(restored, "tinelog.db"));
    cpSync(path.join(t.dataDir, "keys"), path.join(restored, "keys"), { recursive: true });
    cpSync(path.join(t.dataDir, "strikes"), path.join(restored, "strikes"), { recursive: true });
    const fresh = await startTestApp({ DATA_DIR: restored, DEMO_STRIKES: "0" });
    try {
      const before = (await (await t.as("qa")).get("/api/batches")).body.batches;
      const after = (await (await fresh.as("qa")).get("/api/batches")).body.batches;
      expect(after).toEqual(before);
      expect(verifyChain(fresh.runtime.sqlite).problems).toEqual([]);
    } finally {
      await fresh.runtime.close();
    }
  });

  it("npm run backup writes a checked copy", () => {
    const target = path.join(mkdtempSync(path.join(tmpdir(), "tinelog-backup-cli-")), "cli.db");
    const out = execFileSync(tsx, ["server/cli/backup.ts", target], { env: { ...process.env, BASE_URL: "http://tinelog.test", DATA_DIR: t.dataDir } /* vitest sets BASE_URL="/" */, encoding: "utf8" });
    expect(out).toMatch(/integrity_check: ok/);
  });
});

describe("tamper-evident ledger", () => {
  it("verify-ledger passes on an intact ledger and names the row changed behind its back", async () => {
    const copy = path.join(mkdtempSync(path.join(tmpdir(), "tinelog-tamper-")), "t.db");
    await backupDatabase(t.env.databaseFile, copy);
    const ok = spawnSync(tsx, ["server/cli/verify-ledger.ts", copy], { encoding: "utf8" });
    expect(ok.status, ok.stdout + ok.stderr).toBe(0);
    expect(ok.stdout).toMatch(/Ledger intact: \d+ entries/);

    // Edit one byte of an evaluation with raw SQL, dropping the guard trigger first.
    const Database = (await import("better-sqlite3")).default;
    const db = new Database(copy);
    const target = db.prepare("SELECT id, detail FROM evaluation ORDER BY created_at LIMIT 1 OFFSET 2").get() as { id: string; detail: string };
    db.exec("DROP TRIGGER evaluation_no_update");
    db.prepare("UPDATE evaluation SET detail = ? WHERE id = ?").run(target.detail.replace(/"strikesUsed":1/, '"strikesUsed":2'), target.id);
    db.close();

    const bad = spawnSync(tsx, ["server/cli/verify-ledger.ts", copy], { encoding: "utf8" });
    expect(bad.status).toBe(1);
    expect(bad.stdout).toContain(`evaluation ${target.id}`);
    expect(bad.stdout).toMatch(/altered after it was recorded/);
  });
});
