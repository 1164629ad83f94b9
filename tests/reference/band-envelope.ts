/**
 * An independent measure of one partial's decay, written for the reference tests and sharing no
 * code with the engine: the partial's band is cut out of the whole recording's spectrum (fft.js,
 * positive frequencies only, raised-cosine edges), transformed back to the analytic signal of the
 * band, and its magnitude — the Hilbert envelope (Gabor, "Theory of communication", J. IEE 93(26),
 * 1946; any signal-processing text) — is averaged in short blocks and taken in dB. A straight
 * line fitted to that log envelope over a time range gives the decay rate, hence τ, and its R²
 * says whether the decay is a straight line in dB (an exponential) at all.
 */
import FFT from "fft.js";

export interface BandEnvelope {
  /** Block centres, s from the start of the signal, and the envelope level there, dB. */
  timeS: number[];
  levelDb: number[];
}

/**
 * The analytic signal of x's band fHz ± halfWidthHz (interleaved complex, same length as x): the
 * whole recording's spectrum, positive frequencies only and doubled, weighted by `weight(|f − fHz|)`.
 */
function analyticBand(x: Float64Array, sampleRate: number, fHz: number, halfWidthHz: number, weight: (d: number) => number): number[] {
  let size = 1;
  while (size < 2 * x.length) size *= 2;
  const f = new FFT(size);
  const input = new Float64Array(size);
  input.set(x);
  const X = f.createComplexArray() as number[];
  f.realTransform(X, input);
  f.completeSpectrum(X);
  const binHz = sampleRate / size;
  const Y = f.createComplexArray() as number[];
  const k0 = Math.max(1, Math.floor((fHz - halfWidthHz) / binHz));
  const k1 = Math.min(size / 2 - 1, Math.ceil((fHz + halfWidthHz) / binHz));
  for (let k = k0; k <= k1; k++) {
    const d = Math.abs(k * binHz - fHz);
    if (d > halfWidthHz) continue;
    // Doubling the positive frequencies (and dropping the negative ones) gives the analytic signal.
    Y[2 * k] = 2 * weight(d) * X[2 * k];
    Y[2 * k + 1] = 2 * weight(d) * X[2 * k + 1];
  }
  const z = f.createComplexArray() as number[];
  f.inverseTransform(z, Y);
  return z;
}

/** The log Hilbert envelope of `x` in the band fHz ± halfWidthHz, in blocks of `blockS` seconds. */
export function bandEnvelope(x: Float64Array, sampleRate: number, fHz: number, halfWidthHz: number, blockS = 0.005): BandEnvelope {
  const edge = 0.25 * halfWidthHz; // raised-cosine edges over the outer quarter
  const z = analyticBand(x, sampleRate, fHz, halfWidthHz, (d) => (d < halfWidthHz - edge ? 1 : 0.5 * (1 + Math.cos((Math.PI * (d - (halfWidthHz - edge))) / edge))));
  const per = Math.max(1, Math.round(blockS * sampleRate));
  const timeS: number[] = [];
  const levelDb: number[] = [];
  for (let b = 0; (b + 1) * per <= x.length; b++) {
    let e = 0;
    for (let i = b * per; i < (b + 1) * per; i++) e += z[2 * i] ** 2 + z[2 * i + 1] ** 2;
    timeS.push(((b + 0.5) * per) / sampleRate);
    levelDb.push(10 * Math.log10(e / per + 1e-30));
  }
  return { timeS, levelDb };
}

/** Least-squares line through the envelope between fromS and toS: τ = −20·log10(e)/slope, and R². */
export function envelopeLine(env: BandEnvelope, fromS: number, toS: number): { tauS: number; r2: number; points: number } {
  const t: number[] = [];
  const y: number[] = [];
  env.timeS.forEach((s, i) => {
    if (s >= fromS && s <= toS) {
      t.push(s);
      y.push(env.levelDb[i]);
    }
  });
  const n = t.length;
  const mt = t.reduce((a, b) => a + b, 0) / n;
  const my = y.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    sxy += (t[i] - mt) * (y[i] - my);
    sxx += (t[i] - mt) ** 2;
    syy += (y[i] - my) ** 2;
  }
  const slope = sxy / sxx;
  return { tauS: (-20 * Math.LOG10E) / slope, r2: syy > 0 ? (sxy * sxy) / (sxx * syy) : 0, points: n };
}

/**
 * Frequency of the band's analytic signal between fromS and toS: the slope of its unwrapped phase,
 * fitted by least squares with the squared magnitude as weight, Hz.
 */
export function bandFrequency(x: Float64Array, sampleRate: number, fHz: number, halfWidthHz: number, fromS: number, toS: number): number {
  const z = analyticBand(x, sampleRate, fHz, halfWidthHz, (d) => 0.5 * (1 + Math.cos((Math.PI * d) / halfWidthHz)));
  const i0 = Math.ceil(fromS * sampleRate);
  const i1 = Math.min(x.length - 1, Math.floor(toS * sampleRate));
  let unwrapped = 0;
  let prev = Math.atan2(z[2 * i0 + 1], z[2 * i0]);
  let sw = 0, st = 0, sp = 0, stt = 0, stp = 0;
  for (let i = i0; i <= i1; i++) {
    const ph = Math.atan2(z[2 * i + 1], z[2 * i]);
    let d = ph - prev;
    d -= 2 * Math.PI * Math.round(d / (2 * Math.PI));
    unwrapped += d;
    prev = ph;
    const w = z[2 * i] ** 2 + z[2 * i + 1] ** 2;
    const t = (i - i0) / sampleRate;
    sw += w;
    st += w * t;
    sp += w * unwrapped;
    stt += w * t * t;
    stp += w * t * unwrapped;
  }
  const slope = (sw * stp - st * sp) / (sw * stt - st * st);
  return slope / (2 * Math.PI);
}
