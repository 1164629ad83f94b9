/** Thin, cached wrapper over fft.js (radix-4, power-of-two sizes). */
import FFT from "fft.js";

const cache = new Map<number, FFT>();

function plan(size: number): FFT {
  let f = cache.get(size);
  if (!f) {
    if (size < 2 || (size & (size - 1)) !== 0) throw new RangeError(`FFT size must be a power of two ≥ 2, got ${size}`);
    f = new FFT(size);
    cache.set(size, f);
  }
  return f;
}

/** Smallest power of two ≥ n. */
export function nextPow2(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/**
 * Forward DFT of a real sequence (zero-padded to `size`), X[k] = Σ x[n]·e^(−j2πkn/size).
 * Returns interleaved complex bins 0…size/2 (re, im), length size + 2.
 */
export function realDft(input: Float64Array, size: number): Float64Array {
  const f = plan(size);
  let data = input;
  if (input.length !== size) {
    data = new Float64Array(size);
    data.set(input.length > size ? input.subarray(0, size) : input);
  }
  const out = new Float64Array(2 * size);
  f.realTransform(out, data);
  return out.subarray(0, size + 2);
}

/** Inverse DFT of interleaved complex data, x[n] = (1/N)·Σ X[k]·e^(+j2πkn/N). */
export function complexIdft(input: Float64Array): Float64Array {
  const n = input.length / 2;
  const out = new Float64Array(input.length);
  plan(n).inverseTransform(out, input);
  return out;
}

/** Forward DFT of interleaved complex data. */
export function complexDft(input: Float64Array): Float64Array {
  const n = input.length / 2;
  const out = new Float64Array(input.length);
  plan(n).transform(out, input);
  return out;
}
