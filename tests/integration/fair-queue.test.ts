/**
 * A second workshop on the same server is never held behind the first one's flood: each workshop
 * has its own share of the analysis queue, exact however many uploads arrive at once, and the next
 * strike analysed is chosen round-robin across workshops.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { batch, organization, strike, unit, user } from "../../server/db/schema.ts";
import { claimNext } from "../../server/services/analysis-queue.ts";
import { createBatch } from "../../server/services/batches.ts";
import { createSpec } from "../../server/services/specs.ts";
import { specInputSchema } from "../../shared/schemas/spec.ts";
import { specTemplate } from "../../shared/spec-templates.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";
import { forkWav } from "../support/wav.ts";

const SHARE = 4;
let t: TestApp;
let unitsA: string[] = [];
let unitB = "";

beforeAll(async () => {
  // One analysis thread (two strikes in flight at most) and a share of four per workshop.
  t = await startTestApp({ DEMO_STRIKES: "0", ANALYSIS_THREADS: "1", ANALYSIS_QUEUE_PER_WORKSHOP: String(SHARE) });
  const { db } = t.runtime;
  const open = db.select().from(batch).where(eq(batch.code, "BTW-2612")).get()!;
  unitsA = db.select().from(unit).where(eq(unit.batchId, open.id)).all().map((u) => u.id);
  // Workshop B (the demo's second workshop) gets a spec and a batch of its own.
  const other = db.select().from(organization).where(eq(organization.slug, "fernhollow")).get()!;
  const owner = db.select().from(user).where(eq(user.email, "other@example.com")).get()!;
  const actor = { workshopId: other.id, userId: owner.id };
  const spec = createSpec(db, actor, specInputSchema.parse({ ...specTemplate("tuning_fork"), name: "FHC fork" }));
  const b = createBatch(db, actor, { code: "FHC-1", specId: spec.id, quantity: 1, range: { from: "C-1", to: "C-1" }, notes: "" });
  unitB = db.select().from(unit).where(eq(unit.batchId, b.id)).get()!.id;
});
afterAll(async () => t.close());

const upload = async (who: "maker" | "other", unitId: string, seed: number, durationS: number) =>
  (await t.as(who)).post(`/api/units/${unitId}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(forkWav({ frequencyHz: 440 + seed / 10, seed, durationS })), `fair-${seed}.wav`);

describe("fair analysis queue", () => {
  it("workshop A fills its share exactly, even with uploads sent all at once; workshop B's upload is accepted and analysed before A's waiting ones", async () => {
    await t.as("maker");
    await t.as("other");
    // Eight long recordings from A at once: exactly its share is accepted.
    const burst = await Promise.all(Array.from({ length: 8 }, (_, i) => upload("maker", unitsA[i % unitsA.length], 100 + i, 40)));
    const accepted = burst.filter((r) => r.status === 202).map((r) => r.body.id as string);
    expect(burst.map((r) => r.status).sort()).toEqual([...Array(SHARE).fill(202), ...Array(8 - SHARE).fill(503)]);
    expect(burst.find((r) => r.status === 503)!.body.error.message).toMatch(/share of the queue/);

    // B uploads while A's strikes wait.
    const b = await upload("other", unitB, 7, 4);
    expect(b.status).toBe(202);
    const waitingA = t.runtime.db.select().from(strike).all().filter((s) => accepted.includes(s.id) && s.state === "queued").map((s) => s.id);
    expect(waitingA.length, "some of A's strikes must still be waiting, or the order proves nothing").toBeGreaterThan(0);

    await t.runtime.queue.drained();
    const rows = new Map(t.runtime.db.select().from(strike).all().map((s) => [s.id, s]));
    const startedB = rows.get(b.body.id)!.startedAt!.getTime();
    for (const id of waitingA) expect(startedB, "B's strike started before A's waiting strikes").toBeLessThan(rows.get(id)!.startedAt!.getTime());
    expect(rows.get(b.body.id)!.state).toBe("done");
  }, 180_000);

  it("claims round-robin across workshops: A's flood and B's strikes alternate, the older first on a tie", async () => {
    const { db, sqlite } = t.runtime;
    await t.runtime.queue.close(); // claim by hand from here on
    const wA = db.select().from(unit).where(eq(unit.id, unitsA[0])).get()!.workshopId;
    const wB = db.select().from(unit).where(eq(unit.id, unitB)).get()!.workshopId;
    const base = Date.now() + 60_000;
    const add = (workshopId: string, unitId: string, n: number, at: number) =>
      db.insert(strike).values({ id: `rr-${workshopId.slice(0, 4)}-${n}`, workshopId, unitId, originalName: "x.wav", sha256: `rr-${workshopId}-${n}`, fileKey: "none", sizeBytes: 1, uploadedAt: new Date(at), state: "queued" }).run();
    for (let n = 0; n < 5; n++) add(wA, unitsA[n % unitsA.length], n, base + n);
    for (let n = 0; n < 2; n++) add(wB, unitB, n, base + 100 + n);
    const order = Array.from({ length: 7 }, () => claimNext(sqlite));
    const owner = (id: string | null) => (id?.startsWith(`rr-${wA.slice(0, 4)}`) ? "A" : "B");
    // Every claimed strike stays "analysing" here, so each workshop's place grows with its own claims.
    expect(order.map(owner).join("")).toBe("ABABAAA");
    expect(claimNext(sqlite)).toBeNull();
  });
});
