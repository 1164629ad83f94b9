/**
 * Matrix pencil estimate of damped complex exponentials (Hua & Sarkar, "Matrix pencil method for
 * estimating parameters of exponentially damped/undamped sinusoids in noise", IEEE Trans. ASSP
 * 38(5):814–824, 1990). Used only as the starting value for the least-squares fit.
 */
import { solveComplex } from "./linalg";

export interface Pole {
  /** Decay rate α = 1/τ, 1/s. */
  alpha: number;
  /** Angular frequency offset, rad/s. */
  omega: number;
}

/**
 * Poles of `order` (1 or 2) damped exponentials in complex samples y (interleaved), spacing dt s.
 * The signal subspace comes from subspace iteration on YᴴY, Y the Hankel data matrix with pencil
 * parameter L = n/3 (the choice Hua & Sarkar recommend for noise robustness).
 */
export function matrixPencil(y: Float64Array, dt: number, order: 1 | 2): Pole[] | null {
  const n = y.length / 2;
  const L = Math.max(order + 1, Math.floor(n / 3));
  const rows = n - L;
  const cols = L + 1;
  if (rows < order + 1) return null;
  // R = YᴴY (cols × cols, Hermitian), Y[i][j] = y[i + j]. The Hankel structure gives
  // R[a+1][b+1] = R[a][b] − conj(y[a])·y[b] + conj(y[a+rows])·y[b+rows], so only the first row is
  // summed in full.
  const R = new Float64Array(2 * cols * cols);
  for (let b = 0; b < cols; b++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < rows; i++) {
      const ar = y[2 * i];
      const ai = y[2 * i + 1];
      const br = y[2 * (i + b)];
      const bi = y[2 * (i + b) + 1];
      re += ar * br + ai * bi; // conj(Y[i][0])·Y[i][b]
      im += ar * bi - ai * br;
    }
    R[2 * b] = re;
    R[2 * b + 1] = im;
  }
  for (let a = 0; a + 1 < cols; a++) {
    for (let b = a; b + 1 < cols; b++) {
      const ar = y[2 * a], ai = y[2 * a + 1], br = y[2 * b], bi = y[2 * b + 1];
      const cr = y[2 * (a + rows)], ci = y[2 * (a + rows) + 1], dr = y[2 * (b + rows)], di = y[2 * (b + rows) + 1];
      const re = R[2 * (a * cols + b)] - (ar * br + ai * bi) + (cr * dr + ci * di);
      const im = R[2 * (a * cols + b) + 1] - (ar * bi - ai * br) + (cr * di - ci * dr);
      R[2 * ((a + 1) * cols + b + 1)] = re;
      R[2 * ((a + 1) * cols + b + 1) + 1] = im;
    }
  }
  for (let a = 0; a < cols; a++) {
    for (let b = a + 1; b < cols; b++) {
      R[2 * (b * cols + a)] = R[2 * (a * cols + b)];
      R[2 * (b * cols + a) + 1] = -R[2 * (a * cols + b) + 1];
    }
  }
  // Subspace iteration for the `order` dominant eigenvectors (Golub & Van Loan, Matrix
  // Computations, §8.2.4 "orthogonal iteration").
  const p = order;
  let Q = new Float64Array(2 * cols * p);
  for (let k = 0; k < p; k++) for (let i = 0; i < cols; i++) Q[2 * (i * p + k)] = Math.cos(0.7 * (k + 1) * i) + (i === k ? 1 : 0);
  orthonormalize(Q, cols, p);
  for (let it = 0; it < 25; it++) {
    const Z = new Float64Array(2 * cols * p);
    for (let i = 0; i < cols; i++) {
      for (let k = 0; k < p; k++) {
        let re = 0;
        let im = 0;
        for (let j = 0; j < cols; j++) {
          const rr = R[2 * (i * cols + j)];
          const ri = R[2 * (i * cols + j) + 1];
          const qr = Q[2 * (j * p + k)];
          const qi = Q[2 * (j * p + k) + 1];
          re += rr * qr - ri * qi;
          im += rr * qi + ri * qr;
        }
        Z[2 * (i * p + k)] = re;
        Z[2 * (i * p + k) + 1] = im;
      }
    }
    if (!orthonormalize(Z, cols, p)) return null;
    Q = Z;
  }
  // Z = pinv(V1)·V2 with V1 = Q without its last row, V2 = Q without its first row.
  const G = new Float64Array(2 * p * p); // V1ᴴV1
  const H = new Float64Array(2 * p * p); // V1ᴴV2
  for (let a = 0; a < p; a++) {
    for (let b = 0; b < p; b++) {
      let gr = 0;
      let gi = 0;
      let hr = 0;
      let hi = 0;
      for (let i = 0; i < cols - 1; i++) {
        const ar = Q[2 * (i * p + a)];
        const ai = -Q[2 * (i * p + a) + 1];
        const br = Q[2 * (i * p + b)];
        const bi = Q[2 * (i * p + b) + 1];
        gr += ar * br - ai * bi;
        gi += ar * bi + ai * br;
        const cr = Q[2 * ((i + 1) * p + b)];
        const ci = Q[2 * ((i + 1) * p + b) + 1];
        hr += ar * cr - ai * ci;
        hi += ar * ci + ai * cr;
      }
      G[2 * (a * p + b)] = gr;
      G[2 * (a * p + b) + 1] = gi;
      H[2 * (a * p + b)] = hr;
      H[2 * (a * p + b) + 1] = hi;
    }
  }
  const Zm = new Float64Array(2 * p * p);
  for (let b = 0; b < p; b++) {
    const col = new Float64Array(2 * p);
    for (let a = 0; a < p; a++) {
      col[2 * a] = H[2 * (a * p + b)];
      col[2 * a + 1] = H[2 * (a * p + b) + 1];
    }
    const x = solveComplex(G, col, p);
    if (!x) return null;
    for (let a = 0; a < p; a++) {
      Zm[2 * (a * p + b)] = x[2 * a];
      Zm[2 * (a * p + b) + 1] = x[2 * a + 1];
    }
  }
  const roots: Array<[number, number]> = [];
  if (p === 1) roots.push([Zm[0], Zm[1]]);
  else {
    // Eigenvalues of a 2×2 complex matrix: λ = (tr ± √(tr² − 4·det))/2.
    const [ar, ai, br, bi, cr, ci, dr, di] = Zm;
    const tr = ar + dr;
    const ti = ai + di;
    const detr = ar * dr - ai * di - (br * cr - bi * ci);
    const deti = ar * di + ai * dr - (br * ci + bi * cr);
    const discr = tr * tr - ti * ti - 4 * detr;
    const disci = 2 * tr * ti - 4 * deti;
    const [sr, si] = csqrt(discr, disci);
    roots.push([(tr + sr) / 2, (ti + si) / 2], [(tr - sr) / 2, (ti - si) / 2]);
  }
  const poles: Pole[] = [];
  for (const [zr, zi] of roots) {
    const mag = Math.hypot(zr, zi);
    if (!(mag > 0) || !Number.isFinite(mag)) return null;
    poles.push({ alpha: -Math.log(mag) / dt, omega: Math.atan2(zi, zr) / dt });
  }
  return poles;
}

