/**
 * The invented demo workshop: seeded on an empty database unless SEED_DEMO=0.
 * Everything here is made up: the workshops, the people and their addresses.
 */
import { createHash, randomUUID } from "node:crypto";
import { writeFileSync } from "node:fs";
import path from "node:path";
import { count, eq } from "drizzle-orm";
import type { AppDeps } from "../server/app.ts";
import { member, organization, unit, user, workshopProfile } from "../server/db/schema.ts";
import { createBatch } from "../server/services/batches.ts";
import { createSpec } from "../server/services/specs.ts";
import { createInstrument, findInstrument, measuredTone, recordRecorderCalibration, recordThermometerCalibration } from "../server/services/instruments.ts";
import { insertStrike } from "../server/services/strikes.ts";
import { measureReferenceTone } from "../server/analysis/reference-tone.ts";
import type { RoleName } from "../shared/permissions.ts";
import { specInputSchema } from "../shared/schemas/spec.ts";
import { specTemplate } from "../shared/spec-templates.ts";
import { seedDemoBothWaysStrikes, seedDemoModeLists } from "./demo-modes.ts";
import { bellStrikeWav, prng, synthReferenceToneWav, synthStrikeWav, tubeStrikeWav } from "./synth.ts";

export const DEMO_PASSWORD = "tinelog-demo";

export const DEMO_WORKSHOP = { name: "Brightwater Tuning Works", slug: "brightwater" };
export const OTHER_WORKSHOP = { name: "Fernhollow Chime Co.", slug: "fernhollow" };

export const DEMO_USERS = [
  { email: "owner@example.com", name: "Mara Ellison", role: "owner", workshop: "demo", label: "owner of Brightwater Tuning Works" },
  { email: "qa@example.com", name: "Tobias Renn", role: "qa", workshop: "demo", label: "quality (qa), Brightwater" },
  { email: "maker@example.com", name: "Ilse Varga", role: "maker", workshop: "demo", label: "maker, Brightwater" },
  { email: "other@example.com", name: "Owen Pike", role: "owner", workshop: "other", label: "owner of Fernhollow Chime Co. (another workshop)" },
] as const satisfies readonly { email: string; name: string; role: RoleName; workshop: "demo" | "other"; label: string }[];

export type DemoIds = { workshopId: string; otherWorkshopId: string; users: Record<string, string> };

/** Seeds the demo on an empty database; returns null when there were users already. */
export async function seedDemo(deps: AppDeps): Promise<DemoIds | null> {
  const { db, auth } = deps;
  const [{ n }] = db.select({ n: count() }).from(user).all();
  if (n > 0) return null;

  // The demo accounts are created as confirmed (their example.com addresses receive no mail), through
  // the library's own adapter so the password hash and account row are exactly what a sign-up makes.
  const users: Record<string, string> = {};
  const authContext = await auth.$context;
  const hash = await authContext.password.hash(DEMO_PASSWORD);
  for (const u of DEMO_USERS) {
    const created = await authContext.internalAdapter.createUser({ email: u.email, name: u.name, emailVerified: true }, { method: "email-password" });
    await authContext.internalAdapter.linkAccount({ userId: created.id, providerId: "credential", accountId: created.id, password: hash });
    users[u.email] = created.id;
  }
  const workshopId = randomUUID();
  const otherWorkshopId = randomUUID();
  db.transaction((tx) => {
    const created = new Date();
    tx.insert(organization).values([
      { id: workshopId, name: DEMO_WORKSHOP.name, slug: DEMO_WORKSHOP.slug, createdAt: created },
      { id: otherWorkshopId, name: OTHER_WORKSHOP.name, slug: OTHER_WORKSHOP.slug, createdAt: created },
    ]).run();
    tx.insert(member)
      .values(
        DEMO_USERS.map((u) => ({
          id: randomUUID(),
          organizationId: u.workshop === "demo" ? workshopId : otherWorkshopId,
          userId: users[u.email],
          role: u.role,
          createdAt: created,
        })),
      )
      .run();
  });
  db.insert(workshopProfile)
    .values([
      { workshopId, address: "Unit 4, Millrace Yard, Brightwater BW3 7QT (invented address)", sendingEmail: "certificates@brightwater.example", qualityEmail: "quality@brightwater.example", certificatePrefix: "BTW" },
      { workshopId: otherWorkshopId, address: "2 Fernhollow Lane (invented address)", sendingEmail: "office@fernhollow.example", qualityEmail: "office@fernhollow.example", certificatePrefix: "FHC" },
    ])
    .run();
  const ids = { workshopId, otherWorkshopId, users };
  const instruments = seedDemoInstruments(deps, ids);
  seedDemoLedger(deps, ids, { strikes: deps.env.DEMO_STRIKES, instruments });
  seedChimeLedger(deps, ids, { strikes: deps.env.DEMO_STRIKES });
  return ids;
}

