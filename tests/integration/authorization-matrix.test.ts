/**
 * The authorization matrix: every /api route × (anonymous, maker, qa, owner, another workshop's
 * owner) → the expected status. The test reads the routes from the Express routers themselves and
 * fails when one is missing from the table below, so a new route cannot ship unguarded or untested.
 * Requests that a role may make are sent with a body that fails validation (400) where a success
 * would change the record; that proves the guard let the role through without side effects.
 * better-auth's own endpoints (/api/auth/*) are covered by tests/integration/auth.test.ts.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiRouters } from "../../server/app.ts";
import { batch, disposition, instrument, mailMessage, spec, specVersion, unit } from "../../server/db/schema.ts";
import { ORIGIN, startTestApp, type TestApp, type Who } from "../support/app.ts";
import { toneWav } from "../support/wav.ts";

type Ids = { spec: string; specVersion: string; batch: string; openBatch: string; unit: string; releasedUnit: string; strike: string; mail: string; certificateMail: string; invitation: string; certificate: string; verifyCode: string; disposition: string; recorder: string };
type Row = {
  method: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  path: string;
  url: (ids: Ids) => string;
  /** Expected status for [anonymous, maker, qa, owner, other workshop's owner]. */
  expect: [number, number, number, number, number];
  body?: unknown;
  multipart?: boolean;
};

const WHO: Who[] = ["anonymous", "maker", "qa", "owner", "other"];

