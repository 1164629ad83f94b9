/**
 * One partial, start to finish: band extraction, fit window, one- and two-mode fits, model choice,
 * doublet or two-stage classification, uncertainties, and the envelope for the decay plot.
 */
import type { Partial } from "../../shared/schemas/analysis";
import { LN_1000 } from "../../shared/physics";
import { BAND_GUARD, extractBand, type Band } from "./band";
import { fitOrders, informationCriterion, refine, type DampedFit } from "./damped-fit";
import { checkEnvelope } from "./envelope-check";

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
  /** Where amplitudeDb applies, when not at fitStartSample (a fit started late, after a room's early energy). */
  amplitudeAtSample?: number;
  /** Peak frequencies (Hz) analysed together: one, or two close peaks (a resolved doublet). */
  peaksHz: number[];
  /** Distance from the group to the nearest other spectral peak, Hz. */
  neighbourHz: number;
  /** Noise at the partial: variance per sample of the white noise with the local spectral floor's density (full scale = 1). */
  noisePower: number;
}

export interface RefinedPartial {
  partial: Partial;
  /** Decay rate 1/τ of the reported partial and its standard uncertainty, 1/s: used to recognise steady tones. */
  alpha: number;
  alphaUncertainty: number;
  envelope: { timeS: number[]; levelDb: number[]; noiseFloorDb: number };
  /** The band's envelope parts erratically from every model: noise (a room's diffuse tail, the
   *  strike's thud), not a partial. */
  noiseLike: boolean;
  /** A steady line fitted together with the partial (hum, a tone in the room), when there was one. */
  steadyLine: { frequencyHz: number; frequencyUncertaintyHz: number; amplitudeDb: number } | null;
  /** Length of the fit window, s. */
  windowS: number;
  /** The fit found a faster companion at the partial's frequency: an early stage (a damped start,
   *  or the room's early energy). */
  fastCompanion: boolean;
  /** Its time constant, s (NaN without one). */
  fastCompanionTauS: number;
  /** What was asked, so the partial can be refined again from a later start. */
  request: PartialRequest;
}

const MAX_K = 4096;
const MIN_K = 32;
/** Largest number of band samples over a segment (bounds the fit's work). */
const MAX_BAND_SAMPLES = 8192;
/** Fewest band samples in a fit window. */
const MIN_FIT_SAMPLES = 24;
/** Band samples skipped after an abrupt start (the filter's edge response, ≈ 4 samples wide). */
const EDGE = 6;
/** 20·log10(e): dB per neper of amplitude. */
const DB_PER_NEPER = 20 / Math.LN10;

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

/**
 * Refines one partial (or a close pair). Returns null when there is too little signal to fit, and
 * "unresolved" when the band held something the fit could not follow (a decay faster than the band
 * allows, or one that had died down before its window opened).
 */