/**
 * A living ledger for a first look: a fork specification, one batch fully struck (two units out of
 * tolerance, waiting for QA's disposition), and one batch still to be measured.
 */
function seedDemoLedger(deps: AppDeps, ids: DemoIds, opts: { strikes: boolean; instruments: DemoInstruments }) {
  const { db } = deps;
  const qa = { workshopId: ids.workshopId, userId: ids.users["qa@example.com"] };
  const maker = { workshopId: ids.workshopId, userId: ids.users["maker@example.com"] };
  const template = specTemplate("tuning_fork");
  const spec = createSpec(
    db,
    qa,
    specInputSchema.parse({
      ...template,
      name: "BTW-440 concert fork, steel",
      description: "Brightwater's A4 concert fork (invented demo product).\n" + (template.description ?? ""),
      lengthMm: 80,
      strikesRequired: 1,
      partials: [
        { ...template.partials[0], targetHz: 440, toleranceCents: 5, minT60S: 20 },
        { ...template.partials[1], required: false },
      ],
    }),
  );
  const measured = createBatch(db, maker, { code: "BTW-2611", specId: spec.id, quantity: 10, range: { from: "F-0001", to: "F-0010" }, notes: "November run, steel bar stock lot 7 (demo)." });
  createBatch(db, maker, { code: "BTW-2612", specId: spec.id, quantity: 6, range: { from: "F-0011", to: "F-0016" }, notes: "December run (demo): strike each fork and upload." });
  seedDemoModeLists(deps, qa, { id: spec.id, versionId: spec.currentVersionId });
  if (!opts.strikes) return;

  // Deviations in cents of the demo forks (invented): two out of ±5 cents, the rest within.
  const deviations = [1.2, -0.8, 2.5, -9.4, 0.3, 3.1, -1.9, 12.6, -2.7, 0.9];
  const rand = prng(2611);
  const units = db.select().from(unit).where(eq(unit.batchId, measured.id)).all().sort((a, b) => a.position - b.position);
  units.forEach((u, i) => {
    // Most forks on the calibrated bench recorder; two on the tablet (due soon), one on the spare (never calibrated).
    const recorder = i === 4 || i === 8 ? opts.instruments.tablet : i === 6 ? opts.instruments.spare : opts.instruments.bench;
    // The recorder reads every frequency (1 + offset·10⁻⁶) times too high; its calibration corrects that.
    const f0 = 440 * 2 ** (deviations[i] / 1200) * (1 + recorder.offsetPpm * 1e-6);
    const wav = synthStrikeWav({
      durationS: 4,
      seed: 1000 + i,
      humHz: i % 3 === 0 ? 50 : undefined,
      partials: [
        { frequencyHz: f0, amplitude: 0.3, tauS: 4.5 + rand() * 1.5 },
        { frequencyHz: f0 * (6.08 + rand() * 0.1), amplitude: 0.08, tauS: 0.35 + rand() * 0.1 },
      ],
      noise: 2e-4,
    });
    storeDemoStrike(deps, maker, u, wav, { durationS: 4, temperatureC: 21 + Math.round(rand() * 20) / 10, support: "hand", recorderId: recorder.id, thermometerId: opts.instruments.thermometerId });
  });
  seedDemoBothWaysStrikes(deps, maker, measured.id);
  deps.queue.notify();
}

