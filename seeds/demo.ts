/**
 * The invented demo workshop (DESIGN.md §9): seeded on an empty database unless SEED_DEMO=0.
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
import { insertStrike } from "../server/services/strikes.ts";
import type { RoleName } from "../shared/permissions.ts";
import { specInputSchema } from "../shared/schemas/spec.ts";
import { specTemplate } from "../shared/spec-templates.ts";
import { prng, synthStrikeWav } from "./synth.ts";

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
  seedDemoLedger(deps, ids, { strikes: deps.env.DEMO_STRIKES });
  return ids;
}

/**
 * A living ledger for a first look: a fork specification, one batch fully struck (two units out of
 * tolerance, waiting for QA's disposition), and one batch still to be measured.
 */
function seedDemoLedger(deps: AppDeps, ids: DemoIds, opts: { strikes: boolean }) {
  const { db, storage } = deps;
  const qa = { workshopId: ids.workshopId, userId: ids.users["qa@example.com"] };
  const maker = { workshopId: ids.workshopId, userId: ids.users["maker@example.com"] };
  const template = specTemplate("tuning_fork");
  const spec = createSpec(
    db,
    qa,
    specInputSchema.parse({
      ...template,
      name: "BTW-440 concert fork, steel",
      description: "Brightwater's A4 concert fork (invented demo product). " + (template.description ?? ""),
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
  if (!opts.strikes) return;

  // Deviations in cents of the demo forks (invented): two out of ±5 cents, the rest within.
  const deviations = [1.2, -0.8, 2.5, -9.4, 0.3, 3.1, -1.9, 12.6, -2.7, 0.9];
  const rand = prng(2611);
  const units = db.select().from(unit).where(eq(unit.batchId, measured.id)).all().sort((a, b) => a.position - b.position);
  units.forEach((u, i) => {
    const f0 = 440 * 2 ** (deviations[i] / 1200);
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
    const temp = path.join(storage.incoming, `${randomUUID()}.part`);
    writeFileSync(temp, wav);
    const fileKey = storage.keep(temp, ids.workshopId);
    insertStrike(db, maker, {
      unitId: u.id,
      originalName: `${u.serial}-strike-1.wav`,
      sha256: createHash("sha256").update(wav).digest("hex"),
      fileKey,
      sizeBytes: wav.length,
      format: { sampleRate: 48000, channels: 1, bitsPerSample: 16, encoding: "pcm", durationS: 4 },
      temperatureC: 21 + Math.round(rand() * 20) / 10,
      support: "hand",
    });
  });
  deps.queue.notify();
}
