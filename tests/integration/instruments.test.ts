/**
 * Instruments through the API, with the real analysis pool: a recorder calibrated from reference
 * tones, its offset removed from the strikes it records, a thermometer's offset removed from its
 * readings, and what happens with an uncalibrated or an expired instrument — in the evaluation's
 * stored budget and in the certificate's text (read back from the PDF with pdf-parse).
 *
 * Expected numbers follow from how the inputs were made: a tone written at f·(1 + 73·10⁻⁶) and
 * labelled 48 kHz reads 73 ppm high (the definition of the offset); a generator certificate of
 * ±1 mHz at 1 kHz (k = 2) is 0.5 ppm standard (GUM JCGM 100:2008 §4.3.3, U/k); an assumed ±50 ppm is
 * 50/√3 ppm standard (GUM §4.3.7).
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { evaluation, instrumentCalibration } from "../../server/db/schema.ts";
import { specTemplate } from "../../shared/spec-templates.ts";
import { synthReferenceToneWav, synthStrikeWav } from "../../seeds/synth.ts";
import { parsePdf } from "../certificates/pdf-text.ts";
import { ORIGIN, startTestApp, type TestApp, type Who } from "../support/app.ts";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0" });
});
afterAll(async () => t.close());

const as = (who: Who) => t.as(who);
const post = async (who: Who, url: string, body?: object) => (await as(who)).post(url).set("Origin", ORIGIN).send(body);
const daysAgo = (d: number) => new Date(Date.now() - d * 86_400_000).toISOString().slice(0, 10);

/** A recorder calibration upload: one file per tone, fields repeated in file order. */
async function calibrate(instrumentId: string, tones: { wav: Uint8Array; referenceHz: number }[], fields: Record<string, string> = {}, who: Who = "qa") {
  let req = (await as(who)).post(`/api/instruments/${instrumentId}/calibrations`).set("Origin", ORIGIN);
  for (const tone of tones) req = req.field("referenceHz", String(tone.referenceHz));
  req = req.field("referenceUncertaintyHz", fields.referenceUncertaintyHz ?? "0.001").field("referenceCertificate", fields.referenceCertificate ?? "GEN-1 (test)");
  for (const [k, v] of Object.entries(fields)) if (k !== "referenceUncertaintyHz" && k !== "referenceCertificate") req = req.field(k, v);
  tones.forEach((tone, i) => (req = req.attach("audio", Buffer.from(tone.wav), `tone-${i}.wav`)));
  return req;
}

async function newInstrument(kind: "recorder" | "thermometer", name: string, validityMonths = 12) {
  const res = await post("owner", "/api/instruments", { kind, name, model: "test model", serial: `S-${name}`, validityMonths });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id as string;
}

describe("instruments", () => {
  it("owner and QA create instruments, a maker cannot; everyone lists them, never calibrated at first", async () => {
    const id = await newInstrument("recorder", "Test recorder 1");
    expect((await post("maker", "/api/instruments", { kind: "recorder", name: "Maker's own", validityMonths: 12 })).status).toBe(403);
    expect((await post("qa", "/api/instruments", { kind: "recorder", name: "Test recorder 1", validityMonths: 12 })).status).toBe(409);
    const bad = await post("qa", "/api/instruments", { kind: "microscope", name: "", validityMonths: 0 });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(["kind", "name", "validityMonths"]));
    const list = (await (await as("maker")).get("/api/instruments")).body.instruments;
    expect(list.find((i: { id: string }) => i.id === id)).toMatchObject({ status: "never", latest: null, calibrations: 0 });
  });

  it("another workshop's instrument is 404 to read and to calibrate", async () => {
    const id = await newInstrument("recorder", "Test recorder private");
    expect((await (await as("other")).get(`/api/instruments/${id}`)).status).toBe(404);
    const res = await calibrate(id, [{ wav: synthReferenceToneWav({ frequencyHz: 1000, offsetPpm: 0, seed: 1, durationS: 3 }), referenceHz: 1000 }], {}, "other");
    expect(res.status).toBe(404);
    expect((await (await as("other")).get("/api/instruments")).body.instruments.some((i: { id: string }) => i.id === id)).toBe(false);
  });
});

