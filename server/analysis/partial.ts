/**
 * One partial, start to finish: band extraction, fit window, one- and two-mode fits, model choice,
 * doublet or two-stage classification, uncertainties, and the envelope for the decay plot.
 */
import type { Partial } from "../../shared/schemas/analysis";
import { LN_1000 } from "../../shared/physics";
import { BAND_GUARD, extractBand, type Band } from "./band";
import { fitOrders, informationCriterion, type DampedFit } from "./damped-fit";

export interface PartialRequest {
  /** Interleaved DFT bins 0…M/2 of the strike segment (zero-padded to M). */
  X: Float64Array;
  M: number;
  sampleRate: number;
  /** First sample of the segment in the file, and its length in samples (before padding). */
  segStart: number;
  segLen: number;
  onsetSample: number;
  /** First sample after the strike transient (and after any clipping). */
  fitStartSample: number;
  /** Peak frequencies (Hz) analysed together: one, or two close peaks (a resolved doublet). */
  peaksHz: number[];
  /** Distance from the group to the nearest other spectral peak, Hz. */
  neighbourHz: number;
}

export interface RefinedPartial {
  partial: Partial;
  /** Decay rate 1/τ of the reported partial and its standard uncertainty, 1/s: used to recognise steady tones. */
  alpha: number;
  alphaUncertainty: number;
  envelope: { timeS: number[]; levelDb: number[]; noiseFloorDb: number };
}

const MAX_K = 4096;
const MIN_K = 32;
/** Largest number of band samples over a segment (bounds the fit's work). */
const MAX_BAND_SAMPLES = 8192;
/** Fewest band samples in a fit window. */
const MIN_FIT_SAMPLES = 24;
/** Band samples skipped after an abrupt start (the filter's edge response, ≈ 4 samples wide). */
const EDGE = 6;

function pow2Floor(x: number): number {
  return x < 1 ? 1 : 2 ** Math.floor(Math.log2(x));
}

function chooseK(r: PartialRequest): number {
  const binHz = r.sampleRate / r.M;
  const span = r.peaksHz.length > 1 ? Math.max(...r.peaksHz) - Math.min(...r.peaksHz) : 0;
  // The nearest other peak must fall outside the band (in the stopband), with room for its skirt.
  const maxHalfHz = 0.7 * r.neighbourHz - span / 2;
  let K = pow2Floor((2 * maxHalfHz) / binHz);
  // A resolved doublet must sit in the flat middle half of the band.
  const needK = 2 ** Math.ceil(Math.log2((4 * (span / 2 + 1)) / binHz));
  if (span > 0) K = Math.max(K, needK);
  K = Math.min(K, MAX_K, pow2Floor((MAX_BAND_SAMPLES * r.M) / r.segLen), r.M / 4);
  return Math.max(K, MIN_K);
}

interface ModeOut {
  f: number;
  a: number; // amplitude at fit start (full scale = 1)
  alpha: number;
  re: number;
  im: number;
}

