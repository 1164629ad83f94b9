/** Strike onsets from the short-time level. */

export interface Onsets {
  /** Onset sample indices, ascending. */
  onsets: number[];
  /** Frame hop, samples, and the per-frame level, dB re full scale (mean square). */
  hop: number;
  levelDb: Float64Array;
  /** Level of the quietest 25 ms, dB: a rough broadband floor for segmentation. */
  quietDb: number;
}

/** Frame hop for the level curve, s. */
const HOP_S = 0.005;
/** A strike must rise this much within two frames (10 ms), dB: struck metal starts abruptly. */
const RISE_DB = 9;
/** …and exceed everything in the preceding 200 ms by this much, dB, so beats in a ringing partial
 *  (whose envelope never exceeds its earlier peaks) are not taken for a new strike. */
const ABOVE_RECENT_DB = 6;
/** …and stand this far above the quietest 25 ms, dB. The level of 5 ms frames of steady noise
 *  wanders by well under 1 dB, so 12 dB keeps noise out while a strike at 20 dB SNR is found. */
const ABOVE_QUIET_DB = 12;
/** Minimum spacing of strikes, s. */
const REFRACTORY_S = 0.25;
export const MAX_STRIKES = 16;

/** Finds strike onsets in a mono signal (DC removed). */
export function findOnsets(x: Float64Array, sampleRate: number): Onsets {
  const hop = Math.max(16, Math.round(sampleRate * HOP_S));
  const nf = Math.floor(x.length / hop);
  const levelDb = new Float64Array(nf);
  // Second curve: the level of the first difference x[n] − x[n−1], which lifts broadband energy
  // (the hammer's contact) over the ringing partials (gain 2·sin(πf/fs): −25 dB at 440 Hz, 48 kHz).
  // A re-strike of a unit that is still ringing barely raises the plain level but shows here —
  // the idea of high-frequency-content onset detection (Bello et al., "A tutorial on onset
  // detection in music signals", IEEE Trans. Speech Audio Process. 13(5), 2005).
  const hfDb = new Float64Array(nf);
  let prev = 0;
  for (let f = 0; f < nf; f++) {
    let e = 0;
    let h = 0;
    const base = f * hop;
    for (let i = 0; i < hop; i++) {
      const v = x[base + i];
      e += v * v;
      const d = v - prev;
      h += d * d;
      prev = v;
    }
    levelDb[f] = 10 * Math.log10(e / hop + 1e-20);
    hfDb[f] = 10 * Math.log10(h / hop + 1e-20);
  }
  const quietDb = quietest(levelDb);
  const onsets: number[] = [];
  if (nf < 3) return { onsets, hop, levelDb, quietDb };
  const recent = Math.round(0.2 / HOP_S);
  const refractory = Math.round(REFRACTORY_S / HOP_S);
  // A file that starts in the middle of (or right at) a strike: the first frames are already loud.
  // Compared as mean powers over 25 ms: the 5 ms frames of a steady low tone (mains hum) swing
  // by many dB with its phase, so the loudest early frame of a file holding only hum would pass
  // for a strike against the mean of frame levels in dB.
  let startLoud = false;
  {
    const w = Math.min(nf, 5);
    let first = 0;
    for (let f = 0; f < w; f++) first += 10 ** (levelDb[f] / 10);
    startLoud = 10 * Math.log10(first / w) >= quietestPowerDb(levelDb) + ABOVE_QUIET_DB;
  }
  let last = -Infinity;
  if (startLoud) {
    onsets.push(0);
    last = 0;
  }
  const hfQuiet = quietest(hfDb);
  const rises = (c: Float64Array, q: number, f: number) => {
    const l = c[f];
    if (l < q + ABOVE_QUIET_DB || l - c[f - 2] < RISE_DB) return false;
    let recentMax = -Infinity;
    for (let g = Math.max(0, f - recent); g <= f - 3; g++) recentMax = Math.max(recentMax, c[g]);
    return f < 3 || l >= recentMax + ABOVE_RECENT_DB;
  };
  for (let f = 2; f < nf; f++) {
    if (f - last < refractory) continue;
    if (levelDb[f] < quietDb + ABOVE_QUIET_DB) continue;
    if (!rises(levelDb, quietDb, f) && !rises(hfDb, hfQuiet, f)) continue;
    // Refine to the sample on the first difference (it jumps at the strike even while the unit
    // still rings): the first sample in the rising frames above a tenth of their peak and above
    // 5× the RMS before the rise.
    const lo = Math.max(1, (f - 2) * hop);
    const hi = Math.min(x.length, (f + 1) * hop);
    let peak = 0;
    for (let i = lo; i < hi; i++) peak = Math.max(peak, Math.abs(x[i] - x[i - 1]));
    const before = Math.sqrt(10 ** (hfDb[Math.max(0, f - 3)] / 10));
    const threshold = Math.max(0.1 * peak, 5 * before);
    let onset = lo;
    for (let i = lo; i < hi; i++) {
      if (Math.abs(x[i] - x[i - 1]) >= threshold) {
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

/** Lowest 5-frame (25 ms) mean level, dB: the background, even when only a short pre-roll holds it. */
function quietest(db: Float64Array): number {
  const n = db.length;
  if (n === 0) return -200;
  const w = Math.min(5, n);
  let best = Infinity;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    sum += db[i];
    if (i >= w) sum -= db[i - w];
    if (i >= w - 1) best = Math.min(best, sum / w);
  }
  return best;
}

/** Lowest mean power over 5 frames (25 ms), dB. */
function quietestPowerDb(db: Float64Array): number {
  const n = db.length;
  const w = Math.min(5, n);
  let best = Infinity;
  let sum = 0;
  const p = (i: number) => 10 ** (db[i] / 10);
  for (let i = 0; i < n; i++) {
    sum += p(i);
    if (i >= w) sum -= p(i - w);
    if (i >= w - 1) best = Math.min(best, sum / w);
  }
  return 10 * Math.log10(Math.max(best, 1e-30));
}