describe("recorder calibration from reference tones", () => {
  let recorder = "";
  beforeAll(async () => {
    recorder = await newInstrument("recorder", "Test recorder calibrated");
  });

  it("measures a 1000 Hz tone written 73 ppm high: 201 with the offset, its GUM uncertainty and the due date", async () => {
    const res = await calibrate(recorder, [{ wav: synthReferenceToneWav({ frequencyHz: 1000, offsetPpm: 73, seed: 2, durationS: 5 }), referenceHz: 1000 }]);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const { offsetPpm, offsetUncertaintyPpm, validUntil } = res.body;
    // u = √(u_meas² + u_ref²); u_ref = (0.001 Hz / 2) / 1000 Hz = 0.5 ppm dominates (the fit's is ~10⁻³ ppm).
    expect(offsetUncertaintyPpm).toBeGreaterThanOrEqual(0.5);
    expect(offsetUncertaintyPpm).toBeLessThan(0.51);
    expect(Math.abs(offsetPpm - 73)).toBeLessThan(0.01);
    const months = (new Date(validUntil).getTime() - Date.now()) / (30.44 * 86_400_000);
    expect(months).toBeGreaterThan(11.9);
    expect(months).toBeLessThan(12.1);
    const detail = (await (await as("maker")).get(`/api/instruments/${recorder}`)).body;
    expect(detail.status).toBe("calibrated");
    expect(detail.history[0].tones[0]).toMatchObject({ referenceHz: 1000, referenceCertificate: "GEN-1 (test)" });
    expect(t.runtime.db.select().from(instrumentCalibration).where(eq(instrumentCalibration.id, res.body.id)).get()).toBeTruthy();
  });

  it("combines 440 Hz and 1 kHz into one offset; tones on one certificate do not average its uncertainty away", async () => {
    const id = await newInstrument("recorder", "Test recorder two tones");
    const res = await calibrate(id, [
      { wav: synthReferenceToneWav({ frequencyHz: 440, offsetPpm: -31, seed: 3, durationS: 5 }), referenceHz: 440 },
      { wav: synthReferenceToneWav({ frequencyHz: 1000, offsetPpm: -31, seed: 4, durationS: 5 }), referenceHz: 1000 },
    ], { referenceUncertaintyHz: "0.001" });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.offsetPpm).toBeCloseTo(-31, 1);
    const c = res.body.calibration;
    expect(c.frequencyDependence).toMatchObject({ checked: true, consistent: true });
    // u_ref is 1.14 ppm at 440 Hz and 0.5 ppm at 1 kHz, fully correlated: the weighted mean keeps ≥ 0.5 ppm.
    expect(res.body.offsetUncertaintyPpm).toBeGreaterThan(0.5);
    expect(c.warnings).toEqual([]);
  });

  it("warns when the offset depends on frequency (that is not a clock error)", async () => {
    const id = await newInstrument("recorder", "Test recorder resampling");
    const res = await calibrate(id, [
      { wav: synthReferenceToneWav({ frequencyHz: 440, offsetPpm: 10, seed: 5, durationS: 4 }), referenceHz: 440 },
      { wav: synthReferenceToneWav({ frequencyHz: 1000, offsetPpm: 40, seed: 6, durationS: 4 }), referenceHz: 1000 },
    ], { referenceCertificate: "GEN-2 (test)" });
    expect(res.status).toBe(201);
    expect(res.body.calibration.frequencyDependence.consistent).toBe(false);
    expect(res.body.calibration.warnings[0]).toMatch(/depends on the frequency.*not a clock error/);
  });

  it("refuses unfit references in words and stores nothing", async () => {
    const before = t.runtime.db.select().from(instrumentCalibration).all().length;
    const noisy = synthStrikeWav({ durationS: 4, onsetS: 0, seed: 7, noise: 0.08, partials: [{ frequencyHz: 1000, amplitude: 0.3, tauS: 1e9 }] });
    const two = synthStrikeWav({ durationS: 4, onsetS: 0, seed: 8, partials: [{ frequencyHz: 1000, amplitude: 0.3, tauS: 1e9 }, { frequencyHz: 660, amplitude: 0.25, tauS: 1e9 }] });
    const clipped = synthStrikeWav({ durationS: 4, onsetS: 0, seed: 9, partials: [{ frequencyHz: 1000, amplitude: 1.4, tauS: 1e9 }] });
    const cases: [Uint8Array, RegExp][] = [
      [noisy, /noisy: the tone stands only \d+ dB above/],
      [two, /more than one tone \(660\.00 Hz, 1000\.0 Hz/],
      [clipped, /clipped/],
      [synthReferenceToneWav({ frequencyHz: 1012, offsetPpm: 0, seed: 10, durationS: 3 }), /strongest tone .* 1012\.0 Hz, but the reference was given as 1000\.0 Hz/],
    ];
    for (const [wav, words] of cases) {
      const res = await calibrate(recorder, [{ wav, referenceHz: 1000 }]);
      expect(res.status, JSON.stringify(res.body)).toBe(422);
      expect(res.body.error.message).toMatch(words);
      expect(res.body.error.fields).toHaveProperty("audio");
    }
    const text = await (await as("qa")).post(`/api/instruments/${recorder}/calibrations`).set("Origin", ORIGIN).field("referenceHz", "1000").field("referenceUncertaintyHz", "0.001").field("referenceCertificate", "X").attach("audio", Buffer.from("not a wav at all"), "x.wav");
    expect(text.status).toBe(415);
    const missing = await (await as("qa")).post(`/api/instruments/${recorder}/calibrations`).set("Origin", ORIGIN).attach("audio", Buffer.from(synthReferenceToneWav({ frequencyHz: 1000, offsetPpm: 0, seed: 11, durationS: 2 })), "y.wav");
    expect(missing.status).toBe(400);
    expect(Object.keys(missing.body.error.fields)).toEqual(expect.arrayContaining(["referenceHz", "referenceUncertaintyHz", "referenceCertificate"]));
    const json = await post("qa", `/api/instruments/${recorder}/calibrations`, { points: [{ referenceC: 20, offsetC: 0.1 }], uncertaintyC: 0.1, certificateNumber: "X" });
    expect(json.status).toBe(415);
    expect(json.body.error.message).toMatch(/is a recorder/);
    expect((await calibrate(recorder, [{ wav: noisy, referenceHz: 1000 }], {}, "maker")).status).toBe(403);
    expect(t.runtime.db.select().from(instrumentCalibration).all().length).toBe(before);
  });
});

