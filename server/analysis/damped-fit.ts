/**
 * Least-squares fit of p damped complex exponentials to baseband samples:
 *   y[m] ≈ Σₖ aₖ·exp((−αₖ + jωₖ)·m·dt),  aₖ complex, αₖ = 1/τₖ (1/s), ωₖ (rad/s).
 * Under white Gaussian noise this least-squares fit is the maximum-likelihood estimate. It starts
 * from the matrix pencil and is finished by variable projection (refine, below). The covariance is
 * the Cramér–Rao bound at the fitted parameters and noise level: CRB = (σ²/2)·(JᵀJ)⁻¹ with J the
 * Jacobian over all 4p real parameters, for complex white noise of variance σ² (Slepian–Bangs
 * form; Kay, "Fundamentals of Statistical Signal Processing: Estimation Theory", 1993, §3.9 and
 * §15.7; for damped sinusoids see Yao & Pandit, IEEE Trans. SP 43(4):878–885, 1995).
 */
import { complexDft } from "./fft";
import { inverse, solve, solveComplex } from "./linalg";
import { matrixPencil, type Pole } from "./pencil";

export interface Mode {
  /** Complex amplitude at m = 0. */
  re: number;
  im: number;
  alpha: number;
  omega: number;
}

export interface DampedFit {
  modes: Mode[];
  /** Sum of squared residual magnitudes. */
  ssr: number;
  n: number;
  /** Unbiased residual variance per complex sample, ssr/(n − 2p). */
  sigma2: number;
  /** (JᵀJ)⁻¹ (4p × 4p, order re, im, α, ω per mode); multiply by σ²/2 for the covariance. */
  inverseNormal: Float64Array | null;
  iterations: number;
}

/** Linear least-squares amplitudes for fixed poles: (ΦᴴΦ)·a = Φᴴy. */
export function projectAmplitudes(y: Float64Array, dt: number, poles: Pole[]): Float64Array | null {
  const n = y.length / 2;
  const p = poles.length;
  const G = new Float64Array(2 * p * p);
  const b = new Float64Array(2 * p);
  const zr = poles.map((q) => Math.exp(-q.alpha * dt) * Math.cos(q.omega * dt));
  const zi = poles.map((q) => Math.exp(-q.alpha * dt) * Math.sin(q.omega * dt));
  const er = new Float64Array(p).fill(1);
  const ei = new Float64Array(p);
  for (let m = 0; m < n; m++) {
    const yr = y[2 * m];
    const yi = y[2 * m + 1];
    for (let a = 0; a < p; a++) {
      // conj(e_a)·y
      b[2 * a] += er[a] * yr + ei[a] * yi;
      b[2 * a + 1] += er[a] * yi - ei[a] * yr;
      for (let c = 0; c < p; c++) {
        G[2 * (a * p + c)] += er[a] * er[c] + ei[a] * ei[c];
        G[2 * (a * p + c) + 1] += er[a] * ei[c] - ei[a] * er[c];
      }
    }
    for (let a = 0; a < p; a++) {
      const r = er[a] * zr[a] - ei[a] * zi[a];
      ei[a] = er[a] * zi[a] + ei[a] * zr[a];
      er[a] = r;
    }
  }
  return solveComplex(G, b, p);
}

/** The model Σₖ aₖ·zₖ^m, m = 0…n−1, zₖ = e^((−αₖ + jωₖ)·dt), as interleaved complex samples (θ: re, im, α, ω per mode). */
export function modelSamples(th: ArrayLike<number>, p: number, dt: number, n: number): Float64Array {
  const zr = new Float64Array(p);
  const zi = new Float64Array(p);
  const er = new Float64Array(p);
  const ei = new Float64Array(p);
  for (let k = 0; k < p; k++) {
    const d = Math.exp(-th[4 * k + 2] * dt);
    zr[k] = d * Math.cos(th[4 * k + 3] * dt);
    zi[k] = d * Math.sin(th[4 * k + 3] * dt);
    er[k] = th[4 * k];
    ei[k] = th[4 * k + 1];
  }
  const out = new Float64Array(2 * n);
  for (let m = 0; m < n; m++) {
    let mr = 0;
    let mi = 0;
    for (let k = 0; k < p; k++) {
      mr += er[k];
      mi += ei[k];
      const r = er[k] * zr[k] - ei[k] * zi[k];
      ei[k] = er[k] * zi[k] + ei[k] * zr[k];
      er[k] = r;
    }
    out[2 * m] = mr;
    out[2 * m + 1] = mi;
  }
  return out;
}

