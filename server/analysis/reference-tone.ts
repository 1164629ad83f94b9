/**
 * Measuring a reference tone for a recorder's clock calibration: one recording of one tone whose
 * frequency is known (a signal generator, a frequency counter's output, a struck reference fork).
 * The tone is measured with the same steps as a strike — WAV decoder, windowed spectrum and peak
 * finder, band extraction and the damped-sinusoid fit of partial.ts — so the calibration describes
 * the very chain that measures the units. A steady tone is simply a partial that does not decay.
 *
 * Pure: bytes in, numbers out. A recording that cannot serve as a reference (clipped, noisy, more
 * than one tone, not the frequency given) is refused with a ReferenceToneRefused that says why and
 * what to do.
 */
import { nextPow2, realDft } from "./fft";
import { mainsHarmonics } from "./hum";
import { refinePartial } from "./partial";
import { findOnsets } from "./segment";
import { findPeaks, windowedSpectrum, ZERO_PAD } from "./spectrum";
import { decodeWav } from "./wav";

export type ReferenceRefusalCode = "silence" | "clipped" | "too_short" | "no_tone" | "wrong_frequency" | "several_tones" | "noisy";

/** A recording that cannot calibrate a recorder; `message` says why and what to do, for the person calibrating. */
export class ReferenceToneRefused extends Error {
  readonly code: ReferenceRefusalCode;
  constructor(code: ReferenceRefusalCode, message: string) {
    super(message);
    this.name = "ReferenceToneRefused";
    this.code = code;
  }
}

export interface ReferenceToneMeasurement {
  sampleRate: number;
  durationS: number;
  /** The tone's frequency as this recorder reads it (its clock taken at the labelled sample rate), Hz. */
  frequencyHz: number;
  /** Standard uncertainty (k = 1) of frequencyHz from the fit (the Cramér–Rao bound at the fitted SNR), Hz. */
  frequencyUncertaintyHz: number;
  /** Peak amplitude re full scale at the start of the analysed span, dBFS. */
  amplitudeDb: number;
  /** The tone over the noise in its own analysis band, dB. */
  snrDb: number;
  /** The tone over everything else in the recording (noise, hum, other sounds), dB. */
  clearanceDb: number;
  /** True when the tone decays (a struck fork), false for a steady tone (a generator). */
  decays: boolean;
  /** Span of the recording the frequency was fitted over, s from the start. */
  fitStartS: number;
  fitEndS: number;
  /** Advisories that do not refuse the recording. */
  warnings: string[];
}

/** The strongest tone must lie within this fraction of the frequency given: a recorder's clock is off by well under 0.1 %. */
export const MAX_REFERENCE_MISMATCH = 0.002;
/** Another tone within this many dB of the reference makes the recording ambiguous. */
export const SECOND_TONE_DB = 20;
/** The tone must stand at least this far above all the rest of the sound, dB. */
export const MIN_CLEARANCE_DB = 20;
/** Shortest usable tone, s. */
export const MIN_TONE_S = 1;
/** At most this many samples are fitted (about 44 s at 48 kHz): more adds work, not accuracy worth having. */
const MAX_SAMPLES = 1 << 21;

const fmtHz = (f: number) => `${f.toFixed(f >= 1000 ? 1 : 2)} Hz`;

/**
 * Measures the single tone of a reference recording, expected near `expectedHz`.
 * @throws AnalysisInputError when the file is not a readable WAV; ReferenceToneRefused when it is
 * readable but cannot serve as a reference.
 */
