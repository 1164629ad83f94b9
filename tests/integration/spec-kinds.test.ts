/**
 * Specifications for every family through the API, with the real analysis pool: targets by note
 * name at a chosen reference pitch, tolerances in Hz and ppm, a chime tube judged by its strike
 * note, a bell's per-partial guidance, a specification from a master unit, and a specification as a
 * file (export, import into another workshop, a bad file with field messages).
 *
 * References: equal temperament f = A4·2^(k/12), A4 = 440 Hz (ISO 16:1975); cents = 1200·log2(f/fref);
 * ppm = 10⁶·Δf/f. The master check needs no outside value: a specification made from a master must
 * find the master itself on target (deviation 0 within rounding, here < 0.01 cent).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SPEC_FILE_FORMAT, SPEC_FILE_VERSION } from "../../shared/schemas/spec-file.ts";
import { specTemplate } from "../../shared/spec-templates.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";
import { bellStrikeWav, bowlStrikeWav, toneWav, tubeStrikeWav } from "../support/wav.ts";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0" });
});
afterAll(async () => t.close());

type Who = "maker" | "qa" | "owner" | "other";
const post = async (who: Who, url: string, body?: object) => (await t.as(who)).post(url).set("Origin", ORIGIN).send(body);
const get = async (who: Who, url: string) => (await t.as(who)).get(url);
const C5 = 440 * 2 ** (3 / 12); // 523.2511 Hz

/** Creates a batch of `serials` under a spec and uploads one WAV per unit; returns the units after analysis. */
async function measure(specId: string, code: string, wavs: Uint8Array[], fields: Record<string, string> = {}) {
  const batch = await post("maker", "/api/batches", { code, specId, quantity: wavs.length, range: { from: `${code}-1`, to: `${code}-${wavs.length}` } });
  expect(batch.status, JSON.stringify(batch.body)).toBe(201);
  const units: { id: string; serial: string }[] = batch.body.rows;
  const strikes: string[] = [];
  for (const [i, wav] of wavs.entries()) {
    let req = (await t.as("maker")).post(`/api/units/${units[i].id}/strikes`).set("Origin", ORIGIN);
    for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
    const up = await req.attach("audio", Buffer.from(wav), `${units[i].serial}.wav`);
    expect(up.status, JSON.stringify(up.body)).toBe(202);
    strikes.push(up.body.id);
  }
  await t.runtime.queue.drained();
  return Promise.all(units.map(async (u, i) => ({ unit: (await get("maker", `/api/units/${u.id}`)).body, strike: (await get("maker", `/api/strikes/${strikes[i]}`)).body })));
}

