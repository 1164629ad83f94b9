/**
 * The independent check of a decay fit: the level of the isolated band (the magnitude of the
 * complex band signal is the band's Hilbert envelope, since the band holds only positive
 * frequencies) against the fitted model's envelope, in dB, block by block over the fit window.
 *
 * A damped-exponential model can describe a decay that is not exponential surprisingly well in
 * the waveform's least-squares sense (two large modes that cancel draw a linear fade), so the
 * model is never judged against itself: the figures here come from the data's own envelope.
 */
import { modelSamples, type Mode } from "./damped-fit";

export interface EnvelopeCheck {
  /** R² of the model's envelope (dB) against the band's envelope (dB) over the fit window, 0…1. */
  r2: number;
  /** RMS of band level − model level (dB) over the blocks where the model stands ≥ 10 dB above the noise. */
  deviationDb: number;
  /** What noise alone would give for deviationDb (RMS of the blocks' expected scatter), dB. */
  noiseDeviationDb: number;
  /** The model and the band part by more than the tolerance (see NON_EXPONENTIAL_DB). */
  notExponential: boolean;
  /** The deviation is large and erratic block to block (noise-like), not a smooth, systematic curve. */
  erratic: boolean;
  /** Fall of the band's envelope from the first to the last tenth of the window, dB (≥ 0). */
  observedDecayDb: number;
  /** Blocks compared (≥ 10 dB above the noise). */
  blocks: number;
}

/**
 * Tolerance of the check: the band and the model part by more than 1.5 dB RMS (and by more than
 * three times what noise alone explains). Our threshold: a single exponential fitted to a tone
 * under a linear fade parts from it by well over 5 dB; an unmodelled neighbour 20 dB weaker than
 * the partial (the weakest the band keeps out) ripples the envelope by at most ±0.8 dB.
 */
export const NON_EXPONENTIAL_DB = 1.5;
/** A band is taken for noise only when its envelope parts from the model by more than 3 dB RMS,
 *  erratically (our threshold: twice the non-exponential tolerance, so a partial heard through a
 *  reverberant room, whose envelope wanders by 1–2 dB, is kept and judged, not dropped). */
const NOISE_LIKE_DB = 3;
/** The von Neumann ratio (mean squared successive difference over mean square) of independent
 *  residuals is 2; a smooth systematic curve gives far less (von Neumann, Ann. Math. Stat. 12(4),
 *  1941). Above 1 the deviation is taken as erratic. */
const ERRATIC_RATIO = 1;

/**
 * y: the band samples of the fit window (interleaved complex), dt s apart, first sample at the
 * model's t = 0. noiseVariance: the band's complex noise variance per sample (independent of the
 * fit). modes: the fitted model (complex amplitudes at t = 0, α in 1/s, ω in rad/s).
 */
export function checkEnvelope(y: Float64Array, dt: number, modes: Mode[], noiseVariance: number): EnvelopeCheck {
  const n = y.length / 2;
  const blocks = Math.max(2, Math.min(48, Math.floor(n / 8)));
  const per = Math.floor(n / blocks);
  const p = modes.length;
  const data: number[] = [];
  const model: number[] = [];
  const signal: number[] = [];
  const th = new Float64Array(4 * p);
  modes.forEach((m, k) => th.set([m.re, m.im, m.alpha, m.omega], 4 * k));
  const mod = modelSamples(th, p, dt, n);
  for (let b = 0; b < blocks; b++) {
    let ed = 0;
    let em = 0;
    for (let i = b * per; i < (b + 1) * per; i++) {
      ed += y[2 * i] ** 2 + y[2 * i + 1] ** 2;
      em += mod[2 * i] ** 2 + mod[2 * i + 1] ** 2;
    }
    signal.push(em / per);
    data.push(10 * Math.log10(ed / per + 1e-300));
    model.push(10 * Math.log10(em / per + noiseVariance + 1e-300));
  }
  // R² over every block of the window.
  const mean = data.reduce((s, v) => s + v, 0) / blocks;
  let ssTot = 0;
  let ssRes = 0;
  for (let b = 0; b < blocks; b++) {
    ssTot += (data[b] - mean) ** 2;
    ssRes += (data[b] - model[b]) ** 2;
  }
  const r2 = ssTot > 0 ? Math.max(0, Math.min(1, 1 - ssRes / ssTot)) : 0;

  // Deviation where the model stands clear of the noise. The scatter noise alone gives a block's
  // power: var ≈ (2·S·σ² + σ⁴)/N for signal power S, noise σ², N samples (N/2 taken as
  // independent: the band's taper correlates neighbours), in dB ×(10/ln 10)/(S + σ²).
  const res: number[] = [];
  let expected = 0;
  for (let b = 0; b < blocks; b++) {
    const S = signal[b];
    if (!(S >= 10 * noiseVariance)) continue;
    res.push(data[b] - model[b]);
    const v = (2 * S * noiseVariance + noiseVariance * noiseVariance) / Math.max(1, per / 2);
    expected += ((10 / Math.LN10) * Math.sqrt(v) / (S + noiseVariance)) ** 2;
  }
  const used = res.length;
  const deviationDb = used ? Math.sqrt(res.reduce((s, v) => s + v * v, 0) / used) : 0;
  const noiseDeviationDb = used ? Math.sqrt(expected / used) : 0;
  let diff = 0;
  for (let i = 1; i < used; i++) diff += (res[i] - res[i - 1]) ** 2;
  const ratio = used > 2 && deviationDb > 0 ? diff / (used - 1) / (deviationDb * deviationDb) : 0;
  const notExponential = used >= 4 && deviationDb > Math.max(NON_EXPONENTIAL_DB, 3 * noiseDeviationDb);
  const tenth = Math.max(1, Math.round(blocks / 10));
  const avg = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
  const observedDecayDb = Math.max(0, avg(data.slice(0, tenth)) - avg(data.slice(blocks - tenth)));
  return { r2, deviationDb, noiseDeviationDb, notExponential, erratic: deviationDb > NOISE_LIKE_DB && ratio > ERRATIC_RATIO, observedDecayDb, blocks: used };
}
