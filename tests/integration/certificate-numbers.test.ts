/**
 * Certificate numbers belong to their workshop: two workshops on one server may pick the same
 * prefix and both number from 00001. The PDF is stored by certificate id and written with its row,
 * so a failure between the two leaves neither behind and the retry takes the same number.
 */
import { existsSync, readdirSync } from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { specTemplate } from "../../shared/spec-templates.ts";
import { batch, certificate } from "../../server/db/schema.ts";
import { ORIGIN, startTestApp, type TestApp, type Who } from "../support/app.ts";
import { forkWav } from "../support/wav.ts";

let t: TestApp;
const post = async (who: Who, url: string, body?: object) => (await t.as(who)).post(url).set("Origin", ORIGIN).send(body);
const year = new Date().getUTCFullYear();
let demoRows: { id: string; serial: string; verdict: string | null; open: boolean }[] = [];

beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "1" });
  await t.runtime.queue.drained();
  const demoBatch = t.runtime.db.select().from(batch).where(eq(batch.code, "BTW-2611")).get()!;
  demoRows = (await (await t.as("qa")).get(`/api/batches/${demoBatch.id}`)).body.rows;
  for (const r of demoRows.filter((x) => x.open)) expect((await post("qa", `/api/units/${r.id}/dispositions`, { decision: "scrap", reason: "Out of tolerance." })).status).toBe(201);
  expect((await post("qa", `/api/batches/${demoBatch.id}/release`)).status).toBe(200);
});
afterAll(async () => t.close());

/** The other workshop measures and releases one fork of its own, under the same prefix as the demo workshop. */
async function otherWorkshopUnit(): Promise<string> {
  const other = await t.as("other");
  const profile = (await other.get("/api/workshop")).body.profile;
  expect((await other.put("/api/workshop/profile").set("Origin", ORIGIN).send({ ...profile, certificatePrefix: "BTW" })).status).toBe(200);
  const tpl = specTemplate("tuning_fork");
  const spec = await post("other", "/api/specs", { ...tpl, name: "Fernhollow fork", strikesRequired: 1, partials: [{ ...tpl.partials[0], targetHz: 440, toleranceCents: 5 }] });
  expect(spec.status, JSON.stringify(spec.body)).toBe(201);
  const b = await post("other", "/api/batches", { code: "FH-1", specId: spec.body.id, quantity: 1, range: { from: "C-0001", to: "C-0001" } });
  expect(b.status).toBe(201);
  const unitId = b.body.rows[0].id;
  const up = await other.post(`/api/units/${unitId}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(forkWav({ frequencyHz: 440, seed: 31 })), "C-0001.wav");
  expect(up.status).toBe(202);
  await t.runtime.queue.drained();
  expect((await post("other", `/api/batches/${b.body.id}/release`)).status).toBe(200);
  return unitId;
}

const pdfFiles = () => {
  const root = path.join(t.dataDir, "certificates");
  return existsSync(root) ? readdirSync(root, { recursive: true, withFileTypes: true }).filter((e) => e.isFile()).map((e) => e.name) : [];
};

describe("certificate numbers per workshop", () => {
  it("lets two workshops with the same prefix each issue number 00001", async () => {
    const within = demoRows.filter((r) => r.verdict === "within_tolerance");
    const mine = await post("qa", `/api/units/${within[0].id}/certificates`, { recipientEmail: "a@example.org" });
    expect(mine.status, JSON.stringify(mine.body)).toBe(201);
    expect(mine.body.number).toBe(`BTW-${year}-00001`);
    const theirs = await post("other", `/api/units/${await otherWorkshopUnit()}/certificates`, { recipientEmail: "b@example.org" });
    expect(theirs.status, JSON.stringify(theirs.body)).toBe(201);
    expect(theirs.body.number).toBe(`BTW-${year}-00001`);
    // Each workshop reads its own under that number.
    expect((await (await t.as("qa")).get(`/api/certificates/${mine.body.number}/pdf`)).status).toBe(200);
    expect((await (await t.as("other")).get(`/api/certificates/${theirs.body.number}/pdf`)).status).toBe(200);
  });

  it("leaves neither row nor file behind when the write fails between them, and the retry takes the same number", async () => {
    const unitId = demoRows.filter((r) => r.verdict === "within_tolerance")[1].id;
    const before = pdfFiles();
    // A failure at the moment the row is written (a full disk, a constraint): injected with a
    // temporary trigger on the app's own connection.
    t.runtime.sqlite.exec("CREATE TEMP TRIGGER fail_certificate_insert BEFORE INSERT ON certificate BEGIN SELECT RAISE(ABORT, 'injected write failure'); END;");
    try {
      const failed = await post("qa", `/api/units/${unitId}/certificates`, { recipientEmail: "c@example.org" });
      expect(failed.status).toBe(500);
    } finally {
      t.runtime.sqlite.exec("DROP TRIGGER fail_certificate_insert");
    }
    expect(pdfFiles()).toEqual(before);
    expect(t.runtime.db.select().from(certificate).where(eq(certificate.unitId, unitId)).all()).toEqual([]);

    const retry = await post("qa", `/api/units/${unitId}/certificates`, { recipientEmail: "c@example.org" });
    expect(retry.status, JSON.stringify(retry.body)).toBe(201);
    expect(retry.body.number).toBe(`BTW-${year}-00002`);
    const row = t.runtime.db.select().from(certificate).where(eq(certificate.number, retry.body.number)).all().find((c) => c.unitId === unitId)!;
    expect(row.pdfKey).toBe(`${row.workshopId}/${row.id}.pdf`);
    expect(pdfFiles()).toHaveLength(before.length + 1);
  });
});
