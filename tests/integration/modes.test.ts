/**
 * Modes of a design through the API, with the real analysis pool: importing predicted mode lists
 * (files in other programs' shapes, our JSON, bad files refused whole), and the mode map over
 * synthetic strikes of the same units held and suspended (fixtures/synth.ts). Expected values follow
 * from the synthesis by construction: the strikes ring at k × the model's frequencies with the τ
 * given, so k, the residuals and τ_held/τ_free are known; the analysis itself is checked against
 * outside references in tests/reference.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mulberry32, synthWav, type SynthMode } from "../../fixtures/synth.ts";
import { modeList, spec, specVersion } from "../../server/db/schema.ts";
import type { ModeMap } from "../../shared/schemas/modes.ts";
import { specTemplate } from "../../shared/spec-templates.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0" });
});
afterAll(async () => t.close());

const agent = (who: "maker" | "qa" | "owner" | "other") => t.as(who);
const listCount = () => t.runtime.db.select().from(modeList).all().length;

let specId = "";
let versionId = "";
let batchId = "";
let units: { id: string; serial: string }[] = [];
const modesUrl = () => `/api/specs/${specId}/versions/${versionId}/predicted-modes`;

// The invented part: its model and how it really rings (k = 440/452.9, every mode on the model's scale).
const K = 440 / 452.9;
const MODEL = [0.0004, 0.0007, 0.001, 0.0012, 0.0016, 0.002, 452.9, 706.2, 2762.7];
const SUPPORT_HZ = 131;

beforeAll(async () => {
  const tpl = specTemplate("tuning_fork");
  const qa = await agent("qa");
  const created = await qa.post("/api/specs").set("Origin", ORIGIN).send({ ...tpl, name: "Modes test fork", strikesRequired: 1, partials: [{ ...tpl.partials[0], toleranceCents: 5 }, tpl.partials[1]] });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  specId = created.body.id;
  versionId = created.body.currentVersionId;
  const b = await (await agent("maker")).post("/api/batches").set("Origin", ORIGIN).send({ code: "M-1", specId, quantity: 3, range: { from: "M-0001", to: "M-0003" } });
  expect(b.status, JSON.stringify(b.body)).toBe(201);
  batchId = b.body.id;
  units = b.body.rows;
});

describe("importing predicted modes", () => {
  it("takes another program's CSV (title lines, semicolons, decimal commas, a BOM) with the mapping from the preview", async () => {
    const csv = "\uFEFFModal analysis — fork, free\r\n\r\nMode No.;Freq [Hz];Shape\r\n" + MODEL.map((f, i) => `${i + 1};${String(f).replace(".", ",")};${i === 6 ? "first balanced" : ""}`).join("\r\n") + "\r\n";
    const res = await (await agent("qa"))
      .post(modesUrl())
      .set("Origin", ORIGIN)
      .field("condition", "free")
      .field("youngsModulusGPa", "210")
      .field("densityKgM3", "7850")
      .field("mapping", JSON.stringify({ mode: "Mode No.", frequencyHz: "Freq [Hz]", label: "Shape", kind: null, condition: null }))
      .attach("modes", Buffer.from(csv), "fork-free.csv");
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ condition: "free", youngsModulusGPa: 210, densityKgM3: 7850, sourceName: "fork-free.csv", version: 1 });
    expect(res.body.modes).toHaveLength(9);
    expect(res.body.modes.slice(0, 6).every((m: { kind: string }) => m.kind === "rigid_body")).toBe(true);
    expect(res.body.modes[6]).toEqual({ mode: 7, frequencyHz: 452.9, label: "first balanced", kind: null });
    const read = await (await agent("maker")).get(modesUrl());
    expect(read.status).toBe(200);
    expect(read.body.lists.map((l: { id: string }) => l.id)).toEqual([res.body.id]);
  });

  it("refuses a file with bad lines whole, naming every line", async () => {
    const before = listCount();
    const res = await (await agent("qa")).post(modesUrl()).set("Origin", ORIGIN).attach("modes", Buffer.from("mode,frequencyHz\n7,452.9\n8,fast\n9,-12\n7,700\n"), "bad.csv");
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/3 problems; nothing was imported\. Line 3: .*Line 4: .*Line 5: mode 7 is listed twice/);
    expect(Object.keys(res.body.error.fields)).toEqual(["line 3", "line 4", "line 5"]);
    expect(listCount()).toBe(before);
  });

  it("refuses garbage, a missing file and a file over the limit with a sentence each", async () => {
    const qa = await agent("qa");
    const binary = await qa.post(modesUrl()).set("Origin", ORIGIN).attach("modes", Buffer.from([0x52, 0x49, 0x46, 0x46, 0, 0, 0, 0, 0x57, 0x41, 0x56, 0x45]), "strike.wav");
    expect(binary.status).toBe(400);
    expect(binary.body.error.message).toMatch(/binary, not a table/);
    const none = await qa.post(modesUrl()).set("Origin", ORIGIN).field("condition", "free");
    expect(none.status).toBe(400);
    expect(none.body.error.fields).toHaveProperty("modes");
    const big = await qa.post(modesUrl()).set("Origin", ORIGIN).attach("modes", Buffer.alloc(1024 * 1024 + 10, "7,452.9\n"), "huge.csv");
    expect(big.status).toBe(413);
    const badField = await qa.post(modesUrl()).set("Origin", ORIGIN).field("youngsModulusGPa", "stiff").attach("modes", Buffer.from("mode,frequencyHz\n7,452.9\n"), "ok.csv");
    expect(badField.status).toBe(400);
    expect(badField.body.error.fields).toHaveProperty("youngsModulusGPa");
  });

  it("takes our JSON body, and a file whose rows name their condition makes a list each", async () => {
    const qa = await agent("qa");
    const res = await qa
      .post(modesUrl())
      .set("Origin", ORIGIN)
      .send({ name: "Design review", condition: "held", modes: [{ mode: 1, frequencyHz: SUPPORT_HZ / K, kind: "support" }, { mode: 2, frequencyHz: 452.9, kind: "balanced", label: "first balanced" }] });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ condition: "held", name: "Design review", youngsModulusGPa: null });
    expect(res.body.lists).toHaveLength(1);
    // Rows that name their condition split the file into a list each.
    const split = await qa.post(modesUrl()).set("Origin", ORIGIN).attach("modes", Buffer.from("mode,frequencyHz,condition\n7,452.9,free\n1,131,held\n"), "both.csv");
    expect(split.status, JSON.stringify(split.body)).toBe(201);
    expect(split.body.lists.map((l: { condition: string; modes: unknown[] }) => [l.condition, l.modes.length])).toEqual([
      ["free", 1],
      ["held", 1],
    ]);
    // Back to the lists the mode map below is checked against (the newest list of a condition is in force).
    for (const l of split.body.lists) t.runtime.db.delete(modeList).where(eq(modeList.id, l.id)).run();
    const dup = await qa.post(modesUrl()).set("Origin", ORIGIN).send({ modes: [{ mode: 7, frequencyHz: 452.9 }, { mode: 7, frequencyHz: 460 }] });
    expect(dup.status).toBe(400);
    expect(dup.body.error.fields).toEqual({ "modes.1": "mode 7 is listed twice (also as item 1)." });
    const typed = await qa.post(modesUrl()).set("Origin", ORIGIN).send({ modes: [{ mode: 7.5, frequencyHz: "fast" }] });
    expect(typed.status).toBe(400);
    expect(Object.keys(typed.body.error.fields)).toEqual(["modes.0.mode", "modes.0.frequencyHz"]);
  });

  it("lets no maker import, and gives another workshop's ids 404", async () => {
    const maker = await agent("maker");
    expect((await maker.post(modesUrl()).set("Origin", ORIGIN).send({ modes: [{ mode: 1, frequencyHz: 400 }] })).status).toBe(403);
    const other = await agent("other");
    expect((await other.post(modesUrl()).set("Origin", ORIGIN).send({ modes: [{ mode: 1, frequencyHz: 400 }] })).status).toBe(404);
    expect((await other.get(modesUrl())).status).toBe(404);
    expect((await other.get(`/api/specs/${specId}/mode-map`)).status).toBe(404);
    // A version of another specification under this one's id is not found either.
    const demoSpec = t.runtime.db.select().from(spec).all().find((s) => s.id !== specId)!;
    const demoVersion = t.runtime.db.select().from(specVersion).where(eq(specVersion.specId, demoSpec.id)).get()!;
    expect((await (await agent("qa")).get(`/api/specs/${specId}/versions/${demoVersion.id}/predicted-modes`)).status).toBe(404);
  });
});

describe("the mode map over the same units held and suspended", () => {
  // Per unit: a suspended strike and one in the hand. In the hand the overtones' τ is shortened
  // (the unbalanced mode to a fifth, the second balanced mode to 0.85), the fundamental's a little,
  // and a mode of the hand appears that a suspended strike never has.
  const TAU_FREE = { f1: 6, unbalanced: 1.2, f2: 0.5 };
  const HOLD = { f1: 0.9, unbalanced: 0.2, f2: 0.85 };
  const wav = (unitIndex: number, held: boolean) => {
    const dev = [0.8, -1.1, 2.0][unitIndex]; // cents: units of a batch differ a little
    const s = 2 ** (dev / 1200);
    const rand = mulberry32(100 + unitIndex * 2 + (held ? 1 : 0));
    const modes: SynthMode[] = [
      { frequencyHz: 452.9 * K * s, amplitude: 0.3, tauS: TAU_FREE.f1 * (held ? HOLD.f1 : 1), phaseRad: rand() * 6 },
      { frequencyHz: 706.2 * K * s, amplitude: 0.06, tauS: TAU_FREE.unbalanced * (held ? HOLD.unbalanced : 1), phaseRad: rand() * 6 },
      { frequencyHz: 2762.7 * K * s, amplitude: 0.08, tauS: TAU_FREE.f2 * (held ? HOLD.f2 : 1), phaseRad: rand() * 6 },
    ];
    if (held) modes.push({ frequencyHz: SUPPORT_HZ * s, amplitude: 0.04, tauS: 0.15, phaseRad: rand() * 6 });
    return synthWav({ sampleRate: 48000, durationS: 4, strikes: [{ onsetS: 0.1, modes }], noiseRms: 2e-4, seed: 200 + unitIndex * 2 + (held ? 1 : 0) }, { bits: 16 }).bytes;
  };
  let map: ModeMap;

  beforeAll(async () => {
    const maker = await agent("maker");
    for (const [i, u] of units.entries()) {
      for (const held of [false, true]) {
        const res = await maker
          .post(`/api/units/${u.id}/strikes`)
          .set("Origin", ORIGIN)
          .field("support", held ? "hand" : "suspended")
          .field("temperatureC", "20")
          .attach("audio", Buffer.from(wav(i, held)), `${u.serial}-${held ? "hand" : "suspended"}.wav`);
        expect(res.status, JSON.stringify(res.body)).toBe(202);
      }
    }
    await t.runtime.queue.drained();
    const res = await (await agent("maker")).get(`/api/specs/${specId}/mode-map?batch=${batchId}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    map = res.body;
  });

  it("has exactly the fields of the contract", () => {
    expect(map).toEqual(expect.objectContaining({ stiffnessFactor: expect.any(Number), stiffnessFactorUncertainty: expect.any(Number), youngsModulusGPa: expect.any(Number), modes: expect.any(Array), unmatchedPartials: expect.any(Array) }));
    for (const row of map.modes) {
      expect(Object.keys(row)).toEqual(expect.arrayContaining(["mode", "kind", "condition", "predictedHz", "measuredHz", "residualCents", "units", "tauBySupport", "holdEffect"]));
      expect(Object.keys(row.tauBySupport).sort()).toEqual(["hand", "stand", "suspended"]);
    }
  });

  it("recovers k and E_eff = k²·E_model from the free model; the rigid-body modes stay unmatched", () => {
    // The units sit 0.8, −1.1 and 2.0 cents off the model's scale; each mode's median over units is the 0.8-cent unit.
    expect(map.stiffnessFactor!).toBeCloseTo(K * 2 ** (0.8 / 1200), 3);
    expect(map.youngsModulusGPa!).toBeCloseTo(map.stiffnessFactor! ** 2 * 210, 9);
    expect(map.youngsModulusSource).toBe("model");
    const free = map.modes.filter((r) => r.condition === "free");
    expect(free.filter((r) => r.kind === "rigid_body").every((r) => r.measuredHz === null)).toBe(true);
    const matched = free.filter((r) => r.measuredHz !== null);
    expect(matched.map((r) => r.mode)).toEqual([7, 8, 9]);
    for (const r of matched) expect(Math.abs(r.residualCents!)).toBeLessThan(1);
  });

  it("gives τ_held/τ_free per mode over the units measured both ways", () => {
    const row = (mode: number) => map.modes.find((r) => r.condition === "free" && r.mode === mode)!;
    const f1 = row(7).holdEffect!;
    expect(f1).toMatchObject({ support: "hand", units: 3, goneWhenHeld: 0, verdict: "rings" });
    expect(f1.ratio!).toBeCloseTo(HOLD.f1, 1);
    expect(Math.abs(f1.ratio! - HOLD.f1)).toBeLessThan(0.03);
    const unbalanced = row(8).holdEffect!;
    expect(unbalanced.verdict).toBe("damped");
    expect(Math.abs(unbalanced.ratio! - HOLD.unbalanced)).toBeLessThan(0.01);
    const f2 = row(9).holdEffect!;
    expect(f2.verdict).toBe("rings");
    expect(Math.abs(f2.ratio! - HOLD.f2)).toBeLessThan(0.03);
    expect(f2.ratioUncertainty!).toBeGreaterThan(0);
    expect(row(7).tauBySupport.suspended!).toBeCloseTo(TAU_FREE.f1, 1);
  });

  it("finds the partial present only in the hand, and matches the held model's support mode to it", () => {
    const support = map.modes.find((r) => r.condition === "held" && r.kind === "support")!;
    expect(support.measuredHz!).toBeCloseTo(SUPPORT_HZ * 2 ** (0.8 / 1200), 0);
    expect(support.holdEffect).toMatchObject({ verdict: "support_mode", modelKind: "support", agreement: "agrees" });
    expect(map.measuredModes.filter((m) => m.supportMode).map((m) => Math.round(m.measuredHz))).toEqual([SUPPORT_HZ]);
    expect(map.scope).toMatchObject({ unitsMeasured: 3, unitsBothWays: 3, strikes: { hand: 3, suspended: 3 } });
  });

  it("restricts to a chosen set of units, and refuses ids outside the batch with 404", async () => {
    const maker = await agent("maker");
    const two = await maker.get(`/api/specs/${specId}/mode-map?batch=${batchId}&units=${units[0].id},${units[1].id}`);
    expect(two.status).toBe(200);
    expect(two.body.scope.units.map((u: { serial: string }) => u.serial)).toEqual(["M-0001", "M-0002"]);
    expect(two.body.modes.find((r: { mode: number; condition: string }) => r.condition === "free" && r.mode === 7).units).toBe(2);
    expect((await maker.get(`/api/specs/${specId}/mode-map?batch=${batchId}&units=nope`)).status).toBe(404);
    const demoBatch = (await maker.get("/api/batches")).body.batches.find((b: { code: string }) => b.code === "BTW-2611").id;
    const wrong = await maker.get(`/api/specs/${specId}/mode-map?batch=${demoBatch}`);
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.message).toMatch(/another specification/);
    expect((await (await agent("other")).get(`/api/specs/${specId}/mode-map?batch=${batchId}`)).status).toBe(404);
  });

  it("works out E from geometry when asked, and refuses a negative length", async () => {
    const maker = await agent("maker");
    const res = await maker.get(`/api/specs/${specId}/mode-map?batch=${batchId}&lengthMm=94&thicknessMm=6&densityKgM3=7850`);
    expect(res.status).toBe(200);
    const g = res.body.geometry;
    expect(g.template).toBe("cantilever");
    // Hand calculation (shared/beam.test.ts): 94 × 6 mm steel rings at 553.67 Hz with E = 200 GPa, and E ∝ f².
    expect(g.youngsModulusGPa).toBeCloseTo(200 * (g.fundamentalHz / 553.67) ** 2, 0);
    expect(g.fundamentalHz).toBeCloseTo(440, 0);
    // The model gives E here, so geometry stays beside it.
    expect(res.body.youngsModulusSource).toBe("model");
    const bad = await maker.get(`/api/specs/${specId}/mode-map?lengthMm=-1`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty("lengthMm");
  });

  it("without a model lists the measured modes and their hold effect, with E from geometry", async () => {
    const demoSpec = t.runtime.db.select().from(spec).all().find((s) => s.id !== specId)!;
    // The demo specification has models but no strikes here (DEMO_STRIKES=0): a model only.
    const modelOnly = (await (await agent("maker")).get(`/api/specs/${demoSpec.id}/mode-map`)).body as ModeMap;
    expect(modelOnly.stiffnessFactor).toBeNull();
    expect(modelOnly.modes.length).toBeGreaterThan(0);
    expect(modelOnly.modes.every((r) => r.measuredHz === null)).toBe(true);
    // A spec with strikes and no model: a new version of the test spec has its own batch.
    const qa = await agent("qa");
    const tpl = specTemplate("tuning_fork");
    const bare = await qa.post("/api/specs").set("Origin", ORIGIN).send({ ...tpl, name: "No model yet", strikesRequired: 1 });
    expect(bare.status, JSON.stringify(bare.body)).toBe(201);
    const b = await (await agent("maker")).post("/api/batches").set("Origin", ORIGIN).send({ code: "M-2", specId: bare.body.id, quantity: 1, range: { from: "N-0001", to: "N-0001" } });
    expect(b.status, JSON.stringify(b.body)).toBe(201);
    const up = await (await agent("maker")).post(`/api/units/${b.body.rows[0].id}/strikes`).set("Origin", ORIGIN).field("support", "hand").attach("audio", Buffer.from(wav(0, true)), "N-0001.wav");
    expect(up.status).toBe(202);
    await t.runtime.queue.drained();
    const measuredOnly = (await (await agent("maker")).get(`/api/specs/${bare.body.id}/mode-map?lengthMm=94&thicknessMm=6&densityKgM3=7850`)).body as ModeMap;
    expect(measuredOnly.modes).toEqual([]);
    expect(measuredOnly.unmatchedPartials.map((m) => Math.round(m.measuredHz))).toEqual([SUPPORT_HZ, 440, 686, 2684].map((f) => Math.round(f * 2 ** (0.8 / 1200))));
    expect(measuredOnly.youngsModulusSource).toBe("geometry");
    expect(measuredOnly.youngsModulusGPa).toBeCloseTo(measuredOnly.geometry!.youngsModulusGPa, 9);
  });
});