function cost(y: Float64Array, dt: number, th: Float64Array, p: number, alphaMin: number): number {
  const n = y.length / 2;
  for (let k = 0; k < p; k++) if (th[4 * k + 2] < alphaMin || !Number.isFinite(th[4 * k + 2])) return Infinity;
  const model = modelSamples(th, p, dt, n);
  let s = 0;
  for (let i = 0; i < 2 * n; i += 2) {
    const dr = y[i] - model[i];
    const di = y[i + 1] - model[i + 1];
    s += dr * dr + di * di;
  }
  return s;
}

/** JᵀJ and Jᵀr for the model at θ (J: derivative of the model, real-stacked). */
function normalEquations(y: Float64Array, dt: number, th: Float64Array, p: number): { A: Float64Array; g: Float64Array } {
  const n = y.length / 2;
  const np = 4 * p;
  const A = new Float64Array(np * np);
  const g = new Float64Array(np);
  const zr = new Float64Array(p);
  const zi = new Float64Array(p);
  const er = new Float64Array(p).fill(1); // e_k(m) = exp(s_k·m·dt)
  const ei = new Float64Array(p);
  for (let k = 0; k < p; k++) {
    const d = Math.exp(-th[4 * k + 2] * dt);
    zr[k] = d * Math.cos(th[4 * k + 3] * dt);
    zi[k] = d * Math.sin(th[4 * k + 3] * dt);
  }
  const jr = new Float64Array(np);
  const ji = new Float64Array(np);
  for (let m = 0; m < n; m++) {
    const t = m * dt;
    let mr = 0;
    let mi = 0;
    for (let k = 0; k < p; k++) {
      const ar = th[4 * k];
      const ai = th[4 * k + 1];
      const vr = ar * er[k] - ai * ei[k]; // a·e
      const vi = ar * ei[k] + ai * er[k];
      mr += vr;
      mi += vi;
      jr[4 * k] = er[k]; // ∂/∂Re a
      ji[4 * k] = ei[k];
      jr[4 * k + 1] = -ei[k]; // ∂/∂Im a = j·e
      ji[4 * k + 1] = er[k];
      jr[4 * k + 2] = -t * vr; // ∂/∂α = −t·a·e
      ji[4 * k + 2] = -t * vi;
      jr[4 * k + 3] = -t * vi; // ∂/∂ω = j·t·a·e
      ji[4 * k + 3] = t * vr;
    }
    const rr = y[2 * m] - mr;
    const ri = y[2 * m + 1] - mi;
    for (let i = 0; i < np; i++) {
      const a = jr[i];
      const b = ji[i];
      g[i] += a * rr + b * ri;
      for (let j = i; j < np; j++) A[i * np + j] += a * jr[j] + b * ji[j];
    }
    for (let k = 0; k < p; k++) {
      const r = er[k] * zr[k] - ei[k] * zi[k];
      ei[k] = er[k] * zi[k] + ei[k] * zr[k];
      er[k] = r;
    }
  }
  for (let i = 0; i < np; i++) for (let j = 0; j < i; j++) A[i * np + j] = A[j * np + i];
  return { A, g };
}

interface Projection {
  /** e_k(m) = exp(s_k·m·dt), interleaved per mode: E[k][2m], E[k][2m+1]. */
  E: Float64Array[];
  /** Amplitudes (interleaved complex) and the p×p Gram matrix ΦᴴΦ. */
  c: Float64Array;
  G: Float64Array;
  r: Float64Array;
  ssr: number;
}

