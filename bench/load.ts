/**
 * `npm run load`: 20 concurrent strike uploads being analysed while 50 connections read the batch
 * ledger for 30 s (autocannon), against a server started here on loopback with a fresh data folder.
 * Prints throughput, p50/p99 latency and errors, and checks that every upload was analysed.
 * Target on a 2-core machine: no errors, ledger p99 under 200 ms, every upload analysed.
 */
import autocannon from "autocannon";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { signInCookie, spawnServer } from "../tests/support/server-process.ts";
import { forkWav } from "../tests/support/wav.ts";

const DURATION_S = Number(process.env.LOAD_SECONDS ?? 30);
const dataDir = mkdtempSync(path.join(tmpdir(), "tinelog-load-"));
const server = await spawnServer({ dataDir, env: { SEED_DEMO: "1", DEMO_STRIKES: "1", LOG_LEVEL: "error" } });
try {
  const cookie = await signInCookie(server.baseUrl, "maker@example.com", "tinelog-demo");
  const headers = { Cookie: cookie, Origin: server.baseUrl };
  const batches = (await (await fetch(`${server.baseUrl}/api/batches`, { headers })).json()).batches;
  const ledger = batches.find((b: { code: string }) => b.code === "BTW-2611");
  const open = batches.find((b: { code: string }) => b.code === "BTW-2612");
  const units = (await (await fetch(`${server.baseUrl}/api/batches/${open.id}`, { headers })).json()).rows;

  const reads = autocannon({ url: `${server.baseUrl}/api/batches/${ledger.id}`, connections: 50, duration: DURATION_S, headers: { cookie } });

  // 20 uploads at once, each a different 5 s strike, spread over the open batch's units.
  const started = Date.now();
  const uploads = await Promise.all(
    Array.from({ length: 20 }, async (_, i) => {
      const form = new FormData();
      form.append("audio", new Blob([Buffer.from(forkWav({ frequencyHz: 436 + i * 0.5, durationS: 5, seed: 900 + i }))], { type: "audio/wav" }), `load-${i}.wav`);
      const r = await fetch(`${server.baseUrl}/api/units/${units[i % units.length].id}/strikes`, { method: "POST", headers, body: form });
      return { status: r.status, id: r.status === 202 ? (await r.json()).id : null };
    }),
  );
  const accepted = uploads.filter((u) => u.id);
  let analysedAt = 0;
  const finished = async () => {
    for (;;) {
      const states = await Promise.all(accepted.map(async (u) => (await (await fetch(`${server.baseUrl}/api/strikes/${u.id}`, { headers })).json()).state));
      if (states.every((s) => s === "done" || s === "failed")) return states;
      await new Promise((r) => setTimeout(r, 250));
    }
  };
  const states = await finished();
  analysedAt = Date.now() - started;
  const result = await reads;

  const ms = (n: number) => `${n.toFixed(1)} ms`;
  console.log("\nTinelog load: ledger reads while strikes are analysed");
  console.log(`  ledger GET /api/batches/:id  ${result.connections} connections × ${result.duration} s`);
  console.log(`    requests ${result.requests.total}  (${result.requests.average.toFixed(0)} req/s)  throughput ${(result.throughput.average / 1e6).toFixed(2)} MB/s`);
  console.log(`    latency p50 ${ms(result.latency.p50)}  p90 ${ms(result.latency.p90)}  p99 ${ms(result.latency.p99)}  max ${ms(result.latency.max)}`);
  console.log(`    errors ${result.errors}  timeouts ${result.timeouts}  non-2xx ${result.non2xx}`);
  console.log(`  uploads: ${accepted.length}/20 accepted (statuses ${[...new Set(uploads.map((u) => u.status))].join(", ")}); ${states.filter((s) => s === "done").length} done, ${states.filter((s) => s === "failed").length} failed; all analysed after ${(analysedAt / 1000).toFixed(1)} s`);
  const ok = result.errors === 0 && result.non2xx === 0 && result.latency.p99 < 200 && accepted.length === 20 && states.every((s) => s === "done");
  console.log(`  target (no errors, p99 < 200 ms, every upload analysed): ${ok ? "met" : "NOT met"}\n`);
} finally {
  await server.kill("SIGTERM");
  rmSync(dataDir, { recursive: true, force: true });
}
