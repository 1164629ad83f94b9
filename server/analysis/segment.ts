/** Strike onsets from the short-time level. */

export interface Onsets {
  /** Onset sample indices, ascending. */
  onsets: number[];
  /** Frame hop, samples, and the per-frame level, dB re full scale (mean square). */
  hop: number;
  levelDb: Float64Array;
  /** Level of the quietest frames (2nd percentile), dB: a rough broadband floor for segmentation. */
  quietDb: number;
}

/** Frame hop for the level curve, s. */
const HOP_S = 0.005;
/** A strike must rise this much within two frames (10 ms), dB: struck metal starts abruptly. */
const RISE_DB = 9;
/** …and exceed everything in the preceding 200 ms by this much, dB, so beats in a ringing partial
 *  (whose envelope never exceeds its earlier peaks) are not taken for a new strike. */
const ABOVE_RECENT_DB = 6;
/** …and stand this far above the quiet level, dB. */
const ABOVE_QUIET_DB = 20;
/** Minimum spacing of strikes, s. */
const REFRACTORY_S = 0.25;
export const MAX_STRIKES = 16;

/** Finds strike onsets in a mono signal (DC removed). */
export function findOnsets(x: Float64Array, sampleRate: number): Onsets {
  const hop = Math.max(16, Math.round(sampleRate * HOP_S));
  const nf = Math.floor(x.length / hop);
  const levelDb = new Float64Array(nf);
  for (let f = 0; f < nf; f++) {
    let e = 0;
    const base = f * hop;
    for (let i = 0; i < hop; i++) {
      const v = x[base + i];
      e += v * v;
    }
    levelDb[f] = 10 * Math.log10(e / hop + 1e-20);
  }
  const sorted = Float64Array.from(levelDb).sort();
  const quietDb = nf > 0 ? sorted[Math.floor(nf * 0.02)] : -200;
  const onsets: number[] = [];
  if (nf < 3) return { onsets, hop, levelDb, quietDb };
  const recent = Math.round(0.2 / HOP_S);
  const refractory = Math.round(REFRACTORY_S / HOP_S);
  // A file that starts in the middle of (or right at) a strike: the first frames are already loud.
  let startLoud = false;
  {
    let m = -Infinity;
    for (let f = 0; f < Math.min(nf, 3); f++) m = Math.max(m, levelDb[f]);
    startLoud = m >= quietDb + ABOVE_QUIET_DB;
  }
  let last = -Infinity;
  if (startLoud) {
    onsets.push(0);
    last = 0;
  }
  for (let f = 2; f < nf; f++) {
    if (f - last < refractory) continue;
    const l = levelDb[f];
    if (l < quietDb + ABOVE_QUIET_DB) continue;
    if (l - levelDb[f - 2] < RISE_DB) continue;
    let recentMax = -Infinity;
    for (let g = Math.max(0, f - recent); g <= f - 3; g++) recentMax = Math.max(recentMax, levelDb[g]);
    if (f >= 3 && l < recentMax + ABOVE_RECENT_DB) continue;
    // Refine to the sample: the first sample in the rising frames above a tenth of their peak.
    const lo = (f - 2) * hop;
    const hi = Math.min(x.length, (f + 1) * hop);
    let peak = 0;
    for (let i = lo; i < hi; i++) peak = Math.max(peak, Math.abs(x[i]));
    // …and above 5× the RMS before the rise, so background noise does not trigger it early.
    const before = Math.sqrt(10 ** (levelDb[Math.max(0, f - 3)] / 10));
    const threshold = Math.max(0.1 * peak, 5 * before);
    let onset = lo;
    for (let i = lo; i < hi; i++) {
      if (Math.abs(x[i]) >= threshold) {
        onset = i;
        break;
      }
    }
    // Step back a little so the onset is not after the first wavefront.
    onset = Math.max(0, onset - Math.round(sampleRate * 0.0005));
    if (onsets.length > 0 && onset - onsets[onsets.length - 1] < REFRACTORY_S * sampleRate) continue;
    onsets.push(onset);
    last = f;
    if (onsets.length >= MAX_STRIKES) break;
  }
  return { onsets, hop, levelDb, quietDb };
}