function project(y: Float64Array, dt: number, alpha: Float64Array, omega: Float64Array, alphaMin: number): Projection | null {
  const n = y.length / 2;
  const p = alpha.length;
  for (let k = 0; k < p; k++) if (!(alpha[k] >= alphaMin) || !Number.isFinite(omega[k])) return null;
  const E: Float64Array[] = [];
  for (let k = 0; k < p; k++) {
    const e = new Float64Array(2 * n);
    const d = Math.exp(-alpha[k] * dt);
    const zr = d * Math.cos(omega[k] * dt);
    const zi = d * Math.sin(omega[k] * dt);
    let er = 1;
    let ei = 0;
    for (let m = 0; m < n; m++) {
      e[2 * m] = er;
      e[2 * m + 1] = ei;
      const t = er * zr - ei * zi;
      ei = er * zi + ei * zr;
      er = t;
      // Re-anchor every 256 samples so the recurrence's rounding does not accumulate.
      if ((m & 255) === 255) {
        const tm = (m + 1) * dt;
        const g = Math.exp(-alpha[k] * tm);
        er = g * Math.cos(omega[k] * tm);
        ei = g * Math.sin(omega[k] * tm);
      }
    }
    E.push(e);
  }
  const G = new Float64Array(2 * p * p);
  const b = new Float64Array(2 * p);
  for (let a = 0; a < p; a++) {
    const ea = E[a];
    for (let m = 0; m < n; m++) {
      b[2 * a] += ea[2 * m] * y[2 * m] + ea[2 * m + 1] * y[2 * m + 1];
      b[2 * a + 1] += ea[2 * m] * y[2 * m + 1] - ea[2 * m + 1] * y[2 * m];
    }
    for (let c = 0; c < p; c++) {
      const ec = E[c];
      let re = 0;
      let im = 0;
      for (let m = 0; m < n; m++) {
        re += ea[2 * m] * ec[2 * m] + ea[2 * m + 1] * ec[2 * m + 1];
        im += ea[2 * m] * ec[2 * m + 1] - ea[2 * m + 1] * ec[2 * m];
      }
      G[2 * (a * p + c)] = re;
      G[2 * (a * p + c) + 1] = im;
    }
  }
  const c = solveComplex(G, b, p);
  if (!c) return null;
  const r = Float64Array.from(y);
  for (let k = 0; k < p; k++) {
    const e = E[k];
    const cr = c[2 * k];
    const ci = c[2 * k + 1];
    for (let m = 0; m < n; m++) {
      r[2 * m] -= e[2 * m] * cr - e[2 * m + 1] * ci;
      r[2 * m + 1] -= e[2 * m] * ci + e[2 * m + 1] * cr;
    }
  }
  let ssr = 0;
  for (let i = 0; i < r.length; i++) ssr += r[i] * r[i];
  if (!Number.isFinite(ssr)) return null;
  return { E, c, G, r, ssr };
}

/**
 * Variable projection (Golub & Pereyra, SIAM J. Numer. Anal. 10(2), 1973): the amplitudes are
 * eliminated by linear least squares for every trial of the poles, and Levenberg–Marquardt
 * (Marquardt, J. SIAM 11(2), 1963) moves only the 2p poles (α, ω), with Kaufman's approximation
 * of the projected Jacobian (BIT 15, 1975). Far better conditioned than fitting amplitudes and
 * poles jointly when two modes nearly cancel (close doublets). Null when degenerate.
 */
