/**
 * The workshop's daily loop through the API, with the real analysis pool: QA writes a spec, a maker
 * creates a batch and uploads strikes, Tinelog evaluates each unit, QA disposes of the units out of
 * tolerance and releases the batch. Expected pitches follow from the synthesised strikes
 * (f = 440·2^(c/1200), the definition of cents) — the analysis itself is checked in tests/reference.
 */
import { readdirSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { specTemplate } from "../../shared/spec-templates.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";
import { forkWav } from "../support/wav.ts";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0", UPLOAD_LIMIT_MB: "1" });
});
afterAll(async () => t.close());

const post = async (who: "maker" | "qa" | "owner", url: string, body?: object) => (await t.as(who)).post(url).set("Origin", ORIGIN).send(body);
const upload = async (unitId: string, wav: Uint8Array, name: string, fields: Record<string, string> = {}) => {
  let req = (await t.as("maker")).post(`/api/units/${unitId}/strikes`).set("Origin", ORIGIN);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return req.attach("audio", Buffer.from(wav), name);
};
const cents = (c: number) => 440 * 2 ** (c / 1200);

let specId = "";
let batchId = "";
let units: { id: string; serial: string }[] = [];

describe("specifications", () => {
  it("creates a spec from the tuning-fork template", async () => {
    const tpl = specTemplate("tuning_fork");
    const res = await post("qa", "/api/specs", { ...tpl, name: "Test fork A4", strikesRequired: 1, decisionRule: "simple", partials: [{ ...tpl.partials[0], toleranceCents: 5 }, tpl.partials[1]] });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.currentVersion).toBe(1);
    specId = res.body.id;
  });

  it("refuses a tolerance ≤ 0, a ratio target without a fundamental and duplicate labels, naming the fields", async () => {
    const tpl = specTemplate("tuning_fork");
    const bad = await post("qa", "/api/specs", {
      ...tpl,
      name: "Broken",
      partials: [
        { ...tpl.partials[1], label: "Same", isFundamental: false, toleranceCents: 0 },
        { ...tpl.partials[1], label: "same" },
      ],
    });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(["partials.0.toleranceCents", "partials.0.ratio", "partials.1.label"]));
  });

  it("makes a new version on edit and keeps the old one", async () => {
    const current = (await (await t.as("qa")).get(`/api/specs/${specId}`)).body;
    const v1 = current.versions[0];
    const res = await post("qa", `/api/specs/${specId}/versions`, { ...v1, changeNote: "Wider overtone window" , partials: v1.partials.map((p: { toleranceCents: number; isFundamental: boolean }) => (p.isFundamental ? p : { ...p, toleranceCents: 120 })) });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.versions.map((v: { version: number }) => v.version)).toEqual([2, 1]);
    expect(res.body.versions[1].partials[1].toleranceCents).toBe(v1.partials[1].toleranceCents);
  });

  it("does not let a maker write specs", async () => {
    expect((await post("maker", "/api/specs", specTemplate("bowl"))).status).toBe(403);
  });
});

describe("batches and units", () => {
  it("creates a batch with a serial range, pinned to the spec version", async () => {
    const res = await post("maker", "/api/batches", { code: "T-1", specId, quantity: 4, range: { from: "T-0001", to: "T-0004" } });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.spec.version).toBe(2);
    expect(res.body.rows.map((r: { serial: string }) => r.serial)).toEqual(["T-0001", "T-0002", "T-0003", "T-0004"]);
    batchId = res.body.id;
    units = res.body.rows;
  });

  it("refuses a serial range that overlaps existing units with 409, and a duplicate batch code", async () => {
    const overlap = await post("maker", `/api/batches/${batchId}/units`, { range: { from: "T-0004", to: "T-0006" } });
    expect(overlap.status).toBe(409);
    expect(overlap.body.error.message).toContain("T-0004");
    expect((await post("maker", "/api/batches", { code: "T-1", specId, quantity: 1 })).status).toBe(409);
  });

  it("adds units by list", async () => {
    const res = await post("maker", `/api/batches/${batchId}/units`, { serials: ["T-0005"] });
    expect(res.status).toBe(201);
    units = res.body.rows;
    expect(units).toHaveLength(5);
  });
});