describe("targets by note name and tolerances in Hz or ppm", () => {
  it("stores the note, the reference pitch and the tolerance as given, with the Hz and cents they mean", async () => {
    const tpl = specTemplate("tuning_fork");
    const res = await post("qa", "/api/specs", {
      ...tpl,
      name: "Orchestra fork A4 at 442",
      referencePitchHz: 442,
      partials: [{ ...tpl.partials[0], targetNote: "A4", targetHz: null, toleranceCents: null, toleranceUnit: "ppm", toleranceValue: 500 }, { ...tpl.partials[1], toleranceUnit: "hz", toleranceValue: 20, toleranceCents: null }],
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const v = res.body.versions[0];
    expect(v.referencePitchHz).toBe(442);
    expect(v.partials[0]).toMatchObject({ targetNote: "A4", targetHz: 442, toleranceUnit: "ppm", toleranceValue: 500 });
    expect(v.partials[0].toleranceCents).toBeCloseTo(1200 * Math.log2(1.0005), 9); // 0.8655 cents
    // ±20 Hz on the overtone, taken at its nominal 6.267 × 442 Hz.
    expect(v.partials[1].toleranceCents).toBeCloseTo(1200 * Math.log2(1 + 20 / (tpl.partials[1].ratio! * 442)), 9);
  });

  it("judges units against the note at the customer's pitch: 442.1 Hz passes A4 ±500 ppm at 442, 440 Hz fails", async () => {
    const spec = (await post("qa", "/api/specs", {
      ...specTemplate("tuning_fork"),
      name: "Fork at 442, ppm",
      strikesRequired: 1,
      referencePitchHz: 442,
      partials: [{ label: "Fundamental", isFundamental: true, targetKind: "absolute", targetNote: "A4", toleranceUnit: "ppm", toleranceValue: 500 }],
    })).body;
    const [ok, flat] = await measure(spec.id, "P442", [toneWav({ frequencyHz: 442.1, tauS: 2, durationS: 3 }), toneWav({ frequencyHz: 440, tauS: 2, durationS: 3, seed: 2 })]);
    expect(ok.unit.evaluation.verdict).toBe("within_tolerance");
    expect(flat.unit.evaluation.verdict).toBe("out_of_tolerance");
    // 440 Hz against 442 Hz: 1200·log2(440/442) = −7.85 cents.
    expect(flat.unit.evaluation.requirements[0].deviationCents).toBeCloseTo(1200 * Math.log2(440 / 442), 1);
  });
});

describe("chime tubes by strike note", () => {
  let specId = "";
  it("accepts the tube template (strike note C5 at A4 = 440 Hz) as it is", async () => {
    const res = await post("qa", "/api/specs", { ...specTemplate("tube"), strikesRequired: 1 });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const f = res.body.versions[0].partials[0];
    expect(f).toMatchObject({ targetKind: "strike_note", targetNote: "C5", isFundamental: true });
    expect(f.targetHz).toBeCloseTo(C5, 6);
    specId = res.body.id;
  });

  it("evaluates the heard pitch: a tube on pitch passes, one 20 cents sharp fails, and the strike page names the partials used", async () => {
    const [onPitch, sharp] = await measure(specId, "CT", [tubeStrikeWav({ strikeNoteHz: C5, seed: 11 }), tubeStrikeWav({ strikeNoteHz: C5, seed: 12, offsetCents: 20 })]);
    expect(onPitch.unit.evaluation.verdict, JSON.stringify(onPitch.unit.evaluation.reasons)).toBe("within_tolerance");
    // The synthetic series sits at 2, 3·2^(−6/1200), 4·2^(12/1200) of C5: its geometric-mean
    // fundamental is (0 − 6 + 12)/3 = +2 cents above C5.
    expect(onPitch.unit.evaluation.requirements[0].deviationCents).toBeCloseTo(2, 1);
    expect(sharp.unit.evaluation.verdict).toBe("out_of_tolerance");
    expect(sharp.unit.evaluation.requirements[0].deviationCents).toBeCloseTo(22, 1);
    expect(sharp.unit.evaluation.guidance.direction).toBe("lower");

    const note = onPitch.strike.strikeNote;
    expect(note.label).toBe("Strike note");
    expect(note.members.map((m: { harmonic: number }) => m.harmonic)).toEqual([2, 3, 4]);
    const partials = onPitch.strike.result.strikes[0].partials;
    // The series starts at the 4th partial found (three free–free modes below it), an octave above the note.
    expect(note.members[0].index).toBe(3);
    expect(partials[note.members[0].index].frequencyHz / note.frequencyHz).toBeCloseTo(2 * 2 ** (-2 / 1200), 4);
    expect(onPitch.strike.fundamentalHz).toBeCloseTo(note.frequencyHz, 9);
  });
});

describe("handbells and bells", () => {
  it("names the partials as the trade does and tells where to take metal for each partial out", async () => {
    const spec = (await post("qa", "/api/specs", { ...specTemplate("handbell"), strikesRequired: 1 })).body;
    expect(spec.versions[0].partials.map((p: { label: string }) => p.label)).toEqual(["Hum", "Prime", "Tierce", "Quint", "Nominal"]);
    const [good, sharpTierce] = await measure(spec.id, "HB", [bellStrikeWav({ primeHz: 440, seed: 21 }), bellStrikeWav({ primeHz: 440, seed: 22, offsets: { tierce: 40 } })]);
    expect(good.unit.evaluation.verdict, JSON.stringify(good.unit.evaluation.reasons)).toBe("within_tolerance");
    expect(sharpTierce.unit.evaluation.verdict).toBe("out_of_tolerance");
    const g = sharpTierce.unit.evaluation.guidance;
    expect(g.label).toBe("Tierce");
    expect(g.partials).toEqual([expect.objectContaining({ label: "Tierce", direction: "lower", remedy: expect.stringContaining("just above the sound bow") })]);
    expect(g.estimate).toBeNull();
    expect(g.caution).toContain("tuning lathe");
  });
});

describe("specification from a master unit", () => {
  it("turns the master's measured partials into targets, and the master meets its own spec exactly", async () => {
    const master = bowlStrikeWav({ fundamentalHz: 196, seed: 31 });
    const draftRes = await (await t.as("qa"))
      .post("/api/specs/master-draft")
      .set("Origin", ORIGIN)
      .field("family", "bowl")
      .field("fundamentalToleranceCents", "8")
      .field("partialToleranceCents", "20")
      .attach("audio", Buffer.from(master), "master-bowl.wav");
    expect(draftRes.status, JSON.stringify(draftRes.body)).toBe(200);
    const { draft, master: info } = draftRes.body;
    expect(info.fileName).toBe("master-bowl.wav");
    expect(draft.family).toBe("bowl");
    expect(draft.description).toContain("master-bowl.wav");
    expect(draft.description).toContain("typical starting values — confirm with your own parts");
    expect(draft.partials.length).toBe(4);
    expect(draft.partials[0]).toMatchObject({ isFundamental: true, targetKind: "absolute", toleranceCents: 8 });
    // The draft's targets are the master's own partials (Hz for the fundamental, ratios for the others).
    const f = info.partials.filter((p: { label: string | null }) => p.label).map((p: { frequencyHz: number }) => p.frequencyHz);
    expect(draft.partials[0].targetHz).toBeCloseTo(f[0], 3);
    draft.partials.slice(1).forEach((p: { ratio: number }, i: number) => expect(p.ratio).toBeCloseTo(f[i + 1] / f[0], 5));

    const created = await post("qa", "/api/specs", { ...draft, strikesRequired: 1 });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const [m, off] = await measure(created.body.id, "MB", [master, bowlStrikeWav({ fundamentalHz: 196, seed: 32, offsetCents: 12 })]);
    const ev = m.unit.evaluation;
    expect(ev.verdict).toBe("within_tolerance");
    for (const r of ev.requirements) expect(Math.abs(r.deviationCents), r.label).toBeLessThan(0.01);
    expect(off.unit.evaluation.verdict).toBe("out_of_tolerance");
    expect(off.unit.evaluation.requirements[0].deviationCents).toBeCloseTo(12, 1);
  });

  it("reads a tube master by its strike note and a bell master by the trade's partial names", async () => {
    const tube = await (await t.as("qa")).post("/api/specs/master-draft").set("Origin", ORIGIN).field("family", "tube").attach("audio", Buffer.from(tubeStrikeWav({ strikeNoteHz: C5, seed: 41 })), "tube.wav");
    expect(tube.status, JSON.stringify(tube.body)).toBe(200);
    expect(tube.body.draft.partials[0]).toMatchObject({ label: "Strike note", targetKind: "strike_note" });
    expect(tube.body.strikeNoteHz).toBeCloseTo(C5 * 2 ** (2 / 1200), 2);
    const bell = await (await t.as("qa")).post("/api/specs/master-draft").set("Origin", ORIGIN).field("family", "handbell").attach("audio", Buffer.from(bellStrikeWav({ primeHz: 440, seed: 42 })), "bell.wav");
    expect(bell.status, JSON.stringify(bell.body)).toBe(200);
    const labels = bell.body.draft.partials.map((p: { label: string }) => p.label);
    expect(labels).toEqual(expect.arrayContaining(["Hum", "Prime", "Tierce", "Quint", "Nominal"]));
    expect(bell.body.draft.partials.find((p: { isFundamental: boolean }) => p.isFundamental).label).toBe("Prime");
  });

  it("says what is wrong with the master upload: no file, not a WAV, no family, silence", async () => {
    const qa = await t.as("qa");
    const none = await qa.post("/api/specs/master-draft").set("Origin", ORIGIN).field("family", "bowl");
    expect(none.status).toBe(400);
    expect(none.body.error.fields.audio).toBe("No file received");
    const text = await qa.post("/api/specs/master-draft").set("Origin", ORIGIN).field("family", "bowl").attach("audio", Buffer.from("not a recording at all".repeat(10)), "notes.txt");
    expect(text.status).toBe(415);
    const noFamily = await qa.post("/api/specs/master-draft").set("Origin", ORIGIN).attach("audio", Buffer.from(toneWav({ frequencyHz: 300, tauS: 1 })), "m.wav");
    expect(noFamily.status).toBe(400);
    expect(noFamily.body.error.fields.family).toBe("Choose the product family of the master");
    const silent = await qa.post("/api/specs/master-draft").set("Origin", ORIGIN).field("family", "bowl").attach("audio", Buffer.from(toneWav({ frequencyHz: 300, tauS: 1, amplitude: 0 })), "silent.wav");
    expect(silent.status).toBe(422);
    expect((await (await t.as("maker")).post("/api/specs/master-draft").set("Origin", ORIGIN).field("family", "bowl")).status).toBe(403);
  });
});

describe("a specification as a file", () => {
  it("exports the current version with a format and version field, and imports it into another workshop unchanged", async () => {
    const created = (await post("qa", "/api/specs", { ...specTemplate("handbell"), name: "Bell C6 for export", referencePitchHz: 443, partials: specTemplate("handbell").partials.map((p) => (p.isFundamental ? { ...p, targetNote: "C6" } : p)) })).body;
    const file = await get("qa", `/api/specs/${created.id}/export`);
    expect(file.status).toBe(200);
    expect(file.headers["content-disposition"]).toBe('attachment; filename="Bell-C6-for-export-v1.json"');
    expect(file.body).toMatchObject({ format: SPEC_FILE_FORMAT, version: SPEC_FILE_VERSION, source: { workshop: "Brightwater Tuning Works", version: 1 } });
    expect(file.body.specification.partials[1]).toMatchObject({ label: "Prime", targetNote: "C6" });

    const imported = await post("other", "/api/specs/import", file.body);
    expect(imported.status, JSON.stringify(imported.body)).toBe(201);
    const [a, b] = [created.versions[0], imported.body.versions[0]];
    const strip = (v: { partials: object[] }) => v.partials;
    expect(strip(b)).toEqual(strip(a));
    expect(b.referencePitchHz).toBe(443);
    expect(b.changeNote).toBe("Imported from a specification file from Brightwater Tuning Works, version 1.");
    // C6 at A4 = 443 Hz: 443·2^(15/12) = 1053.80 Hz.
    expect(b.partials[1].targetHz).toBeCloseTo(443 * 2 ** (15 / 12), 6);
    // Another workshop's spec stays its own.
    expect((await get("other", `/api/specs/${created.id}/export`)).status).toBe(404);
  });

  it("answers a bad file with one message per field, and stores nothing", async () => {
    const specs = (await get("qa", "/api/specs")).body.specs;
    const good = (await get("qa", `/api/specs/${specs[0].id}/export`)).body;
    const bad = structuredClone(good);
    bad.version = 2;
    bad.specification.partials[1] = { ...bad.specification.partials[1], targetKind: "ratio", ratio: null };
    bad.specification.referencePitchHz = 1000;
    const res = await post("qa", "/api/specs/import", bad);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toMatchObject({
      version: "This file is of another version; this Tinelog reads version 1",
      "specification.referencePitchHz": "Reference pitch must be at most 480 Hz",
      "specification.partials.1.ratio": "Give the ratio to the fundamental",
    });
    expect(res.body.error.message).toContain("partial 2, ratio");
    const notOurs = await post("qa", "/api/specs/import", { name: "x" });
    expect(notOurs.body.error.fields.format).toMatch(/Not a Tinelog specification file/);
    expect((await get("qa", "/api/specs")).body.specs.length).toBe(specs.length);
    expect((await get("qa", `/api/specs/${specs[0].id}/export?version=9`)).status).toBe(404);
  });
});