export function measureReferenceTone(bytes: Uint8Array, opts: { expectedHz: number }): ReferenceToneMeasurement {
  if (!(opts.expectedHz > 0) || !Number.isFinite(opts.expectedHz)) throw new RangeError("expectedHz must be a positive frequency in Hz");
  const decoded = decodeWav(bytes);
  const { layout, mono, channelStats } = decoded;
  const fs = layout.sampleRate;
  const warnings: string[] = [];
  const peak = Math.max(...channelStats.map((c) => c.peak));
  if (!(peak > 1e-9)) {
    throw new ReferenceToneRefused("silence", "The recording is silent (every sample is zero). Check that the generator or the microphone is connected and selected, then record the reference again.");
  }
  if (decoded.clippedRuns > 0) {
    throw new ReferenceToneRefused(
      "clipped",
      `The reference recording is clipped (${decoded.clippedRuns} run${decoded.clippedRuns === 1 ? "" : "s"} of samples at full scale, the last at ${(decoded.lastClippedFrame / fs).toFixed(2)} s). Clipping adds tones that are not in the reference. Lower the generator's level or the input gain so the peak stays below full scale, and record again.`,
    );
  }
  if (opts.expectedHz > 0.45 * fs) {
    throw new ReferenceToneRefused("wrong_frequency", `A ${fmtHz(opts.expectedHz)} reference cannot be measured at a sample rate of ${fs} Hz (the limit is ${fmtHz(0.45 * fs)}). Use a lower reference frequency or record at a higher rate.`);
  }
  let mean = 0;
  for (let i = 0; i < mono.length; i++) mean += mono[i];
  mean /= mono.length;
  for (let i = 0; i < mono.length; i++) mono[i] -= mean;

  const { start, end } = toneSpan(mono, fs);
  const span = Math.min(end - start, MAX_SAMPLES);
  if (span < MIN_TONE_S * fs) {
    throw new ReferenceToneRefused(
      "too_short",
      `The tone lasts only ${(span / fs).toFixed(2)} s in the recording. Record at least ${MIN_TONE_S} s of it — 5 to 30 s of a steady tone, or a fork left to ring for several seconds, give the best result.`,
    );
  }

  // Peak finding over the first second of the tone (≈ 1 Hz resolution before the ×4 padding).
  const lp = Math.min(span, nextPow2(fs));
  const spec = windowedSpectrum(mono, start, lp, fs);
  const peaks = findPeaks(spec, { minProminenceDb: 15, rangeDb: 90, minHz: Math.max(20, (3 * fs) / spec.size), maxHz: 0.45 * fs, maxPeaks: 32 });
  if (peaks.length === 0) {
    throw new ReferenceToneRefused("no_tone", "No tone stands clear of the noise in this recording. Check the connection to the generator (or strike the reference fork close to the microphone) and record again.");
  }
  const main = peaks[0];
  // Weak mains hum is tolerated (it is reported as a warning); any other tone close in level is not.
  const rivals = peaks.slice(1).filter((p) => p.powerDb >= main.powerDb - SECOND_TONE_DB && Math.abs(p.frequencyHz - main.frequencyHz) > 2 * (fs / spec.size) * ZERO_PAD);
  if (rivals.length > 0) {
    const list = [main, ...rivals].slice(0, 4).sort((x, y) => x.frequencyHz - y.frequencyHz).map((p) => fmtHz(p.frequencyHz)).join(", ");
    throw new ReferenceToneRefused(
      "several_tones",
      `The recording holds more than one tone (${list}, within ${SECOND_TONE_DB} dB of each other), so it is not clear which one is the reference. Record one reference tone per file, alone; for several frequencies add one file per tone, each with its own reference frequency.`,
    );
  }
  const mismatch = Math.abs(main.frequencyHz - opts.expectedHz) / opts.expectedHz;
  if (mismatch > MAX_REFERENCE_MISMATCH) {
    throw new ReferenceToneRefused(
      "wrong_frequency",
      `The strongest tone in the recording is at ${fmtHz(main.frequencyHz)}, but the reference was given as ${fmtHz(opts.expectedHz)} — ${(100 * mismatch).toFixed(2)} % apart, while a recorder's clock is off by a few hundredths of a percent at most. Check the reference frequency entered and the generator's setting.`,
    );
  }
  const clearanceDb = toneClearanceDb(spec.power, main.bin, fs / spec.size);
  if (clearanceDb < MIN_CLEARANCE_DB) {
    throw new ReferenceToneRefused(
      "noisy",
      `The recording is noisy: the tone stands only ${clearanceDb.toFixed(0)} dB above the rest of the sound (noise, hum, other sounds), and a reference needs at least ${MIN_CLEARANCE_DB} dB. Connect the generator by cable, or record the reference fork close to the microphone in a quiet room, and record again.`,
    );
  }
  const hum = peaks.slice(1).filter((p) => mainsHarmonics(p.frequencyHz).length > 0);
  if (hum.length > 0) warnings.push(`Mains hum at ${hum.slice(0, 3).map((p) => fmtHz(p.frequencyHz)).join(", ")} is in the recording, well below the tone; it does not affect the result.`);
  if (20 * Math.log10(peak) < -40) warnings.push(`The recording is quiet (peak ${(20 * Math.log10(peak)).toFixed(0)} dBFS); a higher level gives a smaller uncertainty.`);

  // Neighbours that bound the analysis band: any other peak no more than 40 dB weaker.
  const others = peaks.slice(1).filter((p) => p.powerDb >= main.powerDb - 40).map((p) => Math.abs(p.frequencyHz - main.frequencyHz));
  const neighbourHz = others.length ? Math.min(...others) : Infinity;
  const M = nextPow2(Math.ceil(span * 1.07));
  const X = realDft(mono.subarray(start, start + span), M);
  // White noise of variance σ² per sample gives E|X[k]|² = σ²·Σw² in the Hann spectrum.
  const noisePower = spec.floor[Math.min(spec.floor.length - 1, Math.round(main.frequencyHz / (fs / spec.size)))] / spec.windowSumSq;
  const refined = refinePartial({ X, M, sampleRate: fs, segStart: start, segLen: span, onsetSample: start, fitStartSample: start, peaksHz: [main.frequencyHz], neighbourHz, noisePower });
  const p = refined && refined !== "unresolved" ? refined.partial : null;
  if (!p || !Number.isFinite(p.frequencyHz) || !(p.frequencyUncertaintyHz > 0) || !Number.isFinite(p.frequencyUncertaintyHz)) {
    throw new ReferenceToneRefused("no_tone", "The tone could not be fitted: it may change in pitch or level while it sounds. Record a steady tone (or one clean strike of the reference fork) and try again.");
  }
  const decayDb = Number.isFinite(p.tauS) && p.tauS > 0 ? (20 / Math.LN10) * (span / fs) / p.tauS : 0;
  return {
    sampleRate: fs,
    durationS: layout.durationS,
    frequencyHz: p.frequencyHz,
    frequencyUncertaintyHz: p.frequencyUncertaintyHz,
    amplitudeDb: p.amplitudeDb,
    snrDb: p.snrDb ?? 0,
    clearanceDb,
    decays: decayDb >= 3,
    fitStartS: p.fitStartS,
    fitEndS: p.fitEndS,
    warnings,
  };
}

