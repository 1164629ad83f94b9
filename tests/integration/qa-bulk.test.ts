/**
 * Bulk work over a batch of 50 units, through the API with the real analysis pool and SMTP
 * capture: one disposition for several units (one transaction, all or nothing, one audit entry per
 * unit), then every unit's certificate issued to its customer with progress (NDJSON), the units
 * without a customer e-mail listed and skipped, a scrapped unit skipped, and a second run issuing
 * nothing twice. Strikes are synthesised forks: 47 on pitch, 3 at 20 cents flat.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditEvent, certificate, disposition, mailMessage, spec } from "../../server/db/schema.ts";
import { verifyChain } from "../../server/services/ledger-chain.ts";
import { ORIGIN, startTestApp, type TestApp, type Who } from "../support/app.ts";
import { forkWav } from "../support/wav.ts";

let t: TestApp;
let batchId = "";
let rows: { id: string; serial: string; verdict: string | null }[] = [];
const post = async (who: Who, url: string, body?: object) => (await t.as(who)).post(url).set("Origin", ORIGIN).send(body);
const serial = (i: number) => `B-${String(i).padStart(4, "0")}`;
const FLAT = [7, 23, 41];

/** Reads an NDJSON answer (one JSON object per line) as the client does. */
async function ndjson(url: string) {
  const res = await (await t.as("qa")).post(url).set("Origin", ORIGIN).buffer(true).parse((r, cb) => {
    let text = "";
    r.setEncoding("utf8");
    r.on("data", (d: string) => (text += d));
    r.on("end", () => cb(null, text));
  });
  return { status: res.status, type: res.headers["content-type"], lines: (res.body as string).trim().split("\n").map((l) => JSON.parse(l)) };
}

beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0" });
  const specId = t.runtime.db.select().from(spec).get()!.id;
  const created = await post("maker", "/api/batches", { code: "B-50", specId, quantity: 50 });
  expect(created.status).toBe(201);
  batchId = created.body.id;
  // 48 units for one retailer, 2 without a customer e-mail.
  expect((await post("maker", `/api/batches/${batchId}/units`, { range: { from: serial(1), to: serial(48) }, customerName: "Corner Music Shop", customerEmail: "orders@corner.example.org" })).status).toBe(201);
  expect((await post("maker", `/api/batches/${batchId}/units`, { range: { from: serial(49), to: serial(50) } })).status).toBe(201);
  rows = (await (await t.as("maker")).get(`/api/batches/${batchId}`)).body.rows;
  const maker = await t.as("maker");
  for (const [i, r] of rows.entries()) {
    const cents = FLAT.includes(i + 1) ? -20 : 0;
    const res = await maker.post(`/api/units/${r.id}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(forkWav({ frequencyHz: 440 * 2 ** (cents / 1200), seed: 500 + i, durationS: 2 })), `${r.serial}.wav`);
    expect(res.status).toBe(202);
  }
  await t.runtime.queue.drained();
  rows = (await (await t.as("qa")).get(`/api/batches/${batchId}`)).body.rows;
}, 300_000);
afterAll(async () => t.close());

describe("one disposition for several units", () => {
  it("refuses the whole step when one selected unit cannot take it, naming it, and records nothing", async () => {
    const out = rows.filter((r) => r.verdict === "out_of_tolerance");
    expect(out.map((r) => r.serial)).toEqual(FLAT.map(serial));
    const within = rows.find((r) => r.verdict === "within_tolerance")!;
    const res = await post("qa", `/api/batches/${batchId}/dispositions`, { unitIds: [...out.map((r) => r.id), within.id], decision: "use_as_is", reason: "Practice forks." });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(new RegExp(`Nothing was recorded: ${within.serial} is within tolerance`));
    expect(t.runtime.db.select().from(disposition).all()).toHaveLength(0);
    expect((await post("qa", `/api/batches/${batchId}/dispositions`, { unitIds: out.map((r) => r.id), decision: "use_as_is", reason: "no" })).body.error.fields.reason).toMatch(/at least 3/);
    expect((await post("maker", `/api/batches/${batchId}/dispositions`, { unitIds: out.map((r) => r.id), decision: "scrap", reason: "Not mine to decide." })).status).toBe(403);
  });

  it("records it for each, in one step, with one audit entry per unit", async () => {
    const [a, b, c] = rows.filter((r) => r.verdict === "out_of_tolerance");
    const res = await post("qa", `/api/batches/${batchId}/dispositions`, { unitIds: [a.id, b.id], decision: "use_as_is", reason: "Practice forks; the retailer accepts 20 cents flat." });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.rows.filter((r: { disposition: unknown }) => r.disposition)).toHaveLength(2);
    expect((await post("qa", `/api/batches/${batchId}/dispositions`, { unitIds: [c.id], decision: "scrap", reason: "Cracked at the crotch." })).status).toBe(201);
    const audits = t.runtime.db.select().from(auditEvent).where(eq(auditEvent.action, "unit.disposition")).all();
    expect(audits.map((e) => e.entityId).sort()).toEqual([a.id, b.id, c.id].sort());
    expect(verifyChain(t.runtime.sqlite).problems).toEqual([]);
    expect((await post("qa", `/api/batches/${batchId}/release`)).status).toBe(200);
  });
});

describe("issuing every unit's certificate", () => {
  it("plans: 47 to issue, the scrapped unit and the two without an e-mail skipped with the reason", async () => {
    const plan = (await (await t.as("qa")).get(`/api/batches/${batchId}/unit-certificates`)).body.plan;
    expect(plan).toHaveLength(50);
    expect(plan.filter((p: { action: string }) => p.action === "issue")).toHaveLength(47);
    const skipped = plan.filter((p: { action: string }) => p.action === "skip");
    expect(skipped.map((p: { serial: string }) => p.serial)).toEqual([serial(41), serial(49), serial(50)]);
    expect(skipped[0].reason).toMatch(/was scrapped/);
    expect(skipped[1].reason).toMatch(/has no customer e-mail/);
  });

  it("issues them one by one with a progress line each and a summary at the end", async () => {
    const { status, type, lines } = await ndjson(`/api/batches/${batchId}/unit-certificates`);
    expect(status).toBe(200);
    expect(type).toMatch(/application\/x-ndjson/);
    const progress = lines.filter((l) => l.type === "progress");
    expect(progress.map((l) => l.done)).toEqual(Array.from({ length: 50 }, (_, i) => i + 1));
    expect(progress.every((l) => l.total === 50)).toBe(true);
    const summary = lines.at(-1);
    expect(summary).toMatchObject({ type: "summary", issued: 47, skipped: 3, failed: 0 });
    const numbers = summary.outcomes.filter((o: { outcome: string }) => o.outcome === "issued").map((o: { number: string }) => o.number);
    expect(new Set(numbers).size).toBe(47);
    expect(t.runtime.db.select().from(certificate).all()).toHaveLength(47);
    const mails = t.runtime.db.select().from(mailMessage).where(eq(mailMessage.kind, "certificate")).all();
    expect(mails).toHaveLength(47);
    expect(mails.every((m) => m.state === "sent" && m.toAddress === "orders@corner.example.org")).toBe(true);
    expect(t.runtime.db.select().from(auditEvent).where(eq(auditEvent.action, "certificate.issue")).all()).toHaveLength(47);
    // The two concessions are stated on their certificates.
    const conceded = summary.outcomes.filter((o: { serial: string }) => [serial(7), serial(23)].includes(o.serial));
    for (const o of conceded) {
      const data = JSON.parse(t.runtime.db.select().from(certificate).where(eq(certificate.number, o.number)).get()!.canonical);
      expect(data.concession.reason).toBe("Practice forks; the retailer accepts 20 cents flat.");
    }
  }, 300_000);

  it("a second run issues nothing twice", async () => {
    const { lines } = await ndjson(`/api/batches/${batchId}/unit-certificates`);
    expect(lines.at(-1)).toMatchObject({ type: "summary", issued: 0, skipped: 50 });
    expect(lines.find((l) => l.serial === serial(1)).reason).toMatch(/^Already certified: .+ is current\.$/);
  });
});
