/**
 * The strike analysis result: what the engine returns, what the CLI prints with
 * `--json`, what the server stores and what the client draws. Units are in the field names.
 * The engine may add fields; renaming these breaks the ledger, the CLI contract and external checks.
 */
import { z } from "zod";

export const warningSchema = z.object({
  code: z.enum([
    "clipped",
    "flat_topped",
    "dc_offset",
    "low_sample_rate",
    "low_level",
    "noise_only",
    "channels_disagree",
    "hum",
    "short_recording",
    "tau_unreliable",
    "not_exponential",
    "early_decay_overlap",
    "reverberant_room",
    "no_partials",
  ]),
  message: z.string(),
});
export type AnalysisWarning = z.infer<typeof warningSchema>;

export const partialSchema = z.object({
  frequencyHz: z.number(),
  /** Standard uncertainty of the frequency (k = 1), Hz. */
  frequencyUncertaintyHz: z.number(),
  /** Initial amplitude relative to digital full scale, dBFS. */
  amplitudeDb: z.number(),
  /** Time (s from the file start) at which amplitudeDb applies: the end of the strike transient,
   *  the same instant for every partial of a strike (added by the analysis engine). */
  amplitudeAtS: z.number().optional(),
  /** Amplitude time constant τ, s (x ∝ e^(−t/τ)). */
  tauS: z.number(),
  /** Standard uncertainty of τ (k = 1), s. */
  tauUncertaintyS: z.number(),
  /** T60 = τ·ln(1000), s. */
  t60S: z.number(),
  /** Q = π·f·τ. */
  q: z.number(),
  /** Coefficient of determination of the fitted model's envelope against the isolated band's own
   *  envelope (its level in dB, block by block over the fit window), 0…1. */
  fitR2: z.number(),
  /** Beat frequency of a doublet, Hz; null when the partial is a single mode. */
  beatHz: z.number().nullable(),
  /** The doublet's two modes when beatHz is not null. */
  modes: z
    .array(z.object({ frequencyHz: z.number(), frequencyUncertaintyHz: z.number(), amplitudeDb: z.number(), tauS: z.number(), tauUncertaintyS: z.number() }))
    .optional(),
  /** Two-stage decay: an early and a late time constant, when one partial carries two rates. */
  twoStage: z.object({ earlyTauS: z.number(), lateTauS: z.number(), kneeS: z.number() }).nullable().optional(),
  /** Time range (from the file start) over which the decay was fitted, s. */
  fitStartS: z.number(),
  fitEndS: z.number(),
  /** True when τ, T60 and Q are not reliable: the partial decayed less than 3 dB within the
   *  recording (τ needs a longer recording), or its decay is not exponential (nonExponential). */
  tauUnreliable: z.boolean(),
  /** True when the isolated band's envelope parts from the fitted decay by more than the check's
   *  tolerance (1.5 dB RMS): the decay is not exponential, so no single τ describes it. */
  nonExponential: z.boolean().optional(),
  /** True when a faster early stage (the room's early energy, a damped start) overlaps the whole
   *  measurable decay, so the unit's own decay is never seen alone: τ, T60 and Q are unreliable. */
  earlyStageOverlap: z.boolean().optional(),
  /** True when the room's reverberation (read from the strike's broadband sound) lasts nearly as long
   *  as this partial's decay, so the two cannot be told apart: τ, T60 and Q are unreliable. */
  roomMasked: z.boolean().optional(),
  /** RMS difference between the band's envelope and the model's, dB, over the fit window. */
  envelopeDeviationDb: z.number().optional(),
  /** How far the partial's envelope fell within the fit window, dB: the decay the recording saw.
   *  T60 (60 dB) is extrapolated from it. */
  observedDecayDb: z.number().optional(),
  /** Standard uncertainty of τ from model error (k = 1), s: the envelope's deviation beyond noise,
   *  read as a slope error. Add it in quadrature to tauUncertaintyS. */
  tauModelUncertaintyS: z.number().optional(),
  /** Signal-to-noise ratio of this partial at the fit start, dB. */
  snrDb: z.number().optional(),
});
export type Partial = z.infer<typeof partialSchema>;

/** Decimated series for plots (at most a few thousand points each). */
export const plotSchema = z.object({
  /** Spectrum of the analysed segment: frequency (Hz) and magnitude (dBFS), same length. */
  spectrum: z.object({ frequencyHz: z.array(z.number()), magnitudeDb: z.array(z.number()), noiseFloorDb: z.array(z.number()) }),
  /** Per partial (same order as partials): the spectrum at full resolution within ±200 cents, for zooming in. */
  bands: z.array(z.object({ frequencyHz: z.array(z.number()), magnitudeDb: z.array(z.number()) })).optional(),
  /** Frequencies recognised as mains hum and ignored, Hz. */
  humHz: z.array(z.number()),
  /** Per partial (same order as partials): envelope (dBFS) against time (s from the file start). */
  envelopes: z.array(z.object({ timeS: z.array(z.number()), levelDb: z.array(z.number()), noiseFloorDb: z.number() })),
});
export type StrikePlot = z.infer<typeof plotSchema>;

export const strikeResultSchema = z.object({
  onsetS: z.number(),
  /** Partials sorted by frequency, ascending. */
  partials: z.array(partialSchema),
  noiseFloorDb: z.number(),
  plot: plotSchema.optional(),
});
export type StrikeResult = z.infer<typeof strikeResultSchema>;

export const analysisResultSchema = z.object({
  analyserVersion: z.string(),
  sampleRate: z.number(),
  channels: z.number(),
  bitsPerSample: z.number(),
  encoding: z.string(),
  durationS: z.number(),
  warnings: z.array(warningSchema),
  strikes: z.array(strikeResultSchema),
});
export type AnalysisResult = z.infer<typeof analysisResultSchema>;

/** Why a file could not be analysed; `message` is for the maker, in plain words. */
export const analysisFailureCodes = [
  "not_wav",
  "truncated",
  "no_audio",
  "unsupported_encoding",
  "too_large",
  "bad_format",
  "silence",
] as const;
export type AnalysisFailureCode = (typeof analysisFailureCodes)[number];
