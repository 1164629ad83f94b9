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
