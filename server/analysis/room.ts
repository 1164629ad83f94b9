/**
 * The room's own decay, read from the strike. The hammer's contact is broadband; in a
 * hard-walled room its sound dies away with the room's reverberation time, under and between the
 * partials. The median of each short spectrum over frequency, leaving out the bins around the
 * partials, is the level of that broadband sound, so its course over time is the room's decay curve, as in the impulse method of
 * ISO 3382-1:2009 (Acoustics — Measurement of room acoustic parameters, §5): the slope of that
 * curve between 3 dB below its start and 5 dB above the background, extrapolated to 60 dB.
 */
import { nextPow2, realDft } from "./fft";
import { quickSelect } from "./spectrum";

export interface RoomDecay {
  /** Reverberation time, s (60 dB of energy decay). */
  rt60S: number;
  /** The matching amplitude time constant, s: RT60 / ln(1000). */
  tauS: number;
  /** Range of the decay curve used, dB. */
  rangeDb: number;
}

/** A room reading needs at least this much broadband decay above the background, dB (ISO 3382-1
 *  asks 35 dB for T30 and 25 dB for T20; a strike's thud is far weaker than a test signal, so a
 *  shorter range is accepted and the figure is used only to judge which partials the room masks). */
const MIN_RANGE_DB = 12;
const MAX_S = 1.5;

/**
 * The room's decay after `start` (samples), or null when the strike's broadband sound does not
 * stand clear of the background. `partialsHz`: the strike's spectral peaks, whose bins are left out.
 * The frames are windowed with the 4-term Blackman–Harris window (sidelobes −92 dB; Harris, Proc.
 * IEEE 66(1), 1978), so a ringing partial's leakage does not pass for the room's sound.
 */
export function roomDecay(x: Float64Array, start: number, end: number, sampleRate: number, partialsHz: number[]): RoomDecay | null {
  const N = nextPow2(Math.round(0.02 * sampleRate));
  const frames = Math.min(Math.floor((end - start) / N), Math.round((MAX_S * sampleRate) / N));
  if (frames < 12) return null;
  const w = new Float64Array(N);
  for (let i = 0; i < N; i++) {
    const c = (2 * Math.PI * i) / N;
    w[i] = 0.35875 - 0.48829 * Math.cos(c) + 0.14128 * Math.cos(2 * c) - 0.01168 * Math.cos(3 * c);
  }
  const lo = Math.max(1, Math.ceil((200 * N) / sampleRate));
  const hi = Math.floor(0.45 * N);
  // Bins clear of every partial's main lobe (±4 bins for this window, ±6 kept out).
  const keep: number[] = [];
  for (let k = lo; k < hi; k++) if (!partialsHz.some((f) => Math.abs((f * N) / sampleRate - k) <= 6)) keep.push(k);
  if (keep.length < 16) return null;
  const buf = new Float64Array(N);
  const p = new Float64Array(keep.length);
  const level = new Float64Array(frames);
  // A frame's median is readable as the room's sound only well above the window's leakage from the
  // frame's strongest line (sidelobes −92 dB): 80 dB under that line at most.
  const readable = new Uint8Array(frames);
  for (let f = 0; f < frames; f++) {
    const at = start + f * N;
    for (let i = 0; i < N; i++) buf[i] = x[at + i] * w[i];
    const X = realDft(buf, N);
    for (let j = 0; j < keep.length; j++) {
      const k = keep[j];
      p[j] = X[2 * k] * X[2 * k] + X[2 * k + 1] * X[2 * k + 1];
    }
    let strongest = 0;
    for (let k = lo; k < hi; k++) strongest = Math.max(strongest, X[2 * k] * X[2 * k] + X[2 * k + 1] * X[2 * k + 1]);
    level[f] = 10 * Math.log10(quickSelect(p, p.length >> 1) + 1e-300);
    readable[f] = level[f] > 10 * Math.log10(strongest + 1e-300) - 80 ? 1 : 0;
  }
  const sorted = Array.from(level.subarray(Math.floor((2 * frames) / 3))).sort((a, b) => a - b);
  const background = sorted[sorted.length >> 1];
  const top = Math.max(level[0], level[1], level[2]);
  if (top - background < MIN_RANGE_DB) return null;
  // Frames from the first one 3 dB below the start until the curve first comes within 5 dB of the background.
  let i0 = 0;
  while (i0 < frames && level[i0] > top - 3) i0++;
  let i1 = i0;
  while (i1 < frames && level[i1] > background + 5) i1++;
  if (i1 - i0 < 4) return null;
  for (let i = i0; i < i1; i++) if (!readable[i]) return null;
  let sx = 0, sy = 0, sxx = 0, sxy = 0;
  const n = i1 - i0;
  for (let i = i0; i < i1; i++) {
    const t = (i * N) / sampleRate;
    sx += t;
    sy += level[i];
    sxx += t * t;
    sxy += t * level[i];
  }
  const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx); // dB/s, negative
  if (!(slope < 0)) return null;
  const rt60S = -60 / slope;
  return { rt60S, tauS: rt60S / Math.log(1000), rangeDb: top - background };
}
