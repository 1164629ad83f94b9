/**
 * Careless or broken input gets a clear 400 (or the sensible reading), never a 500 or a wrong value:
 * malformed multipart bodies, an empty unit update, a blank temperature, non-ASCII file names, and
 * control characters in stored text.
 */
import { eq } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { batch, strike, unit, user } from "../../server/db/schema.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";
import { forkWav } from "../support/wav.ts";

let t: TestApp;
let unitIds: string[] = [];
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0" });
  const open = t.runtime.db.select().from(batch).where(eq(batch.code, "BTW-2612")).get()!;
  unitIds = t.runtime.db.select().from(unit).where(eq(unit.batchId, open.id)).all().map((u) => u.id);
});
afterAll(async () => {
  await t.runtime.queue.drained();
  await t.close();
});

describe("malformed multipart bodies", () => {
  const raw = async (contentType: string, body: string) =>
    (await t.as("maker")).post(`/api/units/${unitIds[0]}/strikes`).set("Origin", ORIGIN).set("Content-Type", contentType).send(body);

  it("answers a bad part header with 400", async () => {
    const res = await raw("multipart/form-data; boundary=XyZ", "--XyZ\r\nthis is not a header line\r\n\r\ndata\r\n--XyZ--\r\n");
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    expect(res.body.error.message).toMatch(/multipart/);
  });

  it("answers a body without its end boundary with 400", async () => {
    const res = await raw("multipart/form-data; boundary=XyZ", '--XyZ\r\nContent-Disposition: form-data; name="audio"; filename="a.wav"\r\nContent-Type: audio/wav\r\n\r\nRIFF');
    expect(res.status, JSON.stringify(res.body)).toBe(400);
  });

  it("answers a multipart type without a boundary with 400", async () => {
    const res = await raw("multipart/form-data", "--XyZ\r\n\r\n");
    expect(res.status, JSON.stringify(res.body)).toBe(400);
  });
});

describe("unit update", () => {
  it("answers an empty update with 400 naming what to send", async () => {
    const res = await (await t.as("maker")).patch(`/api/units/${unitIds[0]}`).set("Origin", ORIGIN).send({});
    expect(res.status).toBe(400);
    expect(res.body.error.fields.customerName).toMatch(/customerName or customerEmail/);
  });
});

describe("upload fields", () => {
  it('reads temperatureC=" " as not recorded, never as 0 °C', async () => {
    const res = await (await t.as("maker")).post(`/api/units/${unitIds[1]}/strikes`).set("Origin", ORIGIN).field("temperatureC", " ").field("support", " ").attach("audio", Buffer.from(forkWav({ frequencyHz: 440, seed: 41 })), "blank.wav");
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const row = t.runtime.db.select().from(strike).where(eq(strike.id, res.body.id)).get()!;
    expect(row.temperatureC).toBeNull();
    expect(row.support).toBeNull();
  });

  it("keeps a non-ASCII file name as sent (UTF-8)", async () => {
    const name = "Stimmgabel-Ä-音叉-כהן.wav";
    const res = await (await t.as("maker")).post(`/api/units/${unitIds[2]}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(forkWav({ frequencyHz: 440, seed: 42 })), name);
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    expect((await (await t.as("maker")).get(`/api/strikes/${res.body.id}`)).body.originalName).toBe(name);
  });
});

describe("control characters in stored text", () => {
  it("strips NUL and other control characters from our API's text fields, keeping line breaks", async () => {
    const qa = await t.as("qa");
    const res = await qa.patch(`/api/units/${unitIds[3]}`).set("Origin", ORIGIN).send({ customerName: "Ada\u0000 Lo\u001bvelace\u0007" });
    expect(res.status).toBe(200);
    expect(t.runtime.db.select().from(unit).where(eq(unit.id, unitIds[3])).get()!.customerName).toBe("Ada Lovelace");
    const owner = await t.as("owner");
    const profile = { address: "Unit 4\r\nMillrace Yard\u0000", sendingEmail: "", qualityEmail: "", certificatePrefix: "BTW", clockTolerancePpm: 50, thermometerToleranceC: 0.5 };
    expect((await owner.put("/api/workshop/profile").set("Origin", ORIGIN).send(profile)).status).toBe(200);
    expect((await owner.get("/api/workshop")).body.profile.address).toBe("Unit 4\nMillrace Yard");
  });

  it("strips them from the strings the sign-in library stores (sign-up, update-user) and from upload file names", async () => {
    const signUp = await request(t.app).post("/api/auth/sign-up/email").set("Origin", ORIGIN).send({ name: "Nul\u0000 Person", email: "nul.person@example.com", password: "a-fine-long-password" });
    expect(signUp.status, JSON.stringify(signUp.body)).toBe(200);
    expect(t.runtime.db.select().from(user).where(eq(user.email, "nul.person@example.com")).get()!.name).toBe("Nul Person");

    const maker = await t.as("maker");
    expect((await maker.post("/api/auth/update-user").set("Origin", ORIGIN).send({ name: "Ilse\u0000 Varga\u0008" })).status).toBe(200);
    expect(t.runtime.db.select().from(user).where(eq(user.email, "maker@example.com")).get()!.name).toBe("Ilse Varga");

    const up = await maker.post(`/api/units/${unitIds[4]}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(forkWav({ frequencyHz: 440, seed: 43 })), "fork\u0085-11.wav");
    expect(up.status, JSON.stringify(up.body)).toBe(202);
    expect(t.runtime.db.select().from(strike).where(eq(strike.id, up.body.id)).get()!.originalName).toBe("fork-11.wav");
  });
});
