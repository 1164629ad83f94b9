/**
 * The demo fork's modes (invented data, for a first look at the Modes page): a free model and a
 * held model of the BTW-440 fork as its designer might have imported them, and five forks of
 * BTW-2611 struck again both suspended and in the hand, so the page has k, E and the hold effect
 * to show. Nothing here is a reference: the numbers are made up to look like a steel fork.
 */
import { createHash, randomUUID } from "node:crypto";
import { writeFileSync } from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import type { AppDeps } from "../server/app.ts";
import { unit } from "../server/db/schema.ts";
import { importModeLists } from "../server/services/modes.ts";
import { insertStrike } from "../server/services/strikes.ts";
import type { Actor } from "../server/services/audit.ts";
import type { ModeKind } from "../shared/schemas/modes.ts";
import { prng, synthStrikeWav } from "./synth.ts";

type DemoMode = { mode: number; frequencyHz: number; kind: ModeKind; label: string };
const m = (mode: number, frequencyHz: number, kind: ModeKind, label = ""): DemoMode => ({ mode, frequencyHz, kind, label });

/**
 * The free model, as a modal analysis of the unconstrained fork lists it: six rigid-body modes near
 * 0 Hz, then the first balanced mode 2.9 % above the demo forks' 440 Hz (the model assumed a
 * modulus of 210 GPa), unbalanced in-plane and out-of-plane modes, and the second balanced mode
 * about 6.1× the first.
 */
export const DEMO_FREE_MODEL: DemoMode[] = [
  m(1, 0.00031, "rigid_body"),
  m(2, 0.00046, "rigid_body"),
  m(3, 0.00072, "rigid_body"),
  m(4, 0.0011, "rigid_body"),
  m(5, 0.0015, "rigid_body"),
  m(6, 0.0019, "rigid_body"),
  m(7, 287.4, "unbalanced", "Tines together, out of plane"),
  m(8, 452.9, "balanced", "Tines in opposition, in plane (first balanced)"),
  m(9, 706.2, "unbalanced", "Tines together, in plane; the stem rocks"),
  m(10, 1163.0, "unbalanced", "Twist about the stem"),
  m(11, 1874.2, "unbalanced", "Tines in opposition, out of plane"),
  m(12, 2762.7, "balanced", "Second balanced, in plane"),
  m(13, 3620.0, "unbalanced", "Second family, tines together"),
  m(14, 4410.0, "unbalanced", "Second family, out of plane"),
];

/** The held model: the stem gripped in a hand, which adds two modes of the hand and fork together. */
export const DEMO_HELD_MODEL: DemoMode[] = [
  m(1, 86.0, "support", "Hand and fork rocking together"),
  m(2, 205.0, "support", "Palm against the stem"),
  m(3, 289.0, "unbalanced", "Tines together, out of plane"),
  m(4, 453.0, "balanced", "Tines in opposition, in plane (first balanced)"),
  m(5, 709.5, "unbalanced", "Tines together, in plane"),
  m(6, 1166.0, "unbalanced", "Twist about the stem"),
  m(7, 1876.0, "unbalanced", "Tines in opposition, out of plane"),
  m(8, 2763.0, "balanced", "Second balanced, in plane"),
];

export const DEMO_MODEL_MATERIAL = { youngsModulusGPa: 210, densityKgM3: 7850 };

/** Imports the two demo model lists on the demo fork's spec version. */
export function seedDemoModeLists(deps: AppDeps, qa: Actor, spec: { id: string; versionId: string }): void {
  const modes = (list: DemoMode[]) => list.map((x, i) => ({ line: i + 2, condition: null, ...x }));
  importModeLists(deps.db, qa, spec.id, spec.versionId, { name: "Free model (design review 3)", condition: "free", sourceName: "btw440-free-modes.csv", ...DEMO_MODEL_MATERIAL, modes: modes(DEMO_FREE_MODEL) });
  importModeLists(deps.db, qa, spec.id, spec.versionId, { name: "Held in the hand (design review 3)", condition: "held", sourceName: "btw440-held-modes.csv", ...DEMO_MODEL_MATERIAL, modes: modes(DEMO_HELD_MODEL) });
}