export const MATRIX: Row[] = [
  { method: "GET", path: "/health", url: () => "/api/health", expect: [200, 200, 200, 200, 200] },
  // Signed out, /me answers { user: null } rather than an error (no console error on public pages).
  { method: "GET", path: "/me", url: () => "/api/me", expect: [200, 200, 200, 200, 200] },
  { method: "GET", path: "/invitations/:id", url: (i) => `/api/invitations/${i.invitation}`, expect: [200, 200, 200, 200, 200] },
  { method: "GET", path: "/workshop", url: () => "/api/workshop", expect: [401, 200, 200, 200, 200] },
  { method: "PUT", path: "/workshop/profile", url: () => "/api/workshop/profile", body: { certificatePrefix: "lower case" }, expect: [401, 403, 403, 400, 400] },
  { method: "GET", path: "/dashboard", url: () => "/api/dashboard", expect: [401, 200, 200, 200, 200] },
  { method: "GET", path: "/audit", url: () => "/api/audit", expect: [401, 403, 200, 200, 200] },
  // Quality reads the certificate mails only: an invitation is not found for it.
  { method: "GET", path: "/mail", url: () => "/api/mail", expect: [401, 403, 200, 200, 200] },
  { method: "GET", path: "/mail/:id/html", url: (i) => `/api/mail/${i.mail}/html`, expect: [401, 403, 404, 200, 404] },
  { method: "GET", path: "/mail/:id/attachments/:index", url: (i) => `/api/mail/${i.certificateMail}/attachments/0`, expect: [401, 403, 200, 200, 404] },
  { method: "GET", path: "/specs", url: () => "/api/specs", expect: [401, 200, 200, 200, 200] },
  { method: "POST", path: "/specs", url: () => "/api/specs", body: {}, expect: [401, 403, 400, 400, 400] },
  { method: "GET", path: "/specs/:id", url: (i) => `/api/specs/${i.spec}`, expect: [401, 200, 200, 200, 404] },
  { method: "GET", path: "/specs/:id/export", url: (i) => `/api/specs/${i.spec}/export`, expect: [401, 200, 200, 200, 404] },
  // No file attached: the guard lets QA and owners through to the upload's own 400.
  { method: "POST", path: "/specs/master-draft", url: () => "/api/specs/master-draft", multipart: true, expect: [401, 403, 400, 400, 400] },
  { method: "POST", path: "/specs/import", url: () => "/api/specs/import", body: {}, expect: [401, 403, 400, 400, 400] },
  { method: "POST", path: "/specs/:id/versions", url: (i) => `/api/specs/${i.spec}/versions`, body: {}, expect: [401, 403, 400, 400, 404] },
  { method: "GET", path: "/specs/:id/versions/:versionId/predicted-modes", url: (i) => `/api/specs/${i.spec}/versions/${i.specVersion}/predicted-modes`, expect: [401, 200, 200, 200, 404] },
  // An empty JSON body fails validation (no modes): the guard let the role through, nothing stored.
  { method: "POST", path: "/specs/:id/versions/:versionId/predicted-modes", url: (i) => `/api/specs/${i.spec}/versions/${i.specVersion}/predicted-modes`, body: {}, expect: [401, 403, 400, 400, 404] },
  { method: "GET", path: "/specs/:id/mode-map", url: (i) => `/api/specs/${i.spec}/mode-map?batch=${i.batch}`, expect: [401, 200, 200, 200, 404] },
  { method: "GET", path: "/batches", url: () => "/api/batches", expect: [401, 200, 200, 200, 200] },
  { method: "POST", path: "/batches", url: () => "/api/batches", body: {}, expect: [401, 400, 400, 400, 400] },
  { method: "GET", path: "/batches/:id", url: (i) => `/api/batches/${i.batch}`, expect: [401, 200, 200, 200, 404] },
  { method: "GET", path: "/batches/:id/next-unit", url: (i) => `/api/batches/${i.batch}/next-unit`, expect: [401, 200, 200, 200, 404] },
  { method: "POST", path: "/batches/:id/units", url: (i) => `/api/batches/${i.batch}/units`, body: {}, expect: [401, 400, 400, 400, 404] },
  { method: "GET", path: "/batches/:id/ledger.csv", url: (i) => `/api/batches/${i.batch}/ledger.csv`, expect: [401, 200, 200, 200, 404] },
  // The first permitted call moves the open batch to review; the next ones find it in review.
  { method: "POST", path: "/batches/:id/review", url: (i) => `/api/batches/${i.openBatch}/review`, expect: [401, 200, 409, 409, 404] },
  // Units are still unmeasured, so release is refused with the list of open units.
  { method: "POST", path: "/batches/:id/release", url: (i) => `/api/batches/${i.openBatch}/release`, expect: [401, 403, 409, 409, 404] },
  { method: "POST", path: "/batches/:id/strikes", url: (i) => `/api/batches/${i.openBatch}/strikes`, multipart: true, expect: [401, 400, 400, 400, 404] },
  { method: "GET", path: "/units/:id", url: (i) => `/api/units/${i.unit}`, expect: [401, 200, 200, 200, 404] },
  { method: "PATCH", path: "/units/:id", url: (i) => `/api/units/${i.unit}`, body: { customerEmail: "not an e-mail" }, expect: [401, 400, 400, 400, 404] },
  { method: "POST", path: "/units/:id/strikes", url: (i) => `/api/units/${i.unit}/strikes`, multipart: true, expect: [401, 400, 400, 400, 404] },
  { method: "POST", path: "/units/:id/dispositions", url: (i) => `/api/units/${i.unit}/dispositions`, body: {}, expect: [401, 403, 400, 400, 404] },
  { method: "GET", path: "/strikes/:id", url: (i) => `/api/strikes/${i.strike}`, expect: [401, 200, 200, 200, 404] },
  { method: "GET", path: "/strikes/:id/audio", url: (i) => `/api/strikes/${i.strike}/audio`, expect: [401, 200, 200, 200, 404] },
  { method: "GET", path: "/units/:id/certificates", url: (i) => `/api/units/${i.releasedUnit}/certificates`, expect: [401, 200, 200, 200, 404] },
  { method: "POST", path: "/units/:id/certificates", url: (i) => `/api/units/${i.releasedUnit}/certificates`, body: {}, expect: [401, 403, 400, 400, 404] },
  { method: "POST", path: "/units/:id/certificates/preview", url: (i) => `/api/units/${i.releasedUnit}/certificates/preview`, body: {}, expect: [401, 403, 400, 400, 404] },
  { method: "GET", path: "/certificates/:number/pdf", url: (i) => `/api/certificates/${i.certificate}/pdf`, expect: [401, 200, 200, 200, 404] },
  // Re-sends the e-mail (harmless: the capture server receives it).
  { method: "POST", path: "/certificates/:number/send", url: (i) => `/api/certificates/${i.certificate}/send`, expect: [401, 403, 200, 200, 404] },
  { method: "GET", path: "/verify/:code", url: (i) => `/api/verify/${i.verifyCode}`, expect: [200, 200, 200, 200, 200] },
  { method: "POST", path: "/certificates/:number/withdraw", url: (i) => `/api/certificates/${i.certificate}/withdraw`, body: { reason: "x" }, expect: [401, 403, 400, 400, 404] },
  // The maker who uploaded the strike may void it, quality anyone's: a reason too short is refused for all.
  { method: "POST", path: "/strikes/:id/void", url: (i) => `/api/strikes/${i.strike}/void`, body: { reason: "no" }, expect: [401, 400, 400, 400, 404] },
  { method: "POST", path: "/dispositions/:id/supersede", url: (i) => `/api/dispositions/${i.disposition}/supersede`, body: {}, expect: [401, 403, 400, 400, 404] },
  { method: "POST", path: "/batches/:id/dispositions", url: (i) => `/api/batches/${i.openBatch}/dispositions`, body: {}, expect: [401, 403, 400, 400, 404] },
  { method: "GET", path: "/batches/:id/unit-certificates", url: (i) => `/api/batches/${i.batch}/unit-certificates`, expect: [401, 200, 200, 200, 404] },
  // The open batch is not released: the whole run is refused before anything is issued.
  { method: "POST", path: "/batches/:id/unit-certificates", url: (i) => `/api/batches/${i.openBatch}/unit-certificates`, expect: [401, 403, 409, 409, 404] },
  { method: "GET", path: "/batches/:id/certificates", url: (i) => `/api/batches/${i.batch}/certificates`, expect: [401, 200, 200, 200, 404] },
  { method: "POST", path: "/batches/:id/certificates", url: (i) => `/api/batches/${i.batch}/certificates`, body: {}, expect: [401, 403, 400, 400, 404] },
  { method: "GET", path: "/search", url: () => "/api/search?q=F-00", expect: [401, 200, 200, 200, 200] },
  { method: "GET", path: "/instruments", url: () => "/api/instruments", expect: [401, 200, 200, 200, 200] },
  { method: "POST", path: "/instruments", url: () => "/api/instruments", body: {}, expect: [401, 403, 400, 400, 400] },
  { method: "GET", path: "/instruments/:id", url: (i) => `/api/instruments/${i.recorder}`, expect: [401, 200, 200, 200, 404] },
  // Multipart without a recording: the permitted roles get 400 (nothing stored).
  { method: "POST", path: "/instruments/:id/calibrations", url: (i) => `/api/instruments/${i.recorder}/calibrations`, multipart: true, expect: [401, 403, 400, 400, 404] },
  // The released batch's evaluations are final: the permitted roles get 409 (nothing appended).
  { method: "POST", path: "/units/:id/evaluations", url: (i) => `/api/units/${i.releasedUnit}/evaluations`, expect: [401, 403, 409, 409, 404] },
];

