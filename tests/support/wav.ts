/** WAV builders for API and browser tests (the same synthesiser as the demo seed). */
import { synthStrikeWav } from "../../seeds/synth.ts";

/** A single decaying partial: a clean, easy strike. */
export function toneWav(o: { frequencyHz: number; tauS: number; durationS?: number; seed?: number; amplitude?: number }): Uint8Array {
  return synthStrikeWav({ durationS: o.durationS ?? 2, seed: o.seed ?? 1, partials: [{ frequencyHz: o.frequencyHz, amplitude: o.amplitude ?? 0.3, tauS: o.tauS }] });
}

/** A fork-like strike: fundamental plus a faster-dying overtone near 6×. */
export function forkWav(o: { frequencyHz: number; seed?: number; durationS?: number }): Uint8Array {
  return synthStrikeWav({
    durationS: o.durationS ?? 3,
    seed: o.seed ?? 7,
    partials: [
      { frequencyHz: o.frequencyHz, amplitude: 0.3, tauS: 4 },
      { frequencyHz: o.frequencyHz * 6.1, amplitude: 0.08, tauS: 0.4 },
    ],
  });
}

export { bellStrikeWav, bowlStrikeWav, tubeStrikeWav } from "../../seeds/synth.ts";
