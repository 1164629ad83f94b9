/**
 * Band extraction: one partial's neighbourhood shifted to 0 Hz, low-passed and decimated in one step
 * by taking K bins around it from the DFT of the whole (zero-padded) strike and inverse-transforming
 * them. Any linear time-invariant filter maps a sum of damped exponentials onto the same poles
 * (only amplitudes change, and only near the ends of the data), so frequency and decay are not
 * biased by the filter; a raised-cosine edge keeps its impulse response a few samples long.
 */
import { complexIdft } from "./fft";

export interface Band {
  /** Complex baseband samples, interleaved; sample m is at segment sample m·(M/K). */
  y: Float64Array;
  /** Sample spacing, s. */
  dt: number;
  /** Centre frequency removed by the shift, Hz. */
  centreHz: number;
  /** Amplitude of a real sinusoid = ampScale·|complex amplitude| (full scale = 1). */
  ampScale: number;
  /** Mean of the squared taper: the residual variance under-reads the in-band noise density by it. */
  taperPower: number;
  K: number;
}

/** Samples at each end of the band signal spoiled by the filter's edge response. */
export const BAND_GUARD = 10;

/**
 * X: interleaved bins 0…M/2 of the M-point DFT of the segment; bins k0−K/2 … k0+K/2−1 are used,
 * flat over the middle half and with raised-cosine edges over a quarter of K on each side.
 */
export function extractBand(X: Float64Array, M: number, sampleRate: number, centreHz: number, K: number): Band | null {
  const binHz = sampleRate / M;
  const k0 = Math.round(centreHz / binHz);
  const half = K / 2;
  if (k0 - half < 1 || k0 + half > M / 2) return null;
  const Y = new Float64Array(2 * K);
  const flat = K / 4;
  let tp = 0;
  for (let q = -half; q < half; q++) {
    const aq = Math.abs(q);
    const w = aq <= flat ? 1 : 0.5 * (1 + Math.cos((Math.PI * (aq - flat)) / (half - flat)));
    tp += w * w;
    const idx = q < 0 ? q + K : q;
    const k = k0 + q;
    Y[2 * idx] = X[2 * k] * w;
    Y[2 * idx + 1] = X[2 * k + 1] * w;
  }
  const y = complexIdft(Y);
  return { y, dt: M / K / sampleRate, centreHz: k0 * binHz, ampScale: (2 * K) / M, taperPower: tp / K, K };
}
