/**
 * The FFT wrapper (fft.js) against a naive DFT, X[k] = Σ x[n]·e^(−j2πkn/N) (the definition), and
 * against an independent FFT package from npm (fft-js, Cooley–Tukey by Vail Systems).
 */
import { createRequire } from "node:module";
import { describe, expect, it } from "vitest";
import { complexDft, complexIdft, realDft } from "../../server/analysis/fft";
import { mulberry32 } from "./helpers";

const require = createRequire(import.meta.url);
const fftJs = require("fft-js") as { fft: (x: number[]) => Array<[number, number]> };

function naiveDft(x: Float64Array, size: number): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let k = 0; k < size; k++) {
    let re = 0;
    let im = 0;
    for (let n = 0; n < x.length; n++) {
      const a = (-2 * Math.PI * k * n) / size;
      re += x[n] * Math.cos(a);
      im += x[n] * Math.sin(a);
    }
    out.push([re, im]);
  }
  return out;
}

describe("realDft", () => {
  const rand = mulberry32(2024);
  for (const [len, size] of [[64, 64], [200, 256], [1000, 4096]] as const) {
    it(`matches the naive DFT (${len} samples zero-padded to ${size}) to 1e-9 of the signal energy`, () => {
      const x = Float64Array.from({ length: len }, () => 2 * rand() - 1);
      const X = realDft(x, size);
      const ref = naiveDft(x, size);
      const scale = Math.sqrt(len);
      for (let k = 0; k <= size / 2; k++) {
        expect(Math.abs(X[2 * k] - ref[k][0])).toBeLessThan(1e-9 * scale);
        expect(Math.abs(X[2 * k + 1] - ref[k][1])).toBeLessThan(1e-9 * scale);
      }
    });
  }

  it("matches fft-js on 1024 random samples", () => {
    const x = Float64Array.from({ length: 1024 }, (_, i) => Math.sin(0.37 * i) + 0.3 * Math.cos(1.9 * i) + (rand() - 0.5));
    const X = realDft(x, 1024);
    const ref = fftJs.fft(Array.from(x));
    for (let k = 0; k <= 512; k++) {
      expect(Math.abs(X[2 * k] - ref[k][0])).toBeLessThan(1e-8);
      expect(Math.abs(X[2 * k + 1] - ref[k][1])).toBeLessThan(1e-8);
    }
  });

  it("rejects a size that is not a power of two with a precise message", () => {
    expect(() => realDft(new Float64Array(10), 100)).toThrow(/power of two/);
  });
});

describe("complex transforms", () => {
  it("the inverse undoes the forward transform", () => {
    const rand = mulberry32(7);
    const z = Float64Array.from({ length: 512 }, () => rand() - 0.5);
    const back = complexIdft(complexDft(z));
    for (let i = 0; i < z.length; i++) expect(Math.abs(back[i] - z[i])).toBeLessThan(1e-12);
  });

  it("a complex exponential at bin 5 lands in bin 5 only", () => {
    const n = 64;
    const z = new Float64Array(2 * n);
    for (let i = 0; i < n; i++) {
      z[2 * i] = Math.cos((2 * Math.PI * 5 * i) / n);
      z[2 * i + 1] = Math.sin((2 * Math.PI * 5 * i) / n);
    }
    const Z = complexDft(z);
    for (let k = 0; k < n; k++) {
      const mag = Math.hypot(Z[2 * k], Z[2 * k + 1]);
      expect(mag).toBeCloseTo(k === 5 ? n : 0, 9);
    }
  });
});