/** Keeps a synthesised WAV as a stored recording of `u` and queues it for analysis, as an upload would. */
function storeDemoStrike(deps: AppDeps, actor: { workshopId: string; userId: string }, u: { id: string; serial: string }, wav: Uint8Array, conditions: { durationS: number; temperatureC: number; support: "hand" | "suspended" | "stand"; recorderId?: string; thermometerId?: string }) {
  const { db, storage } = deps;
  const temp = path.join(storage.incoming, `${randomUUID()}.part`);
  writeFileSync(temp, wav);
  const fileKey = storage.keep(temp, actor.workshopId);
  insertStrike(db, actor, {
    unitId: u.id,
    originalName: `${u.serial}-strike-1.wav`,
    sha256: createHash("sha256").update(wav).digest("hex"),
    fileKey,
    sizeBytes: wav.length,
    format: { sampleRate: 48000, channels: 1, bitsPerSample: 16, encoding: "pcm", durationS: conditions.durationS },
    temperatureC: conditions.temperatureC,
    support: conditions.support,
    recorderId: conditions.recorderId ?? null,
    thermometerId: conditions.thermometerId ?? null,
  });
}

/**
 * The second invented workshop makes chimes and handbells: a chime tube specified by its strike
 * note and a handbell by its named partials, each with a small measured batch (one unit out).
 */
function seedChimeLedger(deps: AppDeps, ids: DemoIds, opts: { strikes: boolean }) {
  const { db } = deps;
  const owner = { workshopId: ids.otherWorkshopId, userId: ids.users["other@example.com"] };
  const tubeTemplate = specTemplate("tube");
  const tubeSpec = createSpec(db, owner, specInputSchema.parse({ ...tubeTemplate, name: "FHC chime tube C5, aluminium", description: "Fernhollow's C5 garden chime tube (invented demo product).\n" + (tubeTemplate.description ?? ""), strikesRequired: 1 }));
  const bellTemplate = specTemplate("handbell");
  const bellSpec = createSpec(db, owner, specInputSchema.parse({ ...bellTemplate, name: "FHC handbell A4, bronze", description: "Fernhollow's A4 handbell (invented demo product).\n" + (bellTemplate.description ?? ""), strikesRequired: 1 }));
  const tubes = createBatch(db, owner, { code: "FHC-T-07", specId: tubeSpec.id, quantity: 3, range: { from: "CT-0701", to: "CT-0703" }, notes: "Garden chimes, tube stock lot 3 (demo)." });
  const bells = createBatch(db, owner, { code: "FHC-B-02", specId: bellSpec.id, quantity: 3, range: { from: "HB-0201", to: "HB-0203" }, notes: "Handbells for a school set (demo)." });
  if (!opts.strikes) return;
  const c5 = 440 * 2 ** (3 / 12);
  // Invented voicings: the second tube cut 14 cents short (sharp), the third bell's tierce 30 cents sharp.
  const tubeOffsets = [1, 14, -2];
  db.select().from(unit).where(eq(unit.batchId, tubes.id)).all().sort((a, b) => a.position - b.position).forEach((u, i) => {
    storeDemoStrike(deps, owner, u, tubeStrikeWav({ strikeNoteHz: c5, seed: 700 + i, offsetCents: tubeOffsets[i], durationS: 4 }), { durationS: 4, temperatureC: 19.5, support: "suspended" });
  });
  const bellOffsets = [{}, { prime: -2, nominal: 3 }, { tierce: 30 }];
  db.select().from(unit).where(eq(unit.batchId, bells.id)).all().sort((a, b) => a.position - b.position).forEach((u, i) => {
    storeDemoStrike(deps, owner, u, bellStrikeWav({ primeHz: 440, seed: 200 + i, offsets: bellOffsets[i], durationS: 4 }), { durationS: 4, temperatureC: 19.5, support: "hand" });
  });
  deps.queue.notify();
}

