/**
 * Windowed, zero-padded magnitude spectrum; local noise floor; peaks clear of that floor with
 * sub-bin interpolation.
 */
import { nextPow2, realDft } from "./fft";

export interface Spectrum {
  /** Power |X[k]|² for k = 0…size/2 of the Hann-windowed, zero-padded segment. */
  power: Float64Array;
  /** Local noise floor of `power`, same length. */
  floor: Float64Array;
  size: number;
  sampleRate: number;
  /** Σ w[n] (coherent gain) and Σ w[n]² (noise gain) of the window. */
  windowSum: number;
  windowSumSq: number;
  /** Window length in samples (before zero-padding). */
  length: number;
}

/** Zero-padding factor: ≥ ×4 keeps the Hann scalloping loss under 0.1 dB before interpolation. */
export const ZERO_PAD = 4;

/** Hann-windowed spectrum of x[start, start+length), zero-padded ×ZERO_PAD (to a power of two). */
export function windowedSpectrum(x: Float64Array, start: number, length: number, sampleRate: number): Spectrum {
  const size = nextPow2(length) * ZERO_PAD;
  const buf = new Float64Array(size);
  let ws = 0;
  let ws2 = 0;
  // Periodic Hann window (Harris, "On the use of windows for harmonic analysis with the DFT",
  // Proc. IEEE 66(1), 1978): sidelobes −31.5 dB, falling 18 dB/octave.
  const c = (2 * Math.PI) / length;
  for (let n = 0; n < length; n++) {
    const w = 0.5 - 0.5 * Math.cos(c * n);
    buf[n] = x[start + n] * w;
    ws += w;
    ws2 += w * w;
  }
  const X = realDft(buf, size);
  const half = size / 2;
  const power = new Float64Array(half + 1);
  for (let k = 0; k <= half; k++) power[k] = X[2 * k] * X[2 * k] + X[2 * k + 1] * X[2 * k + 1];
  const floor = noiseFloor(power, ZERO_PAD);
  return { power, floor, size, sampleRate, windowSum: ws, windowSumSq: ws2, length };
}

/**
 * Local noise floor: the median power in blocks of 64 original bins (256 padded), divided by ln 2
 * (the median of an exponential variable is ln 2 times its mean, as for a periodogram bin of noise),
 * interpolated linearly in dB between block centres. Partials occupy few bins, so the median
 * ignores them.
 */
export function noiseFloor(power: Float64Array, pad: number): Float64Array {
  const n = power.length;
  const block = 64 * pad;
  const nb = Math.max(1, Math.ceil(n / block));
  const centres = new Float64Array(nb);
  const levels = new Float64Array(nb);
  const tmp = new Float64Array(block);
  for (let b = 0; b < nb; b++) {
    const lo = b * block;
    const hi = Math.min(n, lo + block);
    // Take every pad-th bin (the original-resolution bins) to keep the sample independent.
    let m = 0;
    for (let k = lo; k < hi; k += pad) tmp[m++] = power[k];
    const med = quickSelect(tmp.subarray(0, m), m >> 1);
    centres[b] = (lo + hi - 1) / 2;
    levels[b] = Math.log(Math.max(med / Math.LN2, 1e-300));
  }
  const floor = new Float64Array(n);
  let b = 0;
  for (let k = 0; k < n; k++) {
    while (b < nb - 2 && k > centres[b + 1]) b++;
    let v: number;
    if (nb === 1 || k <= centres[0]) v = levels[0];
    else if (k >= centres[nb - 1]) v = levels[nb - 1];
    else {
      const t = (k - centres[b]) / (centres[b + 1] - centres[b]);
      v = levels[b] + t * (levels[b + 1] - levels[b]);
    }
    floor[k] = Math.exp(v);
  }
  return floor;
}

/** k-th smallest value (0-based) of a (scratch, reordered) array. */
export function quickSelect(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  if (hi < 0) return 0;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k];
  }
  return a[k];
}

export interface SpectralPeak {
  /** Interpolated frequency, Hz. */
  frequencyHz: number;
  /** Peak power level, dB re the strongest peak's power scale (10·log10 |X|²). */
  powerDb: number;
  /** Peak power over the local floor, dB. */
  prominenceDb: number;
  bin: number;
}

export interface PeakOptions {
  /** Minimum height above the local noise floor, dB. */
  minProminenceDb: number;
  /** Dynamic range kept below the strongest peak, dB. */
  rangeDb: number;
  minHz: number;
  maxHz: number;
  maxPeaks: number;
}

/**
 * Local maxima that stand clear of the local noise floor, with log-parabolic (Gaussian)
 * interpolation of the peak position (Smith & Serra, "PARSHL", ICMC 1987; exact for a Gaussian
 * window and within a few thousandths of a bin for Hann at ×4 padding — only a starting value here).
 */
export function findPeaks(s: Spectrum, opt: PeakOptions): SpectralPeak[] {
  const { power, floor, size, sampleRate } = s;
  const binHz = sampleRate / size;
  const half = ZERO_PAD * 2; // ±2 original bins: the Hann main-lobe half-width
  const kLo = Math.max(half, Math.ceil(opt.minHz / binHz));
  const kHi = Math.min(power.length - 1 - half, Math.floor(opt.maxHz / binHz));
  const cand: SpectralPeak[] = [];
  const minRatio = Math.pow(10, opt.minProminenceDb / 10);
  for (let k = kLo; k <= kHi; k++) {
    const p = power[k];
    if (p < floor[k] * minRatio) continue;
    let isMax = true;
    for (let d = 1; d <= half; d++) {
      if (power[k - d] > p || power[k + d] >= p) {
        isMax = false;
        break;
      }
    }
    if (!isMax) continue;
    const a = Math.log(power[k - 1] + 1e-300);
    const b = Math.log(p + 1e-300);
    const c = Math.log(power[k + 1] + 1e-300);
    const den = a - 2 * b + c;
    const delta = den < 0 ? (0.5 * (a - c)) / den : 0;
    cand.push({
      frequencyHz: (k + Math.max(-0.5, Math.min(0.5, delta))) * binHz,
      powerDb: 10 * Math.log10(p + 1e-300),
      prominenceDb: 10 * Math.log10((p + 1e-300) / (floor[k] + 1e-300)),
      bin: k,
    });
  }
  if (cand.length === 0) return cand;
  const top = Math.max(...cand.map((c) => c.powerDb));
  // Hann sidelobes sit ≥ 31 dB under their main lobe within a few bins: a weak "peak" that close to
  // a much stronger one is leakage, not a partial.
  const sideBins = 6 * ZERO_PAD;
  const kept = cand.filter((c) => {
    if (c.powerDb < top - opt.rangeDb) return false;
    for (const o of cand) {
      if (o !== c && Math.abs(o.bin - c.bin) <= sideBins && o.powerDb - c.powerDb > 25) return false;
    }
    return true;
  });
  kept.sort((x, y) => y.powerDb - x.powerDb);
  return kept.slice(0, opt.maxPeaks);
}
