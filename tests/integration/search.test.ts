/**
 * Search across one workshop: by serial, batch code, certificate number, customer name or e-mail,
 * grouped by kind; never another workshop's records, even when they carry the same words.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { specTemplate } from "../../shared/spec-templates.ts";
import { batch } from "../../server/db/schema.ts";
import { ORIGIN, startTestApp, type TestApp, type Who } from "../support/app.ts";

let t: TestApp;
const post = async (who: Who, url: string, body?: object) => (await t.as(who)).post(url).set("Origin", ORIGIN).send(body);
const find = async (who: Who, q: string) => (await (await t.as(who)).get(`/api/search?q=${encodeURIComponent(q)}`)).body;

beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0" });
  const demo = t.runtime.db.select().from(batch).where(eq(batch.code, "BTW-2611")).get()!;
  const units = (await (await t.as("qa")).get(`/api/batches/${demo.id}`)).body.rows;
  expect((await (await t.as("maker")).patch(`/api/units/${units[3].id}`).set("Origin", ORIGIN).send({ customerName: "Juniper Strings Ensemble", customerEmail: "office@juniper.example.org" })).status).toBe(200);
  // The other workshop uses look-alike codes, serials and the same customer.
  const tpl = specTemplate("tuning_fork");
  const spec = await post("other", "/api/specs", { ...tpl, name: "Other fork" });
  expect(spec.status).toBe(201);
  const b = await post("other", "/api/batches", { code: "BTW-9999", specId: spec.body.id, quantity: 2, range: { from: "F-9001", to: "F-9002" } });
  expect(b.status).toBe(201);
  expect((await (await t.as("other")).patch(`/api/units/${b.body.rows[0].id}`).set("Origin", ORIGIN).send({ customerName: "Juniper Strings Ensemble", customerEmail: "office@juniper.example.org" })).status).toBe(200);
});
afterAll(async () => t.close());

describe("GET /api/search", () => {
  it("finds a unit by serial, exact match first, with its batch", async () => {
    const r = await find("maker", "f-0004");
    expect(r.units[0]).toMatchObject({ serial: "F-0004", batchCode: "BTW-2611" });
  });

  it("finds batches by code and never another workshop's", async () => {
    const r = await find("qa", "BTW-");
    expect(r.batches.map((b: { code: string }) => b.code).sort()).toEqual(["BTW-2611", "BTW-2612"]);
    const theirs = await find("other", "BTW-");
    expect(theirs.batches.map((b: { code: string }) => b.code)).toEqual(["BTW-9999"]);
    expect((await find("other", "F-00")).units).toEqual([]);
  });

  it("finds customers by name or e-mail, only this workshop's units", async () => {
    const byName = await find("qa", "juniper strings");
    expect(byName.customers).toEqual([expect.objectContaining({ serial: "F-0004", name: "Juniper Strings Ensemble" })]);
    const byMail = await find("other", "office@juniper");
    expect(byMail.customers.map((c: { serial: string }) => c.serial)).toEqual(["F-9001"]);
  });

  it("takes % and _ literally, and refuses an empty query with a field message", async () => {
    expect(await find("qa", "%")).toEqual({ units: [], batches: [], certificates: [], customers: [] });
    expect((await find("qa", "F_0004")).units).toEqual([]);
    const empty = await (await t.as("qa")).get("/api/search?q=%20");
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.q).toMatch(/Type something/);
  });
});