/** Refines one partial (or a close pair). Returns null when there is too little signal to fit. */
export function refinePartial(r: PartialRequest): RefinedPartial | null {
  const centre = r.peaksHz.reduce((s, f) => s + f, 0) / r.peaksHz.length;
  const kMax = chooseK(r);
  const bandAt = (K: number): Band | null => {
    let b: Band | null = null;
    while (K >= MIN_K && !(b = extractBand(r.X, r.M, r.sampleRate, centre, K))) K /= 2;
    return b;
  };
  // The data start abruptly at the segment start (the strike, or the end of clipping); the band
  // filter spreads that edge over a few samples, so the fit starts EDGE samples after it.
  const startIndex = (b: Band) => Math.max(EDGE, Math.ceil((r.fitStartSample - r.segStart) / (r.M / b.K)) + EDGE);
  const lastIndex = (b: Band) => Math.floor((r.segLen - 1) / (r.M / b.K)) - BAND_GUARD;

  // Pass 1: a quick fit (one or two modes) over everything at a coarse rate (about 1000 samples
  // over the segment, then every few of them), to learn the decay rate, the noise level and where
  // the partial meets the noise floor.
  const k1 = Math.max(MIN_K, Math.min(kMax, pow2Floor((1024 * r.M) / r.segLen)));
  let band = bandAt(k1);
  if (!band) return null;
  let mStart = startIndex(band);
  let mEndMax = lastIndex(band);
  if (mEndMax - mStart + 1 < MIN_FIT_SAMPLES && band.K < kMax) {
    band = bandAt(kMax);
    if (!band) return null;
    mStart = startIndex(band);
    mEndMax = lastIndex(band);
  }
  if (mEndMax - mStart + 1 < MIN_FIT_SAMPLES) return null;
  const y1 = band.y.subarray(2 * mStart, 2 * (mEndMax + 1));
  // A quick one-mode fit on every step-th sample: the band holds only this partial, so
  // subsampling folds only noise, and each sample keeps the full noise variance.
  const stride = Math.max(1, Math.floor(y1.length / 2 / 300));
  const sub = new Float64Array(2 * Math.floor((y1.length / 2 - 1) / stride + 1));
  for (let i = 0; i < sub.length / 2; i++) {
    sub[2 * i] = y1[2 * i * stride];
    sub[2 * i + 1] = y1[2 * i * stride + 1];
  }
  const quickFits = fitOrders(sub, band.dt * stride, true);
  let quick = quickFits.one;
  if (quickFits.two && (!quick || informationCriterion(quickFits.two) < informationCriterion(quick))) quick = quickFits.two;
  if (!quick) return null;
  const sigma1 = Math.sqrt(quick.sigma2);
  const t0 = (r.segStart + mStart * (r.M / band.K)) / r.sampleRate;
  let tEnd = (r.segStart + mEndMax * (r.M / band.K)) / r.sampleRate;
  // Stop where the fitted envelope (Σ|aₖ|·e^(−αₖt)) falls to twice the noise RMS, 6 dB above the floor.
  const env = (t: number) => quick!.modes.reduce((sum, m) => sum + Math.hypot(m.re, m.im) * Math.exp(-m.alpha * t), 0);
  if (env(tEnd - t0) < 2 * sigma1 && env(0) > 2 * sigma1) {
    let lo = 0;
    let hi = tEnd - t0;
    for (let i = 0; i < 40; i++) {
      const mid = (lo + hi) / 2;
      if (env(mid) > 2 * sigma1) lo = mid;
      else hi = mid;
    }
    tEnd = t0 + hi;
  }
  const slowest = Math.min(...quick.modes.map((m) => m.alpha));
  const m0 = { alpha: slowest };

  // Pass 2 rate: fine enough for the decay (dt ≤ τ/10) and 500–1000 samples in the fit window
  // (more adds work, not information: the band holds the partial's whole spectrum either way);
  // never wider than the neighbours allow.
  const tau1 = m0.alpha > 0 ? 1 / m0.alpha : Infinity;
  const needDt = Math.min(tau1 / 10, Math.max(tEnd - t0, 1e-3) / 500);
  const k2 = Math.max(MIN_K, Math.min(kMax, 2 ** Math.ceil(Math.log2(r.M / (needDt * r.sampleRate))), pow2Floor((MAX_BAND_SAMPLES * r.M) / r.segLen)));
  if (k2 !== band.K) {
    const b2 = bandAt(k2);
    if (b2) band = b2;
  }
  const step = r.M / band.K; // segment samples per band sample
  const nSeg = Math.floor((r.segLen - 1) / step) + 1;
  mStart = startIndex(band);
  mEndMax = lastIndex(band);
  let mEnd = Math.min(mEndMax, Math.floor((tEnd * r.sampleRate - r.segStart) / step));
  mEnd = Math.max(mEnd, Math.min(mEndMax, mStart + MIN_FIT_SAMPLES - 1));
  if (mEnd - mStart + 1 < MIN_FIT_SAMPLES) return null;
  const y = band.y.subarray(2 * mStart, 2 * (mEnd + 1));
  const n = mEnd - mStart + 1;

  // Pass 2: one and two modes over the fit window; the information criterion chooses.
  const { one, two } = fitOrders(y, band.dt, true, r.peaksHz.length > 1);
  if (!one) return null;
  // Uncertainties are the Cramér–Rao bound evaluated at the fit (damped-fit.ts), and approximate
  // in three ways, all stated here: (1) the noise is taken as white within the band, with its
  // density at the partial read from the residual and corrected for the taper (the residual
  // variance averages the band, whose edges are attenuated: σ²_white = σ²_residual / mean(taper²));
  // (2) the band samples are treated as independent; (3) model error (a decay that is not
  // exponential, an unmodelled neighbour) is not included — the bound is what noise alone allows.
  // The reference tests check that the errors on synthetic strikes scatter as these bounds say.
  const noiseWhite = (f: DampedFit) => f.sigma2 / band!.taperPower;
  const cov = (f: DampedFit) => {
    const s = noiseWhite(f) / 2;
    return f.inverseNormal ? f.inverseNormal.map((v) => v * s) : null;
  };
  let chosen: DampedFit = one;
  let kind: "single" | "doublet" | "twoStage" = "single";
  if (two && informationCriterion(two) < informationCriterion(one) && validTwo(two, cov(two), band, n, y)) {
    const C = cov(two)!;
    const np = 8;
    const [p, q] = two.modes;
    const dw = p.omega - q.omega;
    const varDw = C[3 * np + 3] + C[7 * np + 7] - 2 * C[3 * np + 7];
    const da = p.alpha - q.alpha;
    const varDa = C[2 * np + 2] + C[6 * np + 6] - 2 * C[2 * np + 6];
    if (Math.abs(dw) > 3 * Math.sqrt(Math.max(varDw, 0))) kind = "doublet";
    else if (Math.abs(da) > 3 * Math.sqrt(Math.max(varDa, 0))) kind = "twoStage";
    if (kind !== "single") chosen = two;
  } else if (r.peaksHz.length > 1 && two && validTwo(two, cov(two), band, n, y)) {
    // Two peaks the FFT already resolved: two modes by construction.
    chosen = two;
    kind = "doublet";
  }
  let reported: DampedFit = chosen;
  let C = cov(chosen);
  if (kind === "doublet" && r.peaksHz.length === 1 && C) {
    // The spectrum showed one peak, so a true doublet here is closer than the FFT resolves
    // (a few Hz). A second mode further away is a weaker neighbour inside the band (hum, another
    // partial's skirt): keep it in the model, but report only the mode at the peak, with its
    // marginal covariance (the 4×4 block of the full one).
    const [m0f, m1f] = chosen.modes.map((m) => band!.centreHz + m.omega / (2 * Math.PI));
    if (Math.abs(m0f - m1f) > Math.max(8, 0.005 * centre)) {
      const main = Math.abs(m0f - centre) <= Math.abs(m1f - centre) ? 0 : 1;
      reported = { ...chosen, modes: [chosen.modes[main]] };
      const sub = new Float64Array(16);
      for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) sub[i * 4 + j] = C[(4 * main + i) * 8 + 4 * main + j];
      C = sub;
      kind = "single";
    }
  }
  const p = reported.modes.length;
  const np = 4 * p;
  const modes: ModeOut[] = reported.modes.map((m) => ({
    f: band!.centreHz + m.omega / (2 * Math.PI),
    a: band!.ampScale * Math.hypot(m.re, m.im),
    alpha: m.alpha,
    re: m.re,
    im: m.im,
  }));
  const varOf = (i: number, j: number) => (C ? C[i * np + j] : NaN);
  const fitStartS = (r.segStart + mStart * step) / r.sampleRate;
  const fitEndS = (r.segStart + mEnd * step) / r.sampleRate;
  const onsetS = r.onsetSample / r.sampleRate;
  const endOfRecordingS = (r.segStart + r.segLen) / r.sampleRate;
  // Amplitudes are reported at the end of the strike transient, common to all partials of the
  // strike: extrapolating a fast decay further back, into the transient, would inflate it.
  const amplitudeAtS = r.fitStartSample / r.sampleRate;
  const back = fitStartS - amplitudeAtS;

  // Combined frequency and τ: power-weighted means (weights at the fit start), with their variance
  // from the full covariance, Σ wₖwₗ·Cov.
  const power = modes.map((m) => m.a * m.a);
  const ptot = power.reduce((s, v) => s + v, 0);
  const w = power.map((v) => v / ptot);
  let frequencyHz = 0;
  let varF = 0;
  for (let k = 0; k < p; k++) {
    frequencyHz += w[k] * modes[k].f;
    for (let l = 0; l < p; l++) varF += w[k] * w[l] * varOf(4 * k + 3, 4 * l + 3);
  }
  let frequencyUncertaintyHz = Math.sqrt(Math.max(varF, 0)) / (2 * Math.PI);
  let tauS: number;
  let tauUncertaintyS: number;
  let amplitude: number;
  let twoStage: Partial["twoStage"] = null;
  let modesOut: Partial["modes"] = undefined;
  let beatHz: number | null = null;
  const tauVar = (k: number, l: number) => varOf(4 * k + 2, 4 * l + 2) / (modes[k].alpha ** 2 * modes[l].alpha ** 2);
  if (kind === "twoStage") {
    const e = modes[0].alpha > modes[1].alpha ? 0 : 1;
    const l = 1 - e;
    tauS = 1 / modes[l].alpha;
    tauUncertaintyS = Math.sqrt(Math.max(tauVar(l, l), 0));
    const ratio = modes[e].a / modes[l].a;
    const knee = fitStartS + Math.log(ratio) / (modes[e].alpha - modes[l].alpha);
    twoStage = { earlyTauS: 1 / modes[e].alpha, lateTauS: tauS, kneeS: Math.max(onsetS, knee) };
    // Coherent sum at the onset (same frequency, so the phases add).
    let sr = 0;
    let si = 0;
    for (const m of modes) {
      const g = Math.exp(m.alpha * back);
      sr += m.re * g;
      si += m.im * g;
    }
    amplitude = band.ampScale * Math.hypot(sr, si);
  } else {
    tauS = 0;
    let vt = 0;
    for (let k = 0; k < p; k++) {
      tauS += w[k] / modes[k].alpha;
      for (let l = 0; l < p; l++) vt += w[k] * w[l] * tauVar(k, l);
    }
    tauUncertaintyS = Math.sqrt(Math.max(vt, 0));
    amplitude = Math.sqrt(modes.reduce((s, m) => s + (m.a * Math.exp(m.alpha * back)) ** 2, 0));
    if (kind === "doublet") {
      beatHz = Math.abs(modes[0].f - modes[1].f);
      modesOut = modes
        .map((m, k) => ({
          frequencyHz: m.f,
          frequencyUncertaintyHz: Math.sqrt(Math.max(varOf(4 * k + 3, 4 * k + 3), 0)) / (2 * Math.PI),
          amplitudeDb: 20 * Math.log10(m.a * Math.exp(m.alpha * back)),
          tauS: 1 / m.alpha,
          tauUncertaintyS: Math.sqrt(Math.max(tauVar(k, k), 0)),
        }))
        .sort((x, z) => x.frequencyHz - z.frequencyHz);
    }
  }
  if (!Number.isFinite(frequencyUncertaintyHz)) frequencyUncertaintyHz = NaN;

  const sigma = Math.sqrt(chosen.sigma2);
  const fitR2 = envelopeR2(y, chosen, band.dt);
  const decayDb = (20 / Math.LN10) * (endOfRecordingS - onsetS) / tauS;
  const partial: Partial = {
    frequencyHz,
    frequencyUncertaintyHz,
    amplitudeDb: 20 * Math.log10(amplitude),
    amplitudeAtS,
    tauS,
    tauUncertaintyS,
    t60S: tauS * LN_1000,
    q: Math.PI * frequencyHz * tauS,
    fitR2,
    beatHz,
    ...(modesOut ? { modes: modesOut } : {}),
    twoStage,
    fitStartS,
    fitEndS,
    tauUnreliable: !(tauS > 0) || decayDb < 3,
    // SNR at the fit start within this partial's analysis band: the partial's amplitude over the
    // band's noise RMS, the same two levels the decay plot shows (envelope and noise floor).
    snrDb: 20 * Math.log10(Math.sqrt(ptot) / (band.ampScale * (sigma || 1e-300))),
  };
  return {
    partial,
    alpha: 1 / tauS,
    alphaUncertainty: Number.isFinite(tauUncertaintyS) ? tauUncertaintyS / (tauS * tauS) : Infinity,
    envelope: envelopeSeries(band, nSeg, r.segStart, r.sampleRate, sigma),
  };
}