function csqrt(re: number, im: number): [number, number] {
  const m = Math.hypot(re, im);
  const r = Math.sqrt((m + re) / 2);
  const i = Math.sign(im || 1) * Math.sqrt(Math.max(0, (m - re) / 2));
  return [r, i];
}

/** Modified Gram–Schmidt on the p columns of an n×p interleaved complex matrix. */
function orthonormalize(Q: Float64Array, n: number, p: number): boolean {
  for (let k = 0; k < p; k++) {
    for (let j = 0; j < k; j++) {
      let re = 0;
      let im = 0;
      for (let i = 0; i < n; i++) {
        const qr = Q[2 * (i * p + j)];
        const qi = Q[2 * (i * p + j) + 1];
        const vr = Q[2 * (i * p + k)];
        const vi = Q[2 * (i * p + k) + 1];
        re += qr * vr + qi * vi;
        im += qr * vi - qi * vr;
      }
      for (let i = 0; i < n; i++) {
        const qr = Q[2 * (i * p + j)];
        const qi = Q[2 * (i * p + j) + 1];
        Q[2 * (i * p + k)] -= re * qr - im * qi;
        Q[2 * (i * p + k) + 1] -= re * qi + im * qr;
      }
    }
    let norm = 0;
    for (let i = 0; i < n; i++) norm += Q[2 * (i * p + k)] ** 2 + Q[2 * (i * p + k) + 1] ** 2;
    norm = Math.sqrt(norm);
    if (!(norm > 1e-300)) return false;
    for (let i = 0; i < n; i++) {
      Q[2 * (i * p + k)] /= norm;
      Q[2 * (i * p + k) + 1] /= norm;
    }
  }
  return true;
}