export function refine(y: Float64Array, dt: number, start: Pole[], maxIter = 60): DampedFit | null {
  const n = y.length / 2;
  const p = start.length;
  if (n < 4 * p) return null;
  const q = 2 * p;
  // Allow at most e³ of growth across the window: growing "partials" are rejected later anyway,
  // and the bound keeps the model finite.
  const alphaMin = -3 / (n * dt);
  let alpha = Float64Array.from(start.map((s) => Math.max(s.alpha, alphaMin * 0.5)));
  let omega = Float64Array.from(start.map((s) => s.omega));
  let P = project(y, dt, alpha, omega, alphaMin);
  if (!P) return null;
  let lambda = 1e-3;
  let it = 0;
  const t = new Float64Array(n);
  for (let m = 0; m < n; m++) t[m] = m * dt;
  for (; it < maxIter; it++) {
    // Kaufman Jacobian: J_j = −P⊥·(∂Φ/∂θ_j)·c, with ∂Φ/∂α_k = −t·e_k and ∂Φ/∂ω_k = j·t·e_k.
    const J: Float64Array[] = [];
    for (let j = 0; j < q; j++) {
      const k = j >> 1;
      const e = P.E[k];
      const cr = P.c[2 * k];
      const ci = P.c[2 * k + 1];
      const v = new Float64Array(2 * n);
      for (let m = 0; m < n; m++) {
        const ur = e[2 * m] * cr - e[2 * m + 1] * ci; // e·c
        const ui = e[2 * m] * ci + e[2 * m + 1] * cr;
        if ((j & 1) === 0) {
          v[2 * m] = -t[m] * ur;
          v[2 * m + 1] = -t[m] * ui;
        } else {
          v[2 * m] = -t[m] * ui;
          v[2 * m + 1] = t[m] * ur;
        }
      }
      const w = new Float64Array(2 * p);
      for (let l = 0; l < p; l++) {
        const el = P.E[l];
        let re = 0;
        let im = 0;
        for (let m = 0; m < n; m++) {
          re += el[2 * m] * v[2 * m] + el[2 * m + 1] * v[2 * m + 1];
          im += el[2 * m] * v[2 * m + 1] - el[2 * m + 1] * v[2 * m];
        }
        w[2 * l] = re;
        w[2 * l + 1] = im;
      }
      const x = solveComplex(P.G, w, p);
      if (!x) return null;
      for (let l = 0; l < p; l++) {
        const el = P.E[l];
        const xr = x[2 * l];
        const xi = x[2 * l + 1];
        for (let m = 0; m < n; m++) {
          v[2 * m] -= el[2 * m] * xr - el[2 * m + 1] * xi;
          v[2 * m + 1] -= el[2 * m] * xi + el[2 * m + 1] * xr;
        }
      }
      for (let i = 0; i < 2 * n; i++) v[i] = -v[i];
      J.push(v);
    }
    const A = new Float64Array(q * q);
    const g = new Float64Array(q);
    for (let i = 0; i < q; i++) {
      const a = J[i];
      let s = 0;
      for (let m = 0; m < 2 * n; m++) s += a[m] * P.r[m];
      g[i] = -s;
      for (let j = i; j < q; j++) {
        const b = J[j];
        let u = 0;
        for (let m = 0; m < 2 * n; m++) u += a[m] * b[m];
        A[i * q + j] = u;
        A[j * q + i] = u;
      }
    }
    // Converged when even the full Gauss–Newton step would lower the cost by less than 10⁻⁴ of
    // one noise variance (ssr/n): the quadratic model's predicted decrease is gᵀ·A⁻¹·g.
    const gn = solve(A, g, q);
    if (gn) {
      let pred = 0;
      for (let i = 0; i < q; i++) pred += g[i] * gn[i];
      if (pred < (1e-4 * P.ssr) / n) break;
    }
    let improved = false;
    for (let tries = 0; tries < 12; tries++) {
      const M = Float64Array.from(A);
      for (let i = 0; i < q; i++) M[i * q + i] += lambda * (A[i * q + i] + 1e-300);
      const d = solve(M, g, q);
      if (!d) {
        lambda *= 10;
        continue;
      }
      const na = Float64Array.from(alpha);
      const no = Float64Array.from(omega);
      for (let k = 0; k < p; k++) {
        na[k] += d[2 * k];
        no[k] += d[2 * k + 1];
      }
      const trial = project(y, dt, na, no, alphaMin);
      if (trial && trial.ssr < P.ssr) {
        alpha = na;
        omega = no;
        P = trial;
        lambda = Math.max(lambda / 10, 1e-12);
        improved = true;
        break;
      }
      lambda *= 4;
    }
    if (!improved) break;
    // A mode that dies within a sample or two is fitting the noise or the strike edge: stop here
    // and let the caller's validity check reject it.
    let runaway = false;
    for (let k = 0; k < p; k++) if (alpha[k] * dt > 1) runaway = true;
    if (runaway) break;
  }
  const th = new Float64Array(4 * p);
  for (let k = 0; k < p; k++) {
    th[4 * k] = P.c[2 * k];
    th[4 * k + 1] = P.c[2 * k + 1];
    th[4 * k + 2] = alpha[k];
    th[4 * k + 3] = omega[k];
  }
  // Covariance over all 4p parameters (amplitudes included) from the full Jacobian.
  const { A } = normalEquations(y, dt, th, p);
  const modes: Mode[] = [];
  for (let k = 0; k < p; k++) modes.push({ re: th[4 * k], im: th[4 * k + 1], alpha: th[4 * k + 2], omega: th[4 * k + 3] });
  return { modes, ssr: P.ssr, n, sigma2: P.ssr / Math.max(1, n - 2 * p), inverseNormal: inverse(A, 4 * p), iterations: it };
}