/** Every route the API routers declare, as "METHOD /path", with the guard mark of its first handler. */
export function declaredRoutes(t: TestApp) {
  const out: { key: string; permission: string | undefined }[] = [];
  for (const router of apiRouters(t.runtime)) {
    for (const layer of (router as unknown as { stack: { route?: { path: string; methods: Record<string, boolean>; stack: { handle: { permission?: string } }[] } }[] }).stack) {
      if (!layer.route) continue;
      for (const m of Object.keys(layer.route.methods)) {
        out.push({ key: `${m.toUpperCase()} ${layer.route.path}`, permission: layer.route.stack[0]?.handle.permission });
      }
    }
  }
  return out;
}

let t: TestApp;
let ids: Ids;

beforeAll(async () => {
  // The demo seed with its strikes: batch BTW-2611 fully measured (two units out of tolerance).
  t = await startTestApp({ DEMO_STRIKES: "1" });
  const { db } = t.runtime;
  const demo = db.select().from(batch).where(eq(batch.code, "BTW-2611")).get()!;
  const open = db.select().from(batch).where(eq(batch.code, "BTW-2612")).get()!;
  const openUnit = db.select().from(unit).where(eq(unit.batchId, open.id)).all()[0];
  const maker = await t.as("maker");
  const up = await maker.post(`/api/units/${openUnit.id}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(toneWav({ frequencyHz: 440, tauS: 1.5 })), "F-0011.wav");
  expect(up.status, JSON.stringify(up.body)).toBe(202);
  await t.runtime.queue.drained();

  // QA disposes of the units out of tolerance, releases BTW-2611 and issues a certificate.
  const qa = await t.as("qa");
  const detail = (await qa.get(`/api/batches/${demo.id}`)).body;
  for (const row of detail.rows.filter((r: { open: boolean }) => r.open)) {
    const d = await qa.post(`/api/units/${row.id}/dispositions`).set("Origin", ORIGIN).send({ decision: "scrap", reason: "Out of tolerance; scrapped for the matrix test." });
    expect(d.status, JSON.stringify(d.body)).toBe(201);
  }
  const rel = await qa.post(`/api/batches/${demo.id}/release`).set("Origin", ORIGIN);
  expect(rel.status, JSON.stringify(rel.body)).toBe(200);
  const releasedUnit = detail.rows.find((r: { verdict: string }) => r.verdict === "within_tolerance").id;
  const cert = await qa.post(`/api/units/${releasedUnit}/certificates`).set("Origin", ORIGIN).send({ recipientEmail: "customer@example.com", recipientName: "A. Customer" });
  expect(cert.status, JSON.stringify(cert.body)).toBe(201);

  const owner = await t.as("owner");
  const inv = await owner.post("/api/auth/organization/invite-member").set("Origin", ORIGIN).send({ email: "newcomer@example.com", role: "maker" });
  expect(inv.status, JSON.stringify(inv.body)).toBe(200);
  const mail = db.select().from(mailMessage).where(eq(mailMessage.kind, "invitation")).get()!;
  const certificateMail = db.select().from(mailMessage).where(eq(mailMessage.kind, "certificate")).get()!;
  const specId = db.select().from(spec).get()!.id;
  ids = {
    spec: specId,
    specVersion: db.select().from(specVersion).where(eq(specVersion.specId, specId)).get()!.id,
    batch: demo.id,
    openBatch: open.id,
    unit: openUnit.id,
    releasedUnit,
    strike: up.body.id,
    mail: mail.id,
    certificateMail: certificateMail.id,
    invitation: inv.body.id,
    certificate: cert.body.number,
    verifyCode: cert.body.verifyUrl.split("/").pop(),
    disposition: db.select().from(disposition).get()!.id,
    recorder: db.select().from(instrument).where(eq(instrument.name, "Bench recorder A")).get()!.id,
  };
  for (const who of WHO) await t.as(who);
});

afterAll(async () => {
  await t.runtime.queue.drained();
  await t.close();
});

describe("authorization matrix", () => {
  it("has a row for every declared API route, and every route carries a guard", () => {
    const declared = declaredRoutes(t);
    const inTable = new Set(MATRIX.map((r) => `${r.method} ${r.path}`));
    expect(declared.filter((d) => !inTable.has(d.key)).map((d) => d.key), "routes missing from the matrix").toEqual([]);
    expect([...inTable].filter((k) => !declared.some((d) => d.key === k)), "matrix rows for routes that no longer exist").toEqual([]);
    expect(declared.filter((d) => !d.permission).map((d) => d.key), "routes without a guard (requirePermission, requireUser or publicRoute)").toEqual([]);
  });

  for (const row of MATRIX) {
    it(`${row.method} ${row.path}`, async () => {
      const got: number[] = [];
      for (const who of WHO) {
        const agent = await t.as(who);
        let req = agent[row.method.toLowerCase() as "get"](row.url(ids)).set("Origin", ORIGIN);
        if (row.multipart) req = req.field("temperatureC", "20");
        else if (row.body !== undefined) req = req.send(row.body as object);
        got.push((await req).status);
      }
      expect(got).toEqual(row.expect);
    });
  }
});