/** Serials of the demo forks struck both ways, and their fundamental's deviation in cents (as in seeds/demo.ts). */
const BOTH_WAYS: Record<string, number> = { "F-0002": -0.8, "F-0003": 2.5, "F-0005": 0.3, "F-0006": 3.1, "F-0010": 0.9 };

/**
 * What the demo forks really do, per mode: frequency as a ratio to the fundamental, amplitude, and
 * τ suspended and in the hand, s. The twist mode rings 45 cents above where the model puts it after
 * calibration (as if the tine width were off), and the out-of-plane opposition mode keeps ringing in
 * the hand although the model calls it unbalanced: two things for the page to point out.
 */
const K_TRUE = 440 / 452.9;
const cents = (c: number) => 2 ** (c / 1200);
const PARTS: { ratio: number; amplitude: number; tauFree: number; tauHand: number; heldOnly?: boolean }[] = [
  { ratio: (287.4 * K_TRUE * cents(4)) / 440, amplitude: 0.05, tauFree: 1.6, tauHand: 0.3 },
  { ratio: 1, amplitude: 0.3, tauFree: 6.0, tauHand: 5.3 },
  { ratio: (706.2 * K_TRUE * cents(-6)) / 440, amplitude: 0.06, tauFree: 1.2, tauHand: 0.22 },
  { ratio: (1163.0 * K_TRUE * cents(45)) / 440, amplitude: 0.04, tauFree: 0.9, tauHand: 0.15 },
  { ratio: (1874.2 * K_TRUE * cents(3)) / 440, amplitude: 0.04, tauFree: 0.7, tauHand: 0.63 },
  { ratio: 6.12, amplitude: 0.08, tauFree: 0.47, tauHand: 0.42 },
  { ratio: (3620.0 * K_TRUE * cents(-5)) / 440, amplitude: 0.03, tauFree: 0.35, tauHand: 0.06 },
  { ratio: (4410.0 * K_TRUE * cents(7)) / 440, amplitude: 0.025, tauFree: 0.3, tauHand: 0.05 },
];
const HAND_ONLY = [
  { frequencyHz: 83.4, amplitude: 0.04, tauS: 0.18 },
  { frequencyHz: 212.6, amplitude: 0.04, tauS: 0.12 },
];

/** Strikes five demo forks of the measured batch again, suspended and in the hand. */
export function seedDemoBothWaysStrikes(deps: AppDeps, maker: Actor, batchId: string): void {
  const { db, storage } = deps;
  const rand = prng(1404);
  const units = db.select().from(unit).where(eq(unit.batchId, batchId)).all().filter((u) => u.serial in BOTH_WAYS);
  units.forEach((u, i) => {
    const f0 = 440 * cents(BOTH_WAYS[u.serial]);
    for (const support of ["suspended", "hand"] as const) {
      const held = support === "hand";
      const partials = [
        ...PARTS.map((p) => ({ frequencyHz: f0 * p.ratio, amplitude: p.amplitude, tauS: (held ? p.tauHand : p.tauFree) * (0.95 + rand() * 0.1) })),
        ...(held ? HAND_ONLY.map((p) => ({ ...p, frequencyHz: p.frequencyHz * (0.99 + rand() * 0.02) })) : []),
      ];
      const wav = synthStrikeWav({ durationS: 4, seed: 1400 + 2 * i + (held ? 1 : 0), partials, noise: 2e-4 });
      const temp = path.join(storage.incoming, `${randomUUID()}.part`);
      writeFileSync(temp, wav);
      insertStrike(db, maker, {
        unitId: u.id,
        originalName: `${u.serial}-${support}.wav`,
        sha256: createHash("sha256").update(wav).digest("hex"),
        fileKey: storage.keep(temp, maker.workshopId),
        sizeBytes: wav.length,
        format: { sampleRate: 48000, channels: 1, bitsPerSample: 16, encoding: "pcm", durationS: 4 },
        temperatureC: 21 + Math.round(rand() * 20) / 10,
        support,
      });
    }
  });
  deps.queue.notify();
}