/**
 * Where the tone sounds: from a strike's end of transient (a struck fork) or from where the level
 * first comes within 10 dB of its maximum (a generator switched on), to the last 5 ms frame within
 * 60 dB of the maximum (so a generator switched off before the end is not fitted as silence).
 */
function toneSpan(x: Float64Array, fs: number): { start: number; end: number } {
  const seg = findOnsets(x, fs);
  const { levelDb, hop } = seg;
  let max = -Infinity;
  for (const l of levelDb) max = Math.max(max, l);
  let start: number;
  let endLimit = x.length;
  if (seg.onsets.length > 0 && seg.onsets[0] > 0) {
    // A strike: skip its transient (60 ms, as for the units' strikes), stop at a second strike.
    start = seg.onsets[0] + Math.round(0.06 * fs);
    if (seg.onsets.length > 1) endLimit = seg.onsets[1];
  } else {
    const first = Math.max(0, levelDb.findIndex((l) => l >= max - 10));
    // A switch-on transient, if any, has passed after 20 ms.
    start = first * hop + (first > 0 ? Math.round(0.02 * fs) : 0);
  }
  let lastFrame = levelDb.length - 1;
  while (lastFrame > 0 && levelDb[lastFrame] < max - 60) lastFrame--;
  const end = Math.min(endLimit, x.length, (lastFrame + 1) * hop);
  return { start: Math.min(start, end), end };
}

/** Power within the tone's main lobe (±4 original bins of the Hann window) over all other power above DC, dB. */
function toneClearanceDb(power: Float64Array, bin: number, binHz: number): number {
  const half = 4 * ZERO_PAD;
  const lo = Math.max(1, bin - half);
  const hi = Math.min(power.length - 1, bin + half);
  let tone = 0;
  let total = 0;
  // Skip the lowest bins: the DC removal leaves a little there, and it is not sound.
  const from = Math.max(1, Math.ceil(20 / binHz));
  for (let k = from; k < power.length; k++) {
    total += power[k];
    if (k >= lo && k <= hi) tone += power[k];
  }
  const rest = Math.max(total - tone, 1e-300);
  return 10 * Math.log10(tone / rest);
}
