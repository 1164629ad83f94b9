/**
 * A killed process loses nothing: a burst of uploads is accepted, the server is killed with SIGKILL
 * while it analyses, and after a restart every accepted strike ends done or failed with a reason,
 * none has two results, the database passes integrity_check, and files and rows match one to one.
 */
import Database from "better-sqlite3";
import { mkdtempSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { signInCookie, spawnServer } from "../support/server-process.ts";
import { forkWav } from "../support/wav.ts";

describe("crash recovery", () => {
  it("finishes every accepted upload after SIGKILL and restart", async () => {
    const dataDir = mkdtempSync(path.join(tmpdir(), "tinelog-crash-"));
    const env = { SEED_DEMO: "1", DEMO_STRIKES: "0", ANALYSIS_THREADS: "1" };
    const first = await spawnServer({ dataDir, env });
    const cookie = await signInCookie(first.baseUrl, "maker@example.com", "tinelog-demo");
    const headers = { Cookie: cookie, Origin: first.baseUrl };
    const batches = (await (await fetch(`${first.baseUrl}/api/batches`, { headers })).json()).batches;
    const open = batches.find((b: { code: string }) => b.code === "BTW-2612");
    const units = (await (await fetch(`${first.baseUrl}/api/batches/${open.id}`, { headers })).json()).rows;

    // A burst of 12 uploads (two per unit, different recordings), all sent at once.
    const accepted: string[] = [];
    await Promise.all(
      Array.from({ length: 12 }, async (_, i) => {
        const form = new FormData();
        form.append("audio", new Blob([Buffer.from(forkWav({ frequencyHz: 440 + i, durationS: 15, seed: 500 + i }))], { type: "audio/wav" }), `burst-${i}.wav`);
        const r = await fetch(`${first.baseUrl}/api/units/${units[i % units.length].id}/strikes`, { method: "POST", headers, body: form });
        if (r.status === 202) accepted.push((await r.json()).id);
      }),
    );
    expect(accepted.length).toBe(12);
    await first.kill("SIGKILL");

    // Killed mid-way: some strikes must still be waiting, or the test proves nothing.
    const mid = new Database(path.join(dataDir, "tinelog.db"), { readonly: true });
    const waiting = (mid.prepare("SELECT count(*) AS n FROM strike WHERE state IN ('queued','analysing')").get() as { n: number }).n;
    mid.close();
    expect(waiting).toBeGreaterThan(0);

    const second = await spawnServer({ dataDir, env });
    const deadline = Date.now() + 120_000;
    const db = new Database(path.join(dataDir, "tinelog.db"), { readonly: true });
    try {
      for (;;) {
        const left = (db.prepare("SELECT count(*) AS n FROM strike WHERE state IN ('queued','analysing')").get() as { n: number }).n;
        if (left === 0) break;
        if (Date.now() > deadline) throw new Error(`strikes still waiting after restart: ${left}\n${second.output()}`);
        await new Promise((r) => setTimeout(r, 250));
      }
      const rows = db.prepare("SELECT id, state, failure_reason, file_key FROM strike").all() as { id: string; state: string; failure_reason: string | null; file_key: string }[];
      for (const id of accepted) {
        const row = rows.find((r) => r.id === id)!;
        expect(["done", "failed"]).toContain(row.state);
        if (row.state === "failed") expect(row.failure_reason).toBeTruthy();
      }
      const doubles = db.prepare("SELECT strike_id, count(*) AS n FROM measurement GROUP BY strike_id HAVING n > 1").all();
      expect(doubles).toEqual([]);
      expect(db.pragma("integrity_check", { simple: true })).toBe("ok");
      const onDisk = readdirSync(path.join(dataDir, "strikes")).flatMap((w) => readdirSync(path.join(dataDir, "strikes", w)).map((f) => `${w}/${f}`)).sort();
      expect(onDisk).toEqual(rows.map((r) => r.file_key).sort());
      expect(readdirSync(path.join(dataDir, "incoming"))).toEqual([]);
    } finally {
      db.close();
      await second.kill("SIGTERM");
    }
  }, 240_000);
});