export function refinePartial(r: PartialRequest): RefinedPartial | "unresolved" | null {
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

  // Pass 2: one and two modes over the fit window; the information criterion chooses, and a pair
  // is then classified by what its modes are (classifyPair).
  const { one, two } = fitOrders(y, band.dt, true, r.peaksHz.length > 1);
  if (!one) return null;
  // Uncertainties are the Cramér–Rao bound evaluated at the fit (damped-fit.ts), and approximate
  // in three ways, all stated here: (1) the noise is taken as white within the band, with its
  // density at the partial read from the residual and corrected for the taper (the residual
  // variance averages the band, whose edges are attenuated: σ²_white = σ²_residual / mean(taper²));
  // (2) the band samples are treated as independent; (3) model error (a decay that is not
  // exponential, an unmodelled neighbour) is not included — the bound is what noise alone allows.
  // The reference tests check that the errors on synthetic strikes scatter as these bounds say.
  // Model error is estimated apart (tauModelUncertaintyS, from the envelope check).
  const noiseWhite = (f: DampedFit) => f.sigma2 / band!.taperPower;
  const cov = (f: DampedFit) => {
    const s = noiseWhite(f) / 2;
    return f.inverseNormal ? f.inverseNormal.map((v) => v * s) : null;
  };
  const windowS = n * band.dt;
  // The band's noise variance per sample, independent of any fit: the spectrum's local floor
  // (white noise of variance σ²ₓ per sample gives var(y) = L·σ²ₓ·mean(taper²)/K in the band),
  // or the one-mode residual when that is lower (the early floor may hold the strike's own
  // reverberation).
  // The band's own tail, where the segment runs on past the partial's decay, is a third reading
  // (the early floor is raised in a reverberant room): the least of the three is taken.
  const bandNoise = Math.min((r.segLen * r.noisePower * band.taperPower) / band.K, one.sigma2, tailPower(band.y, mEndMax));
  const fallDb = checkEnvelope(y, band.dt, one.modes, bandNoise).observedDecayDb;
  let chosen: DampedFit = one;
  let pair: PairClass = { kind: "single", main: 0, companion: null };
  if (two && validTwo(two, cov(two), band, n, y) && (informationCriterion(two) < informationCriterion(one) || r.peaksHz.length > 1)) {
    pair = classifyPair(two, cov(two)!, band.centreHz, centre, windowS, r.peaksHz.length > 1, fallDb);
    if (pair.kind !== "single") chosen = two;
  }
  let kind: "single" | "doublet" | "twoStage" = pair.kind === "main" ? "single" : pair.kind;
  let reported: DampedFit = chosen;
  let C = cov(chosen);
  if (pair.kind === "main" && C) {
    // One mode is the partial; the other (a weaker neighbour inside the band, a steady line, the
    // room's early energy, a beat too weak to matter) stays in the model but is not reported:
    // the partial gets its marginal covariance (the 4×4 block of the full one).
    const main = pair.main;
    reported = { ...chosen, modes: [chosen.modes[main]] };
    const sub = new Float64Array(16);
    for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) sub[i * 4 + j] = C[(4 * main + i) * 8 + 4 * main + j];
    C = sub;
  }
  // A fast companion (an early stage, or the room's early energy) is only approximately one more
  // exponential. Where the window allows, the reported (slow) mode is fitted again alone, from
  // where the fast one has fallen 40 dB below it: from there on the band is one damped exponential.
  let late: { fit: DampedFit; C: Float64Array; startS: number; endS: number; lastIndex: number } | null = null;
  if (pair.companion === "fast" && chosen.modes.length === 2) {
    const slow = chosen.modes[pair.main];
    const fast = chosen.modes[1 - pair.main];
    const aSlow = Math.hypot(slow.re, slow.im);
    const tLate = Math.log((Math.hypot(fast.re, fast.im) / aSlow) * 100) / (fast.alpha - slow.alpha);
    const mLate = Math.ceil(Math.max(0, tLate) / band.dt);
    // The window was cut where the early fit met the noise; the slow mode alone rings on until
    // its own envelope falls to twice the noise RMS.
    const tQuiet = Math.log(aSlow / (2 * Math.sqrt(bandNoise))) / slow.alpha;
    const mLast = Math.min(mEndMax - mStart, Math.max(n - 1, Number.isFinite(tQuiet) ? Math.floor(tQuiet / band.dt) : n - 1));
    if (Number.isFinite(tLate) && mLast - mLate + 1 >= Math.max(2 * MIN_FIT_SAMPLES, 0.25 * n)) {
      const yl = band.y.subarray(2 * (mStart + mLate), 2 * (mStart + mLast + 1));
      const lf = refine(yl, band.dt, [{ alpha: slow.alpha, omega: slow.omega }]);
      const lc = lf ? cov(lf) : null;
      if (lf && lc && lf.modes[0].alpha > 0) late = { fit: lf, C: lc, startS: (r.segStart + (mStart + mLate) * step) / r.sampleRate, endS: (r.segStart + (mStart + mLast) * step) / r.sampleRate, lastIndex: mStart + mLast };
    }
  }
  // An early stage that overlaps the whole measurable decay leaves no stretch where the unit's own
  // decay is alone: its τ is a two-mode approximation of something that is not two modes.
  // The τ reported then is the one-mode fit's: the decay as the recording shows it, marked unreliable.
  const earlyStageOverlap = pair.companion === "fast" && !late;
  const fastCompanionTauS = pair.companion === "fast" && two ? 1 / two.modes[1 - pair.main].alpha : NaN;
  if (earlyStageOverlap) {
    chosen = one;
    reported = one;
    C = cov(one);
    kind = "single";
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
  const fitEndS = Math.max((r.segStart + mEnd * step) / r.sampleRate, late?.endS ?? 0);
  const onsetS = r.onsetSample / r.sampleRate;
  const endOfRecordingS = (r.segStart + r.segLen) / r.sampleRate;
  // Amplitudes are reported at the end of the strike transient, common to all partials of the
  // strike: extrapolating a fast decay further back, into the transient, would inflate it.
  const amplitudeAtS = (r.amplitudeAtSample ?? r.fitStartSample) / r.sampleRate;
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
    const l = pair.main;
    const e = 1 - l;
    tauS = 1 / modes[l].alpha;
    tauUncertaintyS = Math.sqrt(Math.max(tauVar(l, l), 0));
    frequencyHz = modes[l].f;
    frequencyUncertaintyHz = Math.sqrt(Math.max(varOf(4 * l + 3, 4 * l + 3), 0)) / (2 * Math.PI);
    const ratio = modes[e].a / modes[l].a;
    const knee = fitStartS + Math.log(ratio) / (modes[e].alpha - modes[l].alpha);
    // Coherent sum at the onset (nearly the same frequency, so the phases add).
    let sr = 0;
    let si = 0;
    for (const m of modes) {
      const g = Math.exp(m.alpha * back);
      sr += m.re * g;
      si += m.im * g;
    }
    amplitude = band.ampScale * Math.hypot(sr, si);
    twoStage = { earlyTauS: 1 / modes[e].alpha, lateTauS: tauS, kneeS: Math.max(onsetS, knee) };
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
      // A doublet's τ is that of its beat-averaged energy, Σ|aₖ|²·e^(−2αₖt), as a straight line in
      // dB over the window: the decay its envelope shows, which the modes' mean would miss when
      // one of them rings on longer.
      const pts = 32;
      let st = 0, sl = 0, stt = 0, stl = 0;
      for (let i = 0; i < pts; i++) {
        const t = (windowS * i) / (pts - 1);
        const e = modes.reduce((acc, m) => acc + m.a * m.a * Math.exp(-2 * m.alpha * t), 0);
        const lv = 10 * Math.log10(e);
        st += t;
        sl += lv;
        stt += t * t;
        stl += t * lv;
      }
      const slope = (pts * stl - st * sl) / (pts * stt - st * st);
      const tauEff = -DB_PER_NEPER / slope;
      if (tauEff > 0 && Number.isFinite(tauEff)) {
        tauUncertaintyS *= tauEff / tauS;
        tauS = tauEff;
      }
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
  if (late) {
    // The slow mode from its own, later window: frequency and τ (with their bounds) come from there.
    const m = late.fit.modes[0];
    frequencyHz = band.centreHz + m.omega / (2 * Math.PI);
    frequencyUncertaintyHz = Math.sqrt(Math.max(late.C[15], 0)) / (2 * Math.PI);
    tauS = 1 / m.alpha;
    tauUncertaintyS = Math.sqrt(Math.max(late.C[10], 0)) / (m.alpha * m.alpha);
    if (twoStage) twoStage = { ...twoStage, lateTauS: tauS };
  }
  if (!Number.isFinite(frequencyUncertaintyHz)) frequencyUncertaintyHz = NaN;
  // A band too narrow to follow the decay (the neighbours forced a low rate) or a window that
  // opens long after the strike leaves only an extrapolation: a decay of less than two band
  // samples per τ, or a partial that had already fallen 26 dB (3 τ) when its window opened, is
  // not measured here. (A strike's skirt or the room's tail beside a stronger partial looks so.)

  if (tauS > 0 && Number.isFinite(tauS) && (!(band.dt < 0.5 * tauS) || (fitStartS - r.fitStartSample / r.sampleRate) / tauS > 2)) return "unresolved";

  const sigma = Math.sqrt(chosen.sigma2);
  // The model (all its modes, reported or not) against the band's own envelope.
  const check = checkEnvelope(y, band.dt, chosen.modes, bandNoise);
  const nonExponential = check.notExponential;
  // A "doublet" whose model the band's envelope does not follow has no observed beat.
  if (nonExponential && beatHz !== null) {
    beatHz = null;
    modesOut = undefined;
  }
  // Model error as a type B estimate: a deviation beyond what noise explains, read as a tilt of
  // the fitted line over the window, is a slope error of √12·D/T (the RMS of a line tilted about
  // its centre is slope·T/√12), so u(τ)/τ = √12·D/(decay over the window, dB).
  const excessDb = Math.sqrt(Math.max(0, check.deviationDb ** 2 - check.noiseDeviationDb ** 2));
  const modelDecayDb = (DB_PER_NEPER * windowS) / tauS;
  const tauModelUncertaintyS = excessDb > 0 && modelDecayDb > 0 ? (tauS * Math.sqrt(12) * excessDb) / modelDecayDb : 0;
  const decayDb = (DB_PER_NEPER * (endOfRecordingS - onsetS)) / tauS;
  const steadyLine =
    pair.companion === "steady" && two
      ? (() => {
          const k = 1 - pair.main;
          const m = two.modes[k];
          const C2 = cov(two);
          return {
            frequencyHz: band.centreHz + m.omega / (2 * Math.PI),
            frequencyUncertaintyHz: C2 ? Math.sqrt(Math.max(C2[(4 * k + 3) * 8 + 4 * k + 3], 0)) / (2 * Math.PI) : NaN,
            amplitudeDb: 20 * Math.log10(band.ampScale * Math.hypot(m.re, m.im)),
          };
        })()
      : null;
  const partial: Partial = {
    frequencyHz,
    frequencyUncertaintyHz,
    amplitudeDb: 20 * Math.log10(amplitude),
    amplitudeAtS,
    tauS,
    tauUncertaintyS,
    t60S: tauS * LN_1000,
    q: Math.PI * frequencyHz * tauS,
    fitR2: check.r2,
    beatHz,
    ...(modesOut ? { modes: modesOut } : {}),
    twoStage,
    fitStartS,
    fitEndS,
    tauUnreliable: !(tauS > 0) || decayDb < 3 || nonExponential || earlyStageOverlap,
    nonExponential,
    ...(earlyStageOverlap ? { earlyStageOverlap } : {}),
    envelopeDeviationDb: check.deviationDb,
    // With a later window for the slow mode, the decay seen runs on to that window's end.
    observedDecayDb: late ? Math.max(check.observedDecayDb, meanLevelDb(y, 0, Math.max(1, Math.round(n / 10))) - meanLevelDb(band.y, late.lastIndex - Math.max(1, Math.round((late.lastIndex - mStart) / 10)), late.lastIndex)) : check.observedDecayDb,
    tauModelUncertaintyS,
    // SNR at the fit start within this partial's analysis band: the partial's amplitude over the
    // band's noise RMS, the same two levels the decay plot shows (envelope and noise floor).
    snrDb: 20 * Math.log10(Math.sqrt(ptot) / (band.ampScale * (sigma || 1e-300))),
  };
  return {
    partial,
    alpha: 1 / tauS,
    alphaUncertainty: Number.isFinite(tauUncertaintyS) ? tauUncertaintyS / (tauS * tauS) : Infinity,
    envelope: envelopeSeries(band, nSeg, r.segStart, r.sampleRate, Math.sqrt(bandNoise)),
    noiseLike: check.erratic,
    steadyLine,
    windowS,
    fastCompanion: pair.companion === "fast",
    fastCompanionTauS,
    request: r,
  };
}

