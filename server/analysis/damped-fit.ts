/**
 * Least-squares fit of p damped complex exponentials to baseband samples:
 *   y[m] ≈ Σₖ aₖ·exp((−αₖ + jωₖ)·m·dt),  aₖ complex, αₖ = 1/τₖ (1/s), ωₖ (rad/s).
 * Under white Gaussian noise this least-squares fit is the maximum-likelihood estimate. Amplitudes
 * start from the linear least-squares projection for the given poles (the variable-projection
 * idea of Golub & Pereyra, SIAM J. Numer. Anal. 10(2), 1973) and all 4p real parameters are then
 * refined jointly by Levenberg–Marquardt (Marquardt, J. SIAM 11(2), 1963) with the analytic
 * Jacobian. The covariance is the Cramér–Rao bound at the fitted parameters and noise level:
 * CRB = (σ²/2)·(JᵀJ)⁻¹ for complex white noise of variance σ² (Slepian–Bangs form; Kay,
 * "Fundamentals of Statistical Signal Processing: Estimation Theory", 1993, §3.9 and §15.7;
 * for damped sinusoids see Yao & Pandit, IEEE Trans. SP 43(4):878–885, 1995).
 */
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

function cost(y: Float64Array, dt: number, th: Float64Array, p: number, alphaMin: number): number {
  const n = y.length / 2;
  for (let k = 0; k < p; k++) if (th[4 * k + 2] < alphaMin || !Number.isFinite(th[4 * k + 2])) return Infinity;
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
  let s = 0;
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
    const dr = y[2 * m] - mr;
    const di = y[2 * m + 1] - mi;
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

/** Levenberg–Marquardt from the given poles; null when the problem is degenerate. */
export function refine(y: Float64Array, dt: number, start: Pole[], maxIter = 60): DampedFit | null {
  const n = y.length / 2;
  const p = start.length;
  if (n < 4 * p) return null;
  const amps = projectAmplitudes(y, dt, start);
  if (!amps) return null;
  const np = 4 * p;
  let th = new Float64Array(np);
  for (let k = 0; k < p; k++) {
    th[4 * k] = amps[2 * k];
    th[4 * k + 1] = amps[2 * k + 1];
    th[4 * k + 2] = start[k].alpha;
    th[4 * k + 3] = start[k].omega;
  }
  // Allow at most e³ of growth across the window: growing "partials" are rejected later anyway,
  // and the bound keeps the model finite.
  const alphaMin = -3 / (n * dt);
  for (let k = 0; k < p; k++) th[4 * k + 2] = Math.max(th[4 * k + 2], alphaMin * 0.5);
  let c = cost(y, dt, th, p, alphaMin);
  if (!Number.isFinite(c)) return null;
  let lambda = 1e-3;
  let it = 0;
  let converged = false;
  for (; it < maxIter; it++) {
    const { A, g } = normalEquations(y, dt, th, p);
    let improved = false;
    for (let tries = 0; tries < 12; tries++) {
      const M = Float64Array.from(A);
      for (let i = 0; i < np; i++) M[i * np + i] += lambda * (A[i * np + i] + 1e-300);
      const d = solve(M, g, np);
      if (!d) {
        lambda *= 10;
        continue;
      }
      const trial = new Float64Array(np);
      for (let i = 0; i < np; i++) trial[i] = th[i] + d[i];
      const ct = cost(y, dt, trial, p, alphaMin);
      if (ct < c) {
        // Converged when the cost falls by less than 10⁻⁴ of one noise variance (c/n): far below
        // anything the data can distinguish.
        const done = c - ct < (1e-4 * c) / n;
        th = trial;
        c = ct;
        lambda = Math.max(lambda / 3, 1e-12);
        improved = true;
        if (done) converged = true;
        break;
      }
      lambda *= 4;
    }
    if (!improved || converged) break;
    // A mode that dies within a sample or two is fitting the noise or the strike edge: stop here
    // and let the caller's validity check reject it.
    let runaway = false;
    for (let k = 0; k < p; k++) if (th[4 * k + 2] * dt > 1) runaway = true;
    if (runaway) break;
  }
  const { A } = normalEquations(y, dt, th, p);
  const modes: Mode[] = [];
  for (let k = 0; k < p; k++) modes.push({ re: th[4 * k], im: th[4 * k + 1], alpha: th[4 * k + 2], omega: th[4 * k + 3] });
  if (process.env.TINELOG_DEBUG_LM) console.error(`LM p=${p} n=${n} iterations=${it}`);
  return { modes, ssr: c, n, sigma2: c / Math.max(1, n - 2 * p), inverseNormal: inverse(A, np), iterations: it };
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
 * Order-1 and order-2 fits. Order 2 is tried from the matrix pencil and from splits of the
 * order-1 pole in frequency (a doublet) and in decay rate (a two-stage decay); the start with the
 * lowest projected cost (amplitudes solved for the given poles) is refined.
 */
export function fitOrders(y: Float64Array, dt: number, withOrder2: boolean): { one: DampedFit | null; two: DampedFit | null } {
  const n = y.length / 2;
  const start1 = startingPoles(y, dt, 1) ?? [{ alpha: 1 / (n * dt), omega: 0 }];
  const one = refine(y, dt, start1) ?? refine(y, dt, [{ alpha: 1 / (n * dt), omega: 0 }]);
  if (!withOrder2 || !one) return { one, two: null };
  const T = n * dt;
  const base = one.modes[0];
  const starts: Pole[][] = [];
  const pencil2 = startingPoles(y, dt, 2);
  if (pencil2) starts.push(pencil2);
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
    .slice(0, 1);
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
 * 2n·ln(ssr/n), plus a penalty of 8·ln(n) per mode — the MAP rule for sinusoids in white noise
 * (Djurić, IEEE Trans. SP 44(7):1744–1751, 1996), which charges each frequency-like parameter
 * (here ω and α) 3·ln n and each linear one (Re a, Im a) ln n; reviewed in Stoica & Selén, IEEE
 * Signal Processing Magazine 21(4):36–47, 2004. Stricter than plain BIC (Schwarz, 1978), which
 * keeps noise from being taken for a second mode.
 */
export function informationCriterion(fit: DampedFit): number {
  const n = fit.n;
  return 2 * n * Math.log(fit.ssr / n + 1e-300) + 8 * fit.modes.length * Math.log(n);
}