/** Cost (sum of squared residuals) of the projected-amplitude model for fixed poles. */
export function projectedCost(y: Float64Array, dt: number, poles: Pole[]): { ssr: number; amps: Float64Array } | null {
  const amps = projectAmplitudes(y, dt, poles);
  if (!amps) return null;
  const p = poles.length;
  const th = new Float64Array(4 * p);
  for (let k = 0; k < p; k++) {
    th[4 * k] = amps[2 * k];
    th[4 * k + 1] = amps[2 * k + 1];
    th[4 * k + 2] = poles[k].alpha;
    th[4 * k + 3] = poles[k].omega;
  }
  const n = y.length / 2;
  return { ssr: cost(y, dt, th, p, -Infinity), amps: n > 0 ? amps : amps };
}

/** Matrix-pencil poles of a (subsampled) window; the starting value for the fits. */
export function startingPoles(y: Float64Array, dt: number, order: 1 | 2): Pole[] | null {
  const sub = subsample(y, 120);
  return matrixPencil(sub.y, dt * sub.step, order);
}

/**
 * Does the one-mode residual hold structure a second mode could explain? The periodogram of the
 * residual (zero-padded ×2) is compared with its mean: for white noise the largest of N bins
 * rarely exceeds (ln N + 4) times the mean (exponential order statistics: P ≈ N·e^(−ln N − 4) ≈
 * 2 %). Returns the frequency offset of the strongest residual line (rad/s), or null when the
 * residual looks like noise and the two-mode fit can be skipped.
 */
export function residualLine(y: Float64Array, dt: number, one: DampedFit): number | null {
  const n = y.length / 2;
  const m = one.modes[0];
  const P = project(y, dt, Float64Array.of(m.alpha), Float64Array.of(m.omega), -Infinity);
  if (!P) return null;
  let L = 1;
  while (L < 2 * n) L *= 2;
  const buf = new Float64Array(2 * L);
  buf.set(P.r);
  const R = complexDft(buf);
  // Search the flat middle half of the band only: a second mode is accepted only there, and the
  // band edges carry the filter's response to the abrupt start of the data.
  let sum = 0;
  let best = 0;
  let at = 0;
  let count = 0;
  for (let k = 0; k < L; k++) {
    const cyc = k <= L / 2 ? k : k - L;
    if (Math.abs(cyc) > L / 4) continue;
    const v = R[2 * k] * R[2 * k] + R[2 * k + 1] * R[2 * k + 1];
    sum += v;
    count++;
    if (v > best) {
      best = v;
      at = k;
    }
  }
  const mean = sum / count;
  L = Math.max(L, 1);
  if (!(best > (Math.log(count) + 4) * mean)) return null;
  const cycles = at <= L / 2 ? at : at - L;
  return (2 * Math.PI * cycles) / (L * dt);
}