/** What the two modes of a two-mode fit are. `main` is the mode to report when kind is "main" or
 *  "twoStage" (the slow one); `companion` says what the other one is. */
interface PairClass {
  kind: "single" | "doublet" | "twoStage" | "main";
  main: number;
  companion: "far" | "steady" | "fast" | "weak" | null;
}

/** A doublet's envelope may fall by this much more than its modes' own damping explains (a beat
 *  null inside the window) before the pair is taken for two cancelling modes drawing a decay that
 *  is not exponential at all. Our threshold: two modes of equal decay whose amplitudes differ by
 *  a factor of 2 give at most 9.5 dB; a tone under a linear fade gives 30 dB and more. */
const EXCESS_FALL_DB = 12;
/** The weaker mode of a doublet must carry at least 1 % of the stronger one's energy in the window
 *  (its beat then swings the envelope by ≥ 1.7 dB); a weaker one is a neighbour, not a doublet. */
const MIN_DOUBLET_ENERGY_RATIO = 0.01;
/** …and ring for a comparable time: decay rates within a factor of 3 (the two modes of a split
 *  degenerate pair lose energy the same ways; our threshold). A much faster companion is an early
 *  stage or the room's early energy beside the partial. */
const MAX_DOUBLET_DECAY_RATIO = 3;
/** Decay rates further apart than this, with a gap under the faster mode's linewidth: an early
 *  stage, not a doublet (the "factor of about 2"; the two modes of a split pair lose
 *  energy the same ways and stay well within it). */