type DemoRecorder = { id: string; offsetPpm: number };
type DemoInstruments = { bench: DemoRecorder; tablet: DemoRecorder; spare: DemoRecorder; thermometerId: string };

const daysAgo = (days: number) => new Date(Date.now() - days * 86_400_000).toISOString().slice(0, 10);

/**
 * The demo's instruments (invented): a bench recorder calibrated three times a year apart against a
 * generator (the offset drifts a little), a tablet whose calibration falls due in about two weeks, a
 * spare microphone never calibrated, and a bench thermometer with a laboratory certificate. The
 * reference tones are synthesised at each recorder's offset and measured by the analysis engine.
 */
function seedDemoInstruments(deps: AppDeps, ids: DemoIds): DemoInstruments {
  const { db, sqlite, storage } = deps;
  const qa = { workshopId: ids.workshopId, userId: ids.users["qa@example.com"] };
  const reference = { referenceDescription: "signal generator SG-2 of the workshop (invented), its timebase calibrated by a laboratory", note: "", referenceCoverageFactor: 2 };
  const calibrate = (instrumentId: string, offsetPpm: number, days: number, tonesHz: number[], seed: number) => {
    const tones = tonesHz.map((hz, k) => {
      const wav = synthReferenceToneWav({ frequencyHz: hz, offsetPpm, seed: seed + k });
      const m = measureReferenceTone(wav, { expectedHz: hz });
      const storedPath = path.join(storage.incoming, `${randomUUID()}.part`);
      writeFileSync(storedPath, wav);
      // The generator's certificate: ±0.5 ppm (k = 2) of the set frequency (invented).
      return measuredTone(m, { referenceHz: hz, expandedUncertaintyHz: hz * 0.5e-6, coverageFactor: 2, certificate: "GEN-2291 (invented)" }, { originalName: `reference-${hz}Hz-${daysAgo(days)}.wav`, sha256: createHash("sha256").update(wav).digest("hex"), storedPath });
    });
    recordRecorderCalibration({ db, sqlite, dataDir: deps.env.DATA_DIR }, qa, findInstrument(db, ids.workshopId, instrumentId), tones, { ...reference, calibratedOn: days === 0 ? null : daysAgo(days) });
  };
  const bench = createInstrument(db, qa, { kind: "recorder", name: "Bench recorder A", model: "USB audio interface, 48 kHz (demo)", serial: "BR-A-0193", validityMonths: 12 }).id;
  calibrate(bench, 15.2, 750, [1000], 71);
  calibrate(bench, 16.9, 385, [1000], 72);
  calibrate(bench, 18.4, 20, [440, 1000], 73);
  const tablet = createInstrument(db, qa, { kind: "recorder", name: "Packing bench tablet", model: "Tablet with clip-on microphone (demo)", serial: "TB-7720", validityMonths: 12 }).id;
  calibrate(tablet, -42.7, 350, [1000], 74);
  const spare = createInstrument(db, qa, { kind: "recorder", name: "Spare USB microphone", model: "USB microphone (demo)", serial: "", validityMonths: 12 }).id;
  const thermometerId = createInstrument(db, qa, { kind: "thermometer", name: "Bench thermometer T1", model: "Digital probe thermometer (demo)", serial: "T1-55012", validityMonths: 12 }).id;
  recordThermometerCalibration({ db, sqlite }, qa, findInstrument(db, ids.workshopId, thermometerId), {
    points: [
      { referenceC: 15, offsetC: 0.1 },
      { referenceC: 20, offsetC: 0.2 },
      { referenceC: 25, offsetC: 0.3 },
    ],
    uncertaintyC: 0.1,
    coverageFactor: 2,
    certificateNumber: "TC-4471 (invented)",
    calibratedBy: "Millrace Calibration Services (invented laboratory)",
    calibratedOn: daysAgo(60),
  });
  return { bench: { id: bench, offsetPpm: 18.4 }, tablet: { id: tablet, offsetPpm: -42.7 }, spare: { id: spare, offsetPpm: 27 }, thermometerId };
}