function validTwo(f: DampedFit, C: Float64Array | null, band: Band, n: number, y: Float64Array): boolean {
  if (!C) return false;
  const flatHalfRad = 2 * Math.PI * (band.K / 4) * (1 / (band.K * band.dt));
  let dataEnergy = 0;
  for (let i = 0; i < y.length; i++) dataEnergy += y[i] * y[i];
  let modeEnergy = 0;
  for (let k = 0; k < 2; k++) {
    const m = f.modes[k];
    const a2 = m.re * m.re + m.im * m.im;
    // Each mode must carry real energy over the window (≥ 25 noise variances): the amplitudes of
    // two close modes are strongly correlated, so their individual uncertainties say little.
    const decay = Math.exp(-2 * m.alpha * band.dt);
    const energy = Math.abs(1 - decay) < 1e-12 ? a2 * n : (a2 * (1 - Math.pow(decay, n))) / (1 - decay);
    if (!(energy > 25 * f.sigma2)) return false;
    modeEnergy += energy;
    if (!(m.alpha * band.dt < 0.3)) return false; // not a leftover of the strike transient
    if (!(m.alpha > -1 / (n * band.dt))) return false; // not growing
    if (Math.abs(m.omega) > flatHalfRad) return false; // inside the flat part of the band
  }
  // Two huge modes that cancel each other are an ill-conditioned fit, not two modes. Real doublets
  // can start nearly in anti-phase (the sum then grows as the beat turns), so allow 20 dB.
  return modeEnergy < 100 * dataEnergy;
}

