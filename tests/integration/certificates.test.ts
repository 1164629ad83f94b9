/**
 * Certificates through the API and the real SMTP path: issuing is refused until the batch is
 * released; the captured e-mail carries the PDF whose sha256 is the one on record; the public
 * verification shows no customer contact data and checks the Ed25519 signature; an amendment
 * supersedes the earlier certificate, which stays retrievable.
 */
import { eq } from "drizzle-orm";
import { simpleParser } from "mailparser";
import { createHash } from "node:crypto";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { batch, capturedMail, certificate } from "../../server/db/schema.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";

let t: TestApp;
let batchId = "";
let unitId = "";

beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "1" });
  await t.runtime.queue.drained();
  batchId = t.runtime.db.select().from(batch).where(eq(batch.code, "BTW-2611")).get()!.id;
  const detail = (await (await t.as("qa")).get(`/api/batches/${batchId}`)).body;
  unitId = detail.rows.find((r: { verdict: string }) => r.verdict === "within_tolerance").id;
});
afterAll(async () => t.close());

const qa = () => t.as("qa");

describe("certificates", () => {
  it("refuses to issue before the batch is released, saying so", async () => {
    const res = await (await qa()).post(`/api/units/${unitId}/certificates`).set("Origin", ORIGIN).send({ recipientEmail: "clinic@example.com" });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/BTW-2611 is not released/);
  });

  it("issues after release: 201 with number and verification URL; the mail carries the PDF with the recorded hash", async () => {
    const a = await qa();
    const detail = (await a.get(`/api/batches/${batchId}`)).body;
    for (const row of detail.rows.filter((r: { open: boolean }) => r.open)) {
      expect((await a.post(`/api/units/${row.id}/dispositions`).set("Origin", ORIGIN).send({ decision: "use_as_is", reason: "Concession agreed with the customer." })).status).toBe(201);
    }
    expect((await a.post(`/api/batches/${batchId}/release`).set("Origin", ORIGIN)).status).toBe(200);

    const res = await a.post(`/api/units/${unitId}/certificates`).set("Origin", ORIGIN).send({ recipientEmail: "clinic@example.com", recipientName: "Dr. R. Example" });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.number).toMatch(/^BTW-\d{4}-00001$/);
    expect(res.body.verifyUrl).toMatch(/^http:\/\/tinelog\.test\/verify\/[A-Za-z0-9_-]{22,}$/);
    expect(res.body.certificate.mail.state).toBe("sent");

    const row = t.runtime.db.select().from(certificate).where(eq(certificate.number, res.body.number)).get()!;
    const captured = t.runtime.db.select().from(capturedMail).all().find((m) => m.envelopeTo.includes("clinic@example.com"))!;
    const parsed = await simpleParser(captured.raw);
    expect(parsed.from?.text).toContain("certificates@brightwater.example");
    expect(parsed.replyTo?.text).toContain("quality@brightwater.example");
    expect(parsed.text).toContain(res.body.verifyUrl);
    expect(parsed.html).toContain(res.body.number);
    const pdf = parsed.attachments.find((x) => x.contentType === "application/pdf")!;
    expect(createHash("sha256").update(pdf.content).digest("hex")).toBe(row.pdfSha256);

    // The PDF route gives the same bytes.
    const dl = await a.get(`/api/certificates/${res.body.number}/pdf`).buffer(true).parse((r, cb) => { const c: Buffer[] = []; r.on("data", (d: Buffer) => c.push(d)); r.on("end", () => cb(null, Buffer.concat(c))); });
    expect(createHash("sha256").update(dl.body as Buffer).digest("hex")).toBe(row.pdfSha256);
  });

  it("verifies publicly without any customer contact data, and detects a tampered record", async () => {
    const row = t.runtime.db.select().from(certificate).get()!;
    const res = await request(t.app).get(`/api/verify/${row.verificationCode}`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ number: row.number, signatureValid: true, pdfIntact: true, superseded: false, pdfSha256: row.pdfSha256 });
    const text = JSON.stringify(res.body);
    expect(text).not.toContain("clinic@example.com");
    expect(text).not.toContain("Dr. R. Example");

    // Change one character of the signed data behind Tinelog's back: the signature no longer verifies.
    const tampered = row.canonical.replace('"within_tolerance"', '"out_of_tolerance"');
    t.runtime.sqlite.prepare("UPDATE certificate SET canonical = ? WHERE id = ?").run(tampered, row.id);
    expect((await request(t.app).get(`/api/verify/${row.verificationCode}`)).body.signatureValid).toBe(false);
    t.runtime.sqlite.prepare("UPDATE certificate SET canonical = ? WHERE id = ?").run(row.canonical, row.id);
  });

  it("answers an unknown code with 404, and the verification page (?notFound=ok) with 200 { found: false }", async () => {
    expect((await request(t.app).get("/api/verify/AAAAAAAAAAAAAAAAAAAAAAAA")).status).toBe(404);
    const page = await request(t.app).get("/api/verify/AAAAAAAAAAAAAAAAAAAAAAAA?notFound=ok");
    expect(page.status).toBe(200);
    expect(page.body).toEqual({ found: false });
    expect((await request(t.app).get("/api/verify/not-even-a-code?notFound=ok")).body).toEqual({ found: false });
  });

  it("amends: a new number that names the one it amends; the earlier one is superseded and still retrievable", async () => {
    const a = await qa();
    const first = t.runtime.db.select().from(certificate).get()!;
    const res = await a.post(`/api/units/${unitId}/certificates`).set("Origin", ORIGIN).send({ recipientEmail: "clinic@example.com", amendsNumber: first.number, amendReason: "Customer name misspelt." });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.number).not.toBe(first.number);
    expect(res.body.certificate.amends).toBe(first.number);
    const list = (await a.get(`/api/units/${unitId}/certificates`)).body.certificates;
    expect(list.find((c: { number: string }) => c.number === first.number).state).toBe("superseded");
    expect((await a.get(`/api/certificates/${first.number}/pdf`)).status).toBe(200);
    const v = await request(t.app).get(`/api/verify/${first.verificationCode}`);
    expect(v.body).toMatchObject({ superseded: true, supersededBy: res.body.number });
  });

  it("records a failed send with its reason, keeps the certificate, and retries", async () => {
    const a = await qa();
    const c = t.runtime.db.select().from(certificate).all().at(-1)!;
    await t.runtime.capture!.close(); // the SMTP server goes away
    const failed = await a.post(`/api/certificates/${c.number}/send`).set("Origin", ORIGIN);
    expect(failed.status).toBe(200);
    expect(failed.body.mail.state).toBe("failed");
    expect(failed.body.mail.error).toMatch(/ECONNREFUSED|connect/i);
    expect(t.runtime.db.select().from(certificate).where(eq(certificate.id, c.id)).get()).toBeTruthy();
  });
});