describe("corrections in the evaluation, the strike and the certificate", () => {
  let specId = "";
  let batchId = "";
  let units: { id: string; serial: string }[] = [];
  let calibrated = "";
  let uncalibrated = "";
  let expired = "";
  let thermometer = "";

  const upload = async (unitId: string, f0: number, fields: Record<string, string>, seed: number) => {
    let req = (await as("maker")).post(`/api/units/${unitId}/strikes`).set("Origin", ORIGIN);
    for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
    const wav = synthStrikeWav({ durationS: 3, seed, partials: [{ frequencyHz: f0, amplitude: 0.3, tauS: 4 }, { frequencyHz: f0 * 6.1, amplitude: 0.08, tauS: 0.4 }] });
    return req.attach("audio", Buffer.from(wav), `${unitId}.wav`);
  };
  const unitView = async (id: string) => (await (await as("qa")).get(`/api/units/${id}`)).body;

  beforeAll(async () => {
    const tpl = specTemplate("tuning_fork");
    const spec = await post("qa", "/api/specs", { ...tpl, name: "Instrument test fork", strikesRequired: 1, decisionRule: "simple", referenceTemperatureC: 20, partials: [{ ...tpl.partials[0], targetHz: 440, toleranceCents: 5 }, { ...tpl.partials[1], required: false }] });
    specId = spec.body.id;
    const b = await post("maker", "/api/batches", { code: "I-1", specId, quantity: 5, range: { from: "I-0001", to: "I-0005" } });
    batchId = b.body.id;
    units = b.body.rows;
    calibrated = await newInstrument("recorder", "Corr recorder calibrated");
    expect((await calibrate(calibrated, [{ wav: synthReferenceToneWav({ frequencyHz: 1000, offsetPpm: 73, seed: 21, durationS: 4 }), referenceHz: 1000 }], { referenceCertificate: "GEN-7 (test)" })).status).toBe(201);
    uncalibrated = await newInstrument("recorder", "Corr recorder never calibrated");
    expired = await newInstrument("recorder", "Corr recorder expired");
    // Calibrated 13 months ago, valid 12 months: expired a month ago.
    expect((await calibrate(expired, [{ wav: synthReferenceToneWav({ frequencyHz: 1000, offsetPpm: -20, seed: 22, durationS: 4 }), referenceHz: 1000 }], { calibratedOn: daysAgo(396) })).status).toBe(201);
    thermometer = await newInstrument("thermometer", "Corr thermometer");
    const th = await post("qa", `/api/instruments/${thermometer}/calibrations`, { points: [{ referenceC: 20, offsetC: 0.2 }, { referenceC: 30, offsetC: 0.4 }], uncertaintyC: 0.1, certificateNumber: "TC-9 (test)", calibratedBy: "a test laboratory", calibratedOn: daysAgo(10) });
    expect(th.status, JSON.stringify(th.body)).toBe(201);
    expect(th.body.calibration.uncertaintyC).toBeCloseTo(0.05, 12); // U = 0.1 °C with k = 2 → 0.05 °C (GUM §4.3.3)
  });

  it("a calibrated recorder: the frequencies are corrected, the raw value stays, the budget uses the calibration", async () => {
    // A fork at exactly 440 Hz, recorded by a clock 73 ppm off: it reads 440·(1 + 73·10⁻⁶) Hz.
    const res = await upload(units[0].id, 440 * (1 + 73e-6), { recorderId: calibrated }, 31);
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    await t.runtime.queue.drained();
    const u = await unitView(units[0].id);
    const ev = u.evaluation;
    expect(ev.requirements[0].measuredHz).toBeCloseTo(440, 3);
    const strike = (await (await as("maker")).get(`/api/strikes/${res.body.id}`)).body;
    expect(strike.strikes[0].partials[0].frequencyHz).toBeCloseTo(440.0321, 3); // as recorded
    expect(strike.correction.recorder).toMatchObject({ status: "calibrated", assumed: false, instrument: { id: calibrated } });
    expect(strike.correction.recorder.offsetPpm).toBeCloseTo(73, 1);
    expect(strike.appliedIn.evaluationId).toBe(ev.id);
    const clock = ev.traceability.budget.components.find((c: { source: string }) => c.source === "clock");
    expect(clock).toMatchObject({ distribution: "normal", unit: "ppm" });
    expect(clock.standardUncertainty).toBeCloseTo(strike.correction.recorder.standardUncertaintyPpm, 12);
    expect(clock.standardUncertainty).toBeLessThan(0.51);
    expect(ev.traceability.notes).toEqual([]);
    expect(ev.traceability.traceable).toBe(true);
    // The stored budget is the evaluation's uncertainty.
    expect(ev.traceability.budget.combinedHz).toBeCloseTo(ev.requirements[0].uncertaintyHz, 12);
  });

  it("an uncalibrated recorder: accepted, nothing corrected, the assumed ±50 ppm in the budget, said in words", async () => {
    expect((await upload(units[1].id, 440 * (1 + 73e-6), { recorderId: uncalibrated }, 32)).status).toBe(202);
    await t.runtime.queue.drained();
    const ev = (await unitView(units[1].id)).evaluation;
    expect(ev.requirements[0].measuredHz).toBeCloseTo(440.0321, 3);
    expect(ev.traceability.notes.join(" ")).toContain("uncalibrated instrument: assumed tolerance used");
    expect(ev.traceability.traceable).toBe(false);
    const clock = ev.traceability.budget.components.find((c: { source: string }) => c.source === "clock");
    expect(clock).toMatchObject({ distribution: "rectangular" });
    expect(clock.standardUncertainty).toBeCloseTo(50 / Math.sqrt(3), 9);
  });

  it("an expired recorder: accepted, its old offset not applied, the assumed tolerance used", async () => {
    expect((await upload(units[2].id, 440 * (1 - 20e-6), { recorderId: expired }, 33)).status).toBe(202);
    await t.runtime.queue.drained();
    const ev = (await unitView(units[2].id)).evaluation;
    expect(ev.requirements[0].measuredHz).toBeCloseTo(440 * (1 - 20e-6), 3);
    expect(ev.traceability.strikes[0].recorder).toMatchObject({ status: "expired", assumed: true, offsetPpm: 0 });
    expect(ev.traceability.notes[0]).toMatch(/expired on .* uncalibrated instrument: assumed tolerance used/);
  });

  it("a calibrated thermometer: its offset is taken off the reading and its uncertainty replaces the assumed ±0.5 °C", async () => {
    expect((await upload(units[3].id, 440 * (1 + 73e-6), { recorderId: calibrated, thermometerId: thermometer, temperatureC: "25.3" }, 34)).status).toBe(202);
    await t.runtime.queue.drained();
    const ev = (await unitView(units[3].id)).evaluation;
    const th = ev.traceability.strikes[0].thermometer;
    // Points (20 °C, +0.2) and (30 °C, +0.4) read 20.2 and 30.4: at 25.3 the offset is 0.2 + 0.2·(5.1/10.2) = 0.3 °C.
    expect(th.offsetC).toBeCloseTo(0.3, 9);
    expect(th.correctedC).toBeCloseTo(25.0, 9);
    const comp = ev.traceability.budget.components.find((c: { source: string }) => c.source === "thermometer");
    expect(comp.standardUncertainty).toBeCloseTo(0.05, 12);
    expect(comp.distribution).toBe("normal");
    // Clock offset removed (440 Hz), then corrected to 20 °C with α = −1·10⁻⁴/°C from 25.0 °C: f_ref = f / (1 − 5·10⁻⁴).
    expect(ev.requirements[0].measuredHz).toBeCloseTo(440 / (1 - 5e-4), 2);
  });

  it("refuses a thermometer without a temperature, a recorder id that is a thermometer, and another workshop's recorder", async () => {
    const noTemp = await upload(units[4].id, 440, { thermometerId: thermometer }, 35);
    expect(noTemp.status).toBe(400);
    expect(noTemp.body.error.fields).toHaveProperty("temperatureC");
    const wrongKind = await upload(units[4].id, 440, { recorderId: thermometer }, 36);
    expect(wrongKind.status).toBe(400);
    expect(wrongKind.body.error.message).toMatch(/is a thermometer, not a recorder/);
    const foreign = await post("other", "/api/instruments", { kind: "recorder", name: "Fernhollow recorder", validityMonths: 12 });
    const res = await upload(units[4].id, 440, { recorderId: foreign.body.id }, 37);
    expect(res.status).toBe(404);
    expect(res.body.error.fields).toHaveProperty("recorderId");
  });

  it("a new calibration never rewrites an evaluation; re-evaluation appends and uses the calibrations as they stand", async () => {
    const before = t.runtime.db.select().from(evaluation).where(eq(evaluation.unitId, units[1].id)).all();
    // The uncalibrated recorder gets a calibration dated before its strike (a certificate entered late).
    expect((await calibrate(uncalibrated, [{ wav: synthReferenceToneWav({ frequencyHz: 1000, offsetPpm: 73, seed: 23, durationS: 4 }), referenceHz: 1000 }], { calibratedOn: daysAgo(3) })).status).toBe(201);
    const still = t.runtime.db.select().from(evaluation).where(eq(evaluation.unitId, units[1].id)).all();
    expect(still).toEqual(before);
    expect((await post("maker", `/api/units/${units[1].id}/evaluations`)).status).toBe(403);
    expect((await post("other", `/api/units/${units[1].id}/evaluations`)).status).toBe(404);
    const res = await post("qa", `/api/units/${units[1].id}/evaluations`);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const after = t.runtime.db.select().from(evaluation).where(eq(evaluation.unitId, units[1].id)).all();
    expect(after).toHaveLength(before.length + 1);
    expect(after.slice(0, before.length)).toEqual(before);
    expect(res.body.evaluation.requirements[0].measuredHz).toBeCloseTo(440, 3);
    expect(res.body.evaluation.traceability.traceable).toBe(true);
  });

  it("lists instruments due within 30 days (and overdue) on the dashboard", async () => {
    const soon = await newInstrument("recorder", "Corr recorder due soon");
    expect((await calibrate(soon, [{ wav: synthReferenceToneWav({ frequencyHz: 1000, offsetPpm: 5, seed: 24, durationS: 3 }), referenceHz: 1000 }], { calibratedOn: daysAgo(350) })).status).toBe(201);
    const due = (await (await as("maker")).get("/api/dashboard")).body.instrumentsDue;
    expect(due.find((d: { id: string }) => d.id === soon)).toMatchObject({ status: "due_soon" });
    expect(due.find((d: { id: string }) => d.id === expired)).toMatchObject({ status: "expired" });
    expect(due.some((d: { id: string }) => d.id === calibrated)).toBe(false);
  });

  it("the certificate shows the chain and the budget, and refuses to state traceability for an expired instrument", async () => {
    const qa = await as("qa");
    await post("maker", `/api/batches/${batchId}/review`);
    for (const u of units) {
      const v = await unitView(u.id);
      if (v.evaluation && v.evaluation.verdict !== "within_tolerance") await post("qa", `/api/units/${u.id}/dispositions`, { decision: "use_as_is", reason: "Instrument test." });
    }
    // Unit 5 has no strike; release needs every unit measured.
    expect((await upload(units[4].id, 440, { recorderId: calibrated }, 38)).status).toBe(202);
    await t.runtime.queue.drained();
    const rel = await qa.post(`/api/batches/${batchId}/release`).set("Origin", ORIGIN);
    expect(rel.status, JSON.stringify(rel.body)).toBe(200);
    const pdfOf = async (unitId: string) => {
      const c = await qa.post(`/api/units/${unitId}/certificates`).set("Origin", ORIGIN).send({ recipientEmail: "customer@example.com" });
      expect(c.status, JSON.stringify(c.body)).toBe(201);
      const dl = await qa.get(`/api/certificates/${c.body.number}/pdf`).buffer(true).parse((r, cb) => { const chunks: Buffer[] = []; r.on("data", (d: Buffer) => chunks.push(d)); r.on("end", () => cb(null, Buffer.concat(chunks))); });
      return (await parsePdf(dl.body as Buffer)).text;
    };
    const good = await pdfOf(units[3].id);
    expect(good).toContain("Measurement traceability");
    expect(good).toContain("Each instrument below was within a valid calibration");
    expect(good).toMatch(/Recorder: Corr recorder calibrated/);
    expect(good).toMatch(/CAL-\d{4}-\d{4}/);
    expect(good).toContain("GEN-7 (test)");
    expect(good).toContain("TC-9 (test)");
    expect(good).toMatch(/Uncertainty budget of the fundamental/);
    for (const row of ["Frequency fit", "Scatter of strikes", "Recording clock", "Thermometer reading", "Temperature coefficient", "Combined", "Expanded, k = 2"]) expect(good).toContain(row);
    const bad = await pdfOf(units[2].id);
    expect(bad).toContain("Traceability is not stated for these results.");
    expect(bad).toMatch(/Recorder “Corr recorder expired” was past its calibration due date \(\d{4}-\d{2}-\d{2}\)/);
    expect(bad).toContain("rectangular");
  });
});
