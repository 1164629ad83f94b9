/** Small dense real linear algebra (systems up to ~12×12), row-major Float64Array. */

/** Solves A·x = b in place by Gaussian elimination with partial pivoting; returns null if singular. */
export function solve(A: Float64Array, b: Float64Array, n: number): Float64Array | null {
  const a = Float64Array.from(A);
  const x = Float64Array.from(b);
  for (let c = 0; c < n; c++) {
    let p = c;
    let best = Math.abs(a[c * n + c]);
    for (let r = c + 1; r < n; r++) {
      const v = Math.abs(a[r * n + c]);
      if (v > best) {
        best = v;
        p = r;
      }
    }
    if (!(best > 1e-300)) return null;
    if (p !== c) {
      for (let k = 0; k < n; k++) {
        const t = a[c * n + k];
        a[c * n + k] = a[p * n + k];
        a[p * n + k] = t;
      }
      const t = x[c];
      x[c] = x[p];
      x[p] = t;
    }
    const d = a[c * n + c];
    for (let r = c + 1; r < n; r++) {
      const f = a[r * n + c] / d;
      if (f === 0) continue;
      for (let k = c; k < n; k++) a[r * n + k] -= f * a[c * n + k];
      x[r] -= f * x[c];
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    let s = x[r];
    for (let k = r + 1; k < n; k++) s -= a[r * n + k] * x[k];
    x[r] = s / a[r * n + r];
  }
  for (let i = 0; i < n; i++) if (!Number.isFinite(x[i])) return null;
  return x;
}

/** Inverse of a symmetric positive-definite matrix via column solves; null if singular. */
export function inverse(A: Float64Array, n: number): Float64Array | null {
  const inv = new Float64Array(n * n);
  const e = new Float64Array(n);
  for (let c = 0; c < n; c++) {
    e.fill(0);
    e[c] = 1;
    const col = solve(A, e, n);
    if (!col) return null;
    for (let r = 0; r < n; r++) inv[r * n + c] = col[r];
  }
  return inv;
}

/**
 * Complex linear system (n ≤ ~4) through its real embedding [[Re, −Im], [Im, Re]].
 * A is n×n interleaved complex (row-major), b interleaved complex; returns interleaved x.
 */
export function solveComplex(A: Float64Array, b: Float64Array, n: number): Float64Array | null {
  const m = 2 * n;
  const R = new Float64Array(m * m);
  const rb = new Float64Array(m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const re = A[2 * (i * n + j)];
      const im = A[2 * (i * n + j) + 1];
      R[i * m + j] = re;
      R[i * m + n + j] = -im;
      R[(n + i) * m + j] = im;
      R[(n + i) * m + n + j] = re;
    }
    rb[i] = b[2 * i];
    rb[n + i] = b[2 * i + 1];
  }
  const x = solve(R, rb, m);
  if (!x) return null;
  const out = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    out[2 * i] = x[i];
    out[2 * i + 1] = x[n + i];
  }
  return out;
}
