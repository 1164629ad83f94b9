/**
 * The audit trail and a unit's history are read a page at a time (at most 100 events, a cursor for
 * the next page), and an event stores who acted by id: the name is joined when it is read.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditEvent, batch, unit } from "../../server/db/schema.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0" });
});
afterAll(async () => t.close());

const profile = (n: number) => ({ address: `Yard ${n}`, sendingEmail: "", qualityEmail: "", certificatePrefix: "BTW", clockTolerancePpm: 50, thermometerToleranceC: 0.5 });

describe("audit trail", () => {
  it("pages the trail (the seed's events and 130 more) at most 100 at a time without gaps or repeats, newest first, and refuses a page over 100", async () => {
    const owner = await t.as("owner");
    for (let n = 0; n < 130; n++) expect((await owner.put("/api/workshop/profile").set("Origin", ORIGIN).send(profile(n))).status).toBe(200);
    expect((await owner.get("/api/audit?limit=101")).status).toBe(400);

    const first = (await owner.get("/api/audit?limit=100")).body;
    expect(first.events).toHaveLength(100);
    expect(first.nextCursor).toEqual(expect.any(String));
    const rest: { id: number }[] = [];
    let cursor: string | null = first.nextCursor;
    while (cursor) {
      const page = (await owner.get(`/api/audit?limit=100&cursor=${cursor}`)).body;
      rest.push(...page.events);
      cursor = page.nextCursor;
    }
    const ids = [...first.events, ...rest].map((e: { id: number }) => e.id);
    const total = t.runtime.db.select().from(auditEvent).all().filter((e) => e.workshopId === t.runtime.db.select().from(batch).get()!.workshopId).length;
    expect(ids).toHaveLength(total);
    expect(new Set(ids).size).toBe(ids.length);
    expect([...ids].sort((a, b) => b - a)).toEqual(ids);
    // Without a limit, a page is 50.
    expect((await owner.get("/api/audit")).body.events).toHaveLength(50);
  });

  it("stores the actor by id and joins the current name when read", async () => {
    const owner = await t.as("owner");
    const rows = t.runtime.db.select().from(auditEvent).where(eq(auditEvent.action, "workshop.profile")).all();
    expect(rows.every((r) => r.actorId && !JSON.stringify(r).includes("Mara Ellison"))).toBe(true);
    expect((await owner.post("/api/auth/update-user").set("Origin", ORIGIN).send({ name: "Mara Ellison-Reed" })).status).toBe(200);
    const page = (await owner.get("/api/audit?limit=5")).body;
    expect(page.events.every((e: { actor: string }) => e.actor === "Mara Ellison-Reed")).toBe(true);
  });

  it("pages a unit's history the same way", async () => {
    const qa = await t.as("qa");
    const open = t.runtime.db.select().from(batch).where(eq(batch.code, "BTW-2612")).get()!;
    const u = t.runtime.db.select().from(unit).where(eq(unit.batchId, open.id)).all()[0];
    for (let n = 0; n < 7; n++) expect((await qa.patch(`/api/units/${u.id}`).set("Origin", ORIGIN).send({ customerName: `Customer ${n}` })).status).toBe(200);
    const first = (await qa.get(`/api/audit?unitId=${u.id}&limit=5`)).body;
    expect(first.events).toHaveLength(5);
    const second = (await qa.get(`/api/audit?unitId=${u.id}&limit=5&cursor=${first.nextCursor}`)).body;
    expect(second.events).toHaveLength(2);
    expect(second.nextCursor).toBeNull();
    expect(first.events[0].after.customerName).toBe("Customer 6");
  });
});