describe("strike upload and evaluation", () => {
  it("accepts a WAV with 202, analyses it in the pool and evaluates the unit", async () => {
    const res = await upload(units[0].id, forkWav({ frequencyHz: cents(1), seed: 11 }), "T-0001.wav", { temperatureC: "20", support: "hand" });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    expect(res.body.state).toBe("queued");
    await t.runtime.queue.drained();
    const unit = (await (await t.as("maker")).get(`/api/units/${units[0].id}`)).body;
    expect(unit.strikes[0].state).toBe("done");
    expect(unit.evaluation.verdict).toBe("within_tolerance");
    const strikeView = (await (await t.as("maker")).get(`/api/strikes/${res.body.id}`)).body;
    expect(strikeView.strikes[0].partials[0]).toMatchObject({ frequencyHz: expect.any(Number), tauS: expect.any(Number), t60S: expect.any(Number), q: expect.any(Number), beatHz: null });
    expect(strikeView.warnings).toEqual(expect.any(Array));
    const fund = unit.evaluation.requirements[0];
    expect(fund.deviationCents).toBeCloseTo(1, 1); // synthesised at +1 cent
    expect(fund.expandedUncertaintyHz).toBeGreaterThan(0);
  });

  it("recognises the same file uploaded twice to the same unit", async () => {
    const again = await upload(units[0].id, forkWav({ frequencyHz: cents(1), seed: 11 }), "copy.wav");
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already uploaded to this unit as "T-0001.wav"/);
  });

  it("flags a unit out of tolerance with tuning guidance and a safety caution", async () => {
    expect((await upload(units[1].id, forkWav({ frequencyHz: cents(-20), seed: 12 }), "T-0002.wav")).status).toBe(202);
    await t.runtime.queue.drained();
    const unit = (await (await t.as("qa")).get(`/api/units/${units[1].id}`)).body;
    expect(unit.evaluation.verdict).toBe("out_of_tolerance");
    expect(unit.evaluation.guidance.direction).toBe("raise");
    expect(unit.evaluation.guidance.caution).toMatch(/eye and hearing protection/);
  });

  it("matches the unit by serial in the file name on the batch quick path", async () => {
    const res = (await t.as("maker")).post(`/api/batches/${batchId}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(forkWav({ frequencyHz: cents(0.5), seed: 13 })), "bench-T-0003-take1.wav");
    const r = await res;
    expect(r.status, JSON.stringify(r.body)).toBe(202);
    expect(r.body.serial).toBe("T-0003");
    expect(r.body.matchedBy).toBe("file name");
  });

  it("answers a file that is not a WAV with 415 and leaves nothing behind", async () => {
    const res = await upload(units[3].id, new TextEncoder().encode("just some text, not audio"), "notes.wav");
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/WAV/);
    expect(readdirSync(t.runtime.storage.incoming)).toEqual([]);
  });

  it("refuses an upload over the size limit with 413", async () => {
    const big = forkWav({ frequencyHz: 440, durationS: 12, seed: 14 }); // ~1.15 MB > 1 MB limit in this test
    const res = await upload(units[3].id, big, "long.wav");
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/upload limit of 1 MB/);
    expect(readdirSync(t.runtime.storage.incoming)).toEqual([]);
  });

  it("stores a WAV the engine cannot analyse as failed, with a reason a maker can act on", async () => {
    const silent = new Uint8Array(forkWav({ frequencyHz: 440, durationS: 1, seed: 15 }));
    silent.fill(0, 44); // keep the header, silence the samples
    const res = await upload(units[3].id, silent, "silent.wav");
    expect(res.status).toBe(202);
    await t.runtime.queue.drained();
    const strike = (await (await t.as("maker")).get(`/api/strikes/${res.body.id}`)).body;
    expect(strike.state).toBe("failed");
    expect(strike.failureReason).toMatch(/silen/i);
    const unit = (await (await t.as("maker")).get(`/api/units/${units[3].id}`)).body;
    expect(unit.evaluation).toBeNull();
  });
});

describe("disposition and release", () => {
  it("refuses release while units are open, listing them", async () => {
    const res = await post("qa", `/api/batches/${batchId}/release`);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/T-0002 \(out of tolerance, no disposition\)/);
    expect(res.body.error.message).toMatch(/T-0004 \(not measured\)|T-0004/);
  });

  it("lets QA dispose of open units, then release; a maker cannot", async () => {
    await t.runtime.queue.drained();
    const batch = (await (await t.as("qa")).get(`/api/batches/${batchId}`)).body;
    expect((await post("maker", `/api/units/${units[1].id}/dispositions`, { decision: "rework", reason: "grind" })).status).toBe(403);
    for (const row of batch.rows.filter((r: { open: boolean; verdict: string | null }) => r.open)) {
      if (row.verdict === null) continue;
      const d = await post("qa", `/api/units/${row.id}/dispositions`, { decision: "scrap", reason: "Pitch far off; scrap." });
      expect(d.status, JSON.stringify(d.body)).toBe(201);
    }
    // Two units were never measured: give them a strike each.
    for (const row of batch.rows.filter((r: { verdict: string | null }) => r.verdict === null)) {
      expect((await upload(row.id, forkWav({ frequencyHz: cents(-1), seed: 20 + row.serial.length + Number(row.serial.slice(-1)) }), `${row.serial}.wav`)).status).toBe(202);
    }
    await t.runtime.queue.drained();
    expect((await post("maker", `/api/batches/${batchId}/release`)).status).toBe(403);
    const rel = await post("qa", `/api/batches/${batchId}/release`);
    expect(rel.status, JSON.stringify(rel.body)).toBe(200);
    expect(rel.body.state).toBe("released");
    expect(rel.body.releasedBy.name).toBeTruthy();
  });

  it("refuses new strikes on a released batch", async () => {
    const res = await upload(units[4].id, forkWav({ frequencyHz: 440, seed: 99 }), "late.wav");
    expect(res.status).toBe(409);
  });

  it("exports the ledger as CSV", async () => {
    const res = await (await t.as("maker")).get(`/api/batches/${batchId}/ledger.csv`);
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/text\/csv/);
    const lines = res.text.trim().split("\r\n");
    expect(lines[0]).toMatch(/^serial,verdict,verdict_code,why,/);
    // The fundamental's T60 with the decay it was extrapolated from (dB the recordings saw).
    const cols = lines[0].split(",");
    const t60Col = cols.findIndex((c) => c.endsWith("_t60_s"));
    expect(cols[t60Col + 1]).toMatch(/_t60_observed_decay_db$/);
    const measured = lines.slice(1).map((l) => l.split(",")).find((c) => c[t60Col] !== "");
    expect(Number(measured![t60Col + 1])).toBeGreaterThan(0);
    expect(lines).toHaveLength(6);
    expect(lines.find((l) => l.startsWith("T-0002"))).toMatch(/^T-0002,Out of tolerance,out_of_tolerance,/);
  });

  it("keeps an audit trail of who did what", async () => {
    const res = await (await t.as("qa")).get("/api/audit");
    const actions = res.body.events.map((e: { action: string }) => e.action);
    expect(actions).toEqual(expect.arrayContaining(["spec.create", "spec.version", "batch.create", "strike.upload", "unit.evaluate", "unit.disposition", "batch.release"]));
  });
});

describe("dashboard", () => {
  it("counts the units QA still has to decide on, not those already disposed of", async () => {
    const fresh = await startTestApp({ DEMO_STRIKES: "1" });
    try {
      await fresh.runtime.queue.drained();
      const qa = await fresh.as("qa");
      expect((await qa.get("/api/dashboard")).body.awaitingReview).toBe(2); // F-0004 and F-0008 of the demo batch
      const batch = (await qa.get("/api/batches")).body.batches.find((b: { code: string }) => b.code === "BTW-2611");
      const row = (await qa.get(`/api/batches/${batch.id}`)).body.rows.find((r: { serial: string }) => r.serial === "F-0004");
      expect((await qa.post(`/api/units/${row.id}/dispositions`).set("Origin", ORIGIN).send({ decision: "scrap", reason: "Too flat to rework." })).status).toBe(201);
      expect((await qa.get("/api/dashboard")).body.awaitingReview).toBe(1);
    } finally {
      await fresh.close();
    }
  });
});

describe("a unit's history", () => {
  it("includes the unit's strike uploads as well as its evaluations and dispositions", async () => {
    const res = await (await t.as("qa")).get(`/api/audit?unitId=${units[1].id}`);
    const actions = res.body.events.map((e: { action: string }) => e.action);
    expect(actions).toEqual(expect.arrayContaining(["strike.upload", "unit.evaluate", "unit.disposition"]));
    expect(res.body.events.every((e: { entityId: string; action: string }) => e.entityId === units[1].id || e.action.startsWith("strike."))).toBe(true);
  });
});

describe("instrument tolerances", () => {
  it("uses the workshop's clock and thermometer tolerances in new evaluations and records them", async () => {
    const w = await startTestApp({ DEMO_STRIKES: "0" });
    try {
      const owner = await w.as("owner");
      const profile = (await owner.get("/api/workshop")).body.profile;
      expect(profile).toMatchObject({ clockTolerancePpm: 50, thermometerToleranceC: 0.5, tempCoefficientTolerancePercent: 20 });
      const put = await owner.put("/api/workshop/profile").set("Origin", ORIGIN).send({ ...profile, clockTolerancePpm: 200 });
      expect(put.status, JSON.stringify(put.body)).toBe(200);
      expect((await owner.put("/api/workshop/profile").set("Origin", ORIGIN).send({ ...profile, clockTolerancePpm: -1 })).body.error.fields).toHaveProperty("clockTolerancePpm");

      const batches = (await owner.get("/api/batches")).body.batches;
      const open = (await owner.get(`/api/batches/${batches.find((b: { code: string }) => b.code === "BTW-2612").id}`)).body.rows[0];
      const maker = await w.as("maker");
      expect((await maker.post(`/api/units/${open.id}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(forkWav({ frequencyHz: 440, seed: 77 })), "tol.wav")).status).toBe(202);
      await w.runtime.queue.drained();
      const ev = (await maker.get(`/api/units/${open.id}`)).body.evaluation;
      expect(ev.assumptions).toEqual({ clockHalfWidthPpm: 200, thermometerHalfWidthC: 0.5, tempCoefficientRelativeHalfWidth: 0.2 });
      // U ≥ 2·f·(200 ppm)/√3 (GUM §4.3.7, rectangular; k = 2): the clock term alone.
      expect(ev.requirements[0].expandedUncertaintyHz).toBeGreaterThanOrEqual((2 * 440 * 200e-6) / Math.sqrt(3));
    } finally {
      await w.close();
    }
  });
});