/**
 * Order-1 and order-2 fits. Order 2 is tried only when the one-mode residual shows a line
 * (residualLine), from the matrix pencil, from the residual line, and from splits of the order-1
 * pole in frequency (a doublet) and in decay rate (a two-stage decay); the two starts with the
 * lowest projected cost (amplitudes solved for the given poles) are refined, the better kept.
 * `force` tries order 2 even when the residual looks white (two peaks seen in the spectrum).
 */
export function fitOrders(y: Float64Array, dt: number, withOrder2: boolean, force = false): { one: DampedFit | null; two: DampedFit | null } {
  const n = y.length / 2;
  const start1 = startingPoles(y, dt, 1) ?? [{ alpha: 1 / (n * dt), omega: 0 }];
  const one = refine(y, dt, start1) ?? refine(y, dt, [{ alpha: 1 / (n * dt), omega: 0 }]);
  if (!withOrder2 || !one) return { one, two: null };
  const line = residualLine(y, dt, one);
  if (line === null && !force) return { one, two: null };
  const T = n * dt;
  const base = one.modes[0];
  const starts: Pole[][] = [];
  const pencil2 = startingPoles(y, dt, 2);
  if (pencil2) starts.push(pencil2);
  if (line !== null && Math.abs(line - base.omega) > Math.PI / T) {
    starts.push([
      { alpha: base.alpha, omega: base.omega },
      { alpha: base.alpha, omega: line },
    ]);
  }
  for (const df of [0.2 / T, 0.6 / T, 2 / T]) {
    const dw = Math.PI * df;
    starts.push([
      { alpha: base.alpha, omega: base.omega - dw },
      { alpha: base.alpha, omega: base.omega + dw },
    ]);
  }
  const a = Math.max(base.alpha, 0.5 / T);
  starts.push([
    { alpha: a * 3, omega: base.omega },
    { alpha: a * 0.6, omega: base.omega + 0.01 / T },
  ]);
  const scored = starts
    .map((s) => ({ s, c: projectedCost(y, dt, s)?.ssr ?? Infinity }))
    .filter((x) => Number.isFinite(x.c))
    .sort((x, z) => x.c - z.c)
    .slice(0, 2);
  let two: DampedFit | null = null;
  for (const { s } of scored) {
    const f = refine(y, dt, s, 60);
    if (f && (!two || f.ssr < two.ssr)) two = f;
  }
  return { one, two };
}

/**
 * Keep every `step`-th sample so at most `max` remain: the band holds only this partial, so the
 * aliasing that subsampling causes folds only noise. Used for the starting value only.
 */
function subsample(y: Float64Array, max: number): { y: Float64Array; step: number } {
  const n = y.length / 2;
  const step = Math.max(1, Math.ceil(n / max));
  if (step === 1) return { y, step };
  const m = Math.floor((n - 1) / step) + 1;
  const out = new Float64Array(2 * m);
  for (let i = 0; i < m; i++) {
    out[2 * i] = y[2 * i * step];
    out[2 * i + 1] = y[2 * i * step + 1];
  }
  return { y: out, step };
}

/**
 * Information criterion for the number of modes: −2·log-likelihood for complex Gaussian noise,
 * 2n·ln(ssr/n), plus a penalty of 8·ln(n) per mode. This follows the MAP rule for sinusoids in
 * white noise (Djurić, IEEE Trans. SP 44(7):1744–1751, 1996; reviewed in Stoica & Selén, IEEE
 * Signal Processing Magazine 21(4):36–47, 2004), which charges a frequency 3·ln n and each linear
 * parameter (Re a, Im a) ln n; charging the decay rate α like a frequency is our choice, by
 * analogy. Stricter than plain BIC (Schwarz, Ann. Stat. 6(2), 1978), so noise is not taken for a
 * second mode.
 */
export function informationCriterion(fit: DampedFit): number {
  const n = fit.n;
  return 2 * n * Math.log(fit.ssr / n + 1e-300) + 8 * fit.modes.length * Math.log(n);
}