const EARLY_STAGE_RATIO = 2;

/**
 * Classifies a two-mode fit (Hz offsets from the band centre `bandCentreHz`; `peakHz` the peak
 * the band was cut around). In order:
 * 1. modes further apart than max(8 Hz, 0.5 %) with one spectral peak: a neighbour inside the band;
 * 2. one mode steady (no decay within the window) and the other decaying: a steady line (hum, a
 *    tone in the room) beside the struck partial, fitted together; the partial is reported;
 * 3. frequency gap below the faster mode's linewidth 1/(π·τ_fast) and decay rates more than 2×
 *    apart: one partial with an early decay stage (a damped start, the room's early energy), not a
 *    doublet — the slow decay is the unit's;
 * 4. no significant frequency gap: a two-stage decay when the rates differ, else a single mode;
 * 5. a doublet only when both modes ring comparably (energy within 20 dB, decay rates within 3×)
 *    and the beat is observable: the envelope
 *    may not fall far more than the damping explains while less than one beat fits in the window.
 */
function classifyPair(f: DampedFit, C: Float64Array, bandCentreHz: number, peakHz: number, windowS: number, forced: boolean, fallDb: number): PairClass {
  const np = 8;
  const [p, q] = f.modes;
  const fHz = f.modes.map((m) => bandCentreHz + m.omega / (2 * Math.PI));
  const gapHz = Math.abs(fHz[0] - fHz[1]);
  if (!forced && gapHz > Math.max(8, 0.005 * peakHz)) {
    return { kind: "main", main: Math.abs(fHz[0] - peakHz) <= Math.abs(fHz[1] - peakHz) ? 0 : 1, companion: "far" };
  }
  const sdAlpha = (k: number) => Math.sqrt(Math.max(C[(4 * k + 2) * np + 4 * k + 2], 0));
  const decayDb = (k: number) => DB_PER_NEPER * f.modes[k].alpha * windowS;
  // Steady: under 1 dB of decay over the window, or under 2 dB and not significant.
  const steady = (k: number) => Math.abs(decayDb(k)) < 1 || (!(f.modes[k].alpha > 3 * sdAlpha(k)) && decayDb(k) < 2);
  const decaying = (k: number) => f.modes[k].alpha > 3 * sdAlpha(k) && decayDb(k) >= 3;
  for (const k of [0, 1]) if (steady(1 - k) && decaying(k)) return { kind: "main", main: k, companion: "steady" };
  const fast = p.alpha > q.alpha ? 0 : 1;
  const slow = 1 - fast;
  const aFast = f.modes[fast].alpha;
  const aSlow = f.modes[slow].alpha;
  if (aSlow > 0 && gapHz < aFast / Math.PI && aFast > EARLY_STAGE_RATIO * aSlow) return { kind: "twoStage", main: slow, companion: "fast" };
  const dw = p.omega - q.omega;
  const varDw = C[3 * np + 3] + C[7 * np + 7] - 2 * C[3 * np + 7];
  const da = p.alpha - q.alpha;
  const varDa = C[2 * np + 2] + C[6 * np + 6] - 2 * C[2 * np + 6];
  if (!forced && !(Math.abs(dw) > 3 * Math.sqrt(Math.max(varDw, 0)))) {
    return Math.abs(da) > 3 * Math.sqrt(Math.max(varDa, 0)) ? { kind: "twoStage", main: slow, companion: aFast > 2 * aSlow ? "fast" : null } : { kind: "single", main: 0, companion: null };
  }
  const energy = f.modes.map((m) => {
    const a2 = m.re * m.re + m.im * m.im;
    return m.alpha * windowS > 1e-9 ? (a2 * (1 - Math.exp(-2 * m.alpha * windowS))) / (2 * m.alpha) : a2 * windowS;
  });
  const strong = energy[0] >= energy[1] ? 0 : 1;
  if (!(energy[1 - strong] >= MIN_DOUBLET_ENERGY_RATIO * energy[strong]) || aFast > MAX_DOUBLET_DECAY_RATIO * aSlow) {
    return { kind: "main", main: strong, companion: f.modes[1 - strong].alpha > 2 * f.modes[strong].alpha ? "fast" : "weak" };
  }
  const a2 = f.modes.map((m) => m.re * m.re + m.im * m.im);
  const meanAlpha = (a2[0] * p.alpha + a2[1] * q.alpha) / (a2[0] + a2[1]);
  if (gapHz * windowS < 1 && fallDb - DB_PER_NEPER * meanAlpha * windowS > EXCESS_FALL_DB) return { kind: "single", main: 0, companion: null };
  return { kind: "doublet", main: strong, companion: null };
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

/** Mean power of band samples [i0, i1] (interleaved complex), dB. */
function meanLevelDb(y: Float64Array, i0: number, i1: number): number {
  let e = 0;
  const a = Math.max(0, i0);
  for (let i = a; i <= i1; i++) e += y[2 * i] ** 2 + y[2 * i + 1] ** 2;
  return 10 * Math.log10(e / Math.max(1, i1 - a + 1) + 1e-300);
}

/** Mean power of the last fifth of the usable band samples (up to index `last`), per sample. */
function tailPower(y: Float64Array, last: number): number {
  const from = Math.floor(0.8 * last);
  let e = 0;
  for (let i = from; i <= last; i++) e += y[2 * i] ** 2 + y[2 * i + 1] ** 2;
  return last - from + 1 >= 8 ? e / (last - from + 1) : Infinity;
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