/** R² of the fitted envelope (modes plus the noise floor) against the data, in dB, over blocks. */
function envelopeR2(y: Float64Array, fit: DampedFit, dt: number): number {
  const n = y.length / 2;
  const blocks = Math.min(64, Math.floor(n / 2));
  const per = Math.floor(n / blocks);
  const data: number[] = [];
  const model: number[] = [];
  const p = fit.modes.length;
  for (let b = 0; b < blocks; b++) {
    let ed = 0;
    let em = 0;
    for (let i = b * per; i < (b + 1) * per; i++) {
      ed += y[2 * i] ** 2 + y[2 * i + 1] ** 2;
      let mr = 0;
      let mi = 0;
      for (let k = 0; k < p; k++) {
        const m = fit.modes[k];
        const g = Math.exp(-m.alpha * i * dt);
        const c = Math.cos(m.omega * i * dt);
        const s = Math.sin(m.omega * i * dt);
        mr += g * (m.re * c - m.im * s);
        mi += g * (m.re * s + m.im * c);
      }
      em += mr * mr + mi * mi + fit.sigma2;
    }
    data.push(10 * Math.log10(ed / per + 1e-300));
    model.push(10 * Math.log10(em / per + 1e-300));
  }
  const mean = data.reduce((s, v) => s + v, 0) / blocks;
  let ssTot = 0;
  let ssRes = 0;
  for (let b = 0; b < blocks; b++) {
    ssTot += (data[b] - mean) ** 2;
    ssRes += (data[b] - model[b]) ** 2;
  }
  if (!(ssTot > 0)) return 0;
  return Math.max(0, Math.min(1, 1 - ssRes / ssTot));
}

/** Envelope (dB re full scale, peak amplitude) over the whole segment, at most 600 points. */
function envelopeSeries(band: Band, nSeg: number, segStart: number, sampleRate: number, sigma: number) {
  // The last BAND_GUARD samples carry the band filter's wrap-around from the strike (a false rise).
  const usable = Math.max(1, nSeg - BAND_GUARD);
  const points = Math.min(600, usable);
  const per = usable / points;
  const step = band.dt * sampleRate;
  const timeS: number[] = [];
  const levelDb: number[] = [];
  for (let b = 0; b < points; b++) {
    const lo = Math.floor(b * per);
    const hi = Math.max(lo + 1, Math.floor((b + 1) * per));
    let e = 0;
    for (let i = lo; i < hi; i++) e += band.y[2 * i] ** 2 + band.y[2 * i + 1] ** 2;
    timeS.push(round((segStart + ((lo + hi - 1) / 2) * step) / sampleRate, 5));
    levelDb.push(round(10 * Math.log10((e / (hi - lo)) * band.ampScale ** 2 + 1e-30), 2));
  }
  return { timeS, levelDb, noiseFloorDb: round(20 * Math.log10(band.ampScale * sigma + 1e-30), 2) };
}

function round(v: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}
