/**
 * Synthetic strikes for the demo workshop and for API/browser test builders (invented data, never a
 * reference): a thin front to the fixture synthesiser (fixtures/synth.ts), which also drives the
 * reference tests, so there is one generator of damped partials in the project.
 */
import { mulberry32, synthWav, type SynthMode } from "../fixtures/synth.ts";

export type SynthPartial = { frequencyHz: number; amplitude: number; tauS: number; beatHz?: number };

/** Deterministic PRNG, so the demo is the same on every machine. */
export const prng = mulberry32;

/** A 16-bit PCM WAV of one strike at `onsetS` (default 0.1 s); a partial with `beatHz` is a doublet of two equal modes. */
export function synthStrikeWav(opts: { sampleRate?: number; durationS: number; onsetS?: number; partials: SynthPartial[]; noise?: number; humHz?: number; seed: number }): Uint8Array {
  const rand = mulberry32(opts.seed);
  const modes: SynthMode[] = opts.partials.flatMap((p) => {
    const phaseRad = rand() * 2 * Math.PI;
    return p.beatHz
      ? [
          { frequencyHz: p.frequencyHz, amplitude: p.amplitude / 2, tauS: p.tauS, phaseRad },
          { frequencyHz: p.frequencyHz + p.beatHz, amplitude: p.amplitude / 2, tauS: p.tauS, phaseRad },
        ]
      : [{ frequencyHz: p.frequencyHz, amplitude: p.amplitude, tauS: p.tauS, phaseRad }];
  });
  return synthWav(
    {
      sampleRate: opts.sampleRate ?? 48000,
      durationS: opts.durationS,
      strikes: [{ onsetS: opts.onsetS ?? 0.1, modes }],
      noiseRms: opts.noise ?? 1e-4,
      seed: opts.seed,
      hum: opts.humHz ? { mainsHz: opts.humHz, amplitude: 2e-4, harmonics: 1 } : undefined,
    },
    { bits: 16 },
  ).bytes;
}

/**
 * A steady reference tone as a recorder with clock offset `offsetPpm` would record it: a
 * `frequencyHz` tone written at (1 + offset·10⁻⁶)·f and labelled with the nominal sample rate.
 */
export function synthReferenceToneWav(opts: { frequencyHz: number; offsetPpm: number; durationS?: number; seed: number; sampleRate?: number }): Uint8Array {
  return synthWav(
    {
      sampleRate: opts.sampleRate ?? 48000,
      durationS: opts.durationS ?? 4,
      strikes: [{ onsetS: 0, modes: [{ frequencyHz: opts.frequencyHz * (1 + opts.offsetPpm * 1e-6), amplitude: 0.4, tauS: Infinity }] }],
      noiseRms: 2e-4,
      seed: opts.seed,
    },
    { bits: 24 },
  ).bytes;
}

const at = (hz: number, centsOff = 0) => hz * 2 ** (centsOff / 1200);

/**
 * A chime tube (invented voicing): three free–free modes below the series, then the partials that
 * stand near 2 : 3 : 4 of the strike note — a little flat of 3 and sharp of 4, as tubes are — and
 * one above. `offsetCents` shifts the whole tube (a tube cut long or short).
 */
export function tubeStrikeWav(o: { strikeNoteHz: number; seed: number; offsetCents?: number; durationS?: number }): Uint8Array {
  const f = at(o.strikeNoteHz, o.offsetCents ?? 0);
  return synthStrikeWav({
    durationS: o.durationS ?? 5,
    seed: o.seed,
    noise: 1e-4,
    partials: [
      { frequencyHz: 0.2239 * f, amplitude: 0.02, tauS: 1.2 },
      { frequencyHz: 0.617 * f, amplitude: 0.03, tauS: 1.4 },
      { frequencyHz: 1.2097 * f, amplitude: 0.05, tauS: 1.8 },
      { frequencyHz: 2 * f, amplitude: 0.25, tauS: 3.2 },
      { frequencyHz: at(3 * f, -6), amplitude: 0.16, tauS: 2.4 },
      { frequencyHz: at(4 * f, 12), amplitude: 0.1, tauS: 1.6 },
      { frequencyHz: 5.4 * f, amplitude: 0.03, tauS: 0.7 },
    ],
  });
}

/**
 * A handbell (invented voicing): hum, prime (a slow doublet), tierce, quint, nominal at the usual
 * starting ratios 0.5 : 1 : 1.2 : 1.5 : 2, plus a superquint; `offsets` detunes named partials (cents).
 */
export function bellStrikeWav(o: { primeHz: number; seed: number; offsets?: Partial<Record<"hum" | "prime" | "tierce" | "quint" | "nominal", number>>; durationS?: number }): Uint8Array {
  const off = o.offsets ?? {};
  const p = o.primeHz;
  return synthStrikeWav({
    durationS: o.durationS ?? 5,
    seed: o.seed,
    noise: 1e-4,
    partials: [
      { frequencyHz: at(0.5 * p, off.hum), amplitude: 0.08, tauS: 4 },
      { frequencyHz: at(p, off.prime), amplitude: 0.14, tauS: 2.6, beatHz: 0.7 },
      { frequencyHz: at(1.2 * p, off.tierce), amplitude: 0.12, tauS: 2 },
      { frequencyHz: at(1.5 * p, off.quint), amplitude: 0.05, tauS: 1.2 },
      { frequencyHz: at(2 * p, off.nominal), amplitude: 0.22, tauS: 1.6 },
      { frequencyHz: 3 * p * 1.006, amplitude: 0.06, tauS: 0.8 },
      { frequencyHz: 4.18 * p, amplitude: 0.03, tauS: 0.5 },
    ],
  });
}

/** A singing bowl (invented voicing): a slow-beating low doublet and a few inharmonic partials above. */
export function bowlStrikeWav(o: { fundamentalHz: number; seed: number; offsetCents?: number; durationS?: number }): Uint8Array {
  const f = at(o.fundamentalHz, o.offsetCents ?? 0);
  return synthStrikeWav({
    durationS: o.durationS ?? 6,
    seed: o.seed,
    noise: 1e-4,
    partials: [
      { frequencyHz: f, amplitude: 0.2, tauS: 5, beatHz: 0.9 },
      { frequencyHz: 2.71 * f, amplitude: 0.12, tauS: 3 },
      { frequencyHz: 5.02 * f, amplitude: 0.07, tauS: 1.8 },
      { frequencyHz: 7.84 * f, amplitude: 0.04, tauS: 1.1 },
    ],
  });
}
