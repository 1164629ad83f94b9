/**
 * The pipeline: decode → validate → condition → segment strikes → find partials →
 * refine each partial → classify → report. Pure: bytes in, numbers out.
 */
import type { AnalysisResult, AnalysisWarning, Partial, StrikePlot, StrikeResult } from "../../shared/schemas/analysis";
import { AnalysisInputError } from "./errors";
import { nextPow2, realDft } from "./fft";
import { judgeHum, leadInAmplitude, leadInEvidence, type SteadyLine } from "./hum";
import { refinePartial, type RefinedPartial } from "./partial";
import { roomDecay } from "./room";
import { findOnsets } from "./segment";
import { findPeaks, quickSelect, windowedSpectrum, type SpectralPeak, type Spectrum } from "./spectrum";
import { decodeWav } from "./wav";

export const ANALYSER_VERSION = "1.1.0";

/** Where the time went, ms (filled when passed to analyzeWavTimed). */
export interface AnalysisTimings {
  decodeMs: number;
  segmentMs: number;
  fftMs: number;
  refineMs: number;
  totalMs: number;
  partials: number;
}

const MAX_PARTIALS = 24;
/** Peaks must stand this far above the local noise floor, dB. The largest of ~10⁴ noise-only
 *  periodogram bins sits ≈ 10 dB above the mean (exponential statistics), so 15 dB keeps noise out. */
const PEAK_PROMINENCE_DB = 15;
const PEAK_RANGE_DB = 70;
const MIN_PARTIAL_HZ = 20;
/** A partial must ring for at least 10 cycles per time constant (Q = π·f·τ ≥ 10π ≈ 31): anything
 *  shorter is the thud of the strike or a resonance of the surroundings, not a mode of the unit.
 *  Our threshold (struck metal partials have Q in the hundreds to thousands). */
const MIN_Q = 10 * Math.PI;
/** Longest segment used for refinement, samples (bounds memory and FFT size: 2^22 points). */
const MAX_SEGMENT = 3_800_000;
const LOW_RATE_HZ = 22050;
const LOW_LEVEL_DBFS = -40;
const DC_LIMIT = 0.005;
/** A partial whose τ is under this many of the room's time constants is masked by the room
 *  (our threshold: the room's share of the band falls 40 dB only after about 2.3 room time
 *  constants more than the partial's own, so shorter decays are never seen alone). */
const ROOM_MASK_FACTOR = 3;
const DB_PER_NEPER = 20 / Math.LN10;

const now = () => performance.now();

/** Analyses a WAV file. Throws AnalysisInputError when the file cannot be analysed. */
export function analyzeWavTimed(bytes: Uint8Array, options: { plot?: boolean } = {}, timings?: AnalysisTimings): AnalysisResult {
  const t0 = now();
  const decoded = decodeWav(bytes);
  const { layout, mono, channelStats } = decoded;
  const fs = layout.sampleRate;
  const t1 = now();
  const warnings: AnalysisWarning[] = [];
  const warn = (code: AnalysisWarning["code"], message: string) => {
    if (!warnings.some((w) => w.code === code)) warnings.push({ code, message });
  };

  const peak = Math.max(...channelStats.map((c) => c.peak));
  if (peak === 0 || peak < 1e-9) {
    throw new AnalysisInputError(
      "silence",
      "The recording is digital silence (every sample is zero). Check that the microphone is connected, selected and not muted, then record the strike again.",
    );
  }

  // Condition: remove DC (mean of the mix).
  let mean = 0;
  for (let i = 0; i < mono.length; i++) mean += mono[i];
  mean /= mono.length;
  for (let i = 0; i < mono.length; i++) mono[i] -= mean;
  const worstDc = Math.max(...channelStats.map((c) => Math.abs(c.mean)));
  if (worstDc > DC_LIMIT) {
    warn("dc_offset", `The recording has a DC offset of ${(100 * worstDc).toFixed(1)} % of full scale; it was removed before analysis. A faulty or unsuitable microphone input usually causes this.`);
  }
  if (fs < LOW_RATE_HZ) {
    warn("low_sample_rate", `The sample rate is only ${fs} Hz, so partials above ${Math.round(0.45 * fs)} Hz cannot be measured. Record at 44.1 kHz or 48 kHz.`);
  }
  const peakDb = 20 * Math.log10(peak);
  if (peakDb < LOW_LEVEL_DBFS) {
    warn("low_level", `The recording is very quiet (peak ${peakDb.toFixed(0)} dBFS). Move the microphone closer or raise the input gain, keeping the peak below full scale.`);
  }
  if (decoded.clippedRuns > 0) {
    warn("clipped", `The recording is clipped (${decoded.clippedRuns} run${decoded.clippedRuns === 1 ? "" : "s"} of samples at full scale, the last at ${(decoded.lastClippedFrame / fs).toFixed(2)} s); only the part after the clipping was analysed. Lower the input gain or strike more gently and record again.`);
  }
  if (decoded.flatTopRuns > 0) {
    const levelDb = 20 * Math.log10(decoded.flatTopLevel);
    warn(
      "flat_topped",
      `The recording has flat tops at its own loudest level (${levelDb.toFixed(1)} dBFS, ${decoded.flatTopRuns} run${decoded.flatTopRuns === 1 ? "" : "s"} of equal samples, the last at ${(decoded.lastFlatTopFrame / fs).toFixed(2)} s): it clipped before it was saved — in the microphone preamp or the recorder's input, or it was clipped and then turned down — even though it never reaches full scale. Clipping adds partials that are not in the metal, so only the part after the clipping was analysed. Turn the input gain or the microphone's sensitivity down, switch off any limiter or automatic gain, strike more gently, and record again.`,
    );
  }
  if (layout.channels > 1) {
    const rmsDb = channelStats.map((c) => 20 * Math.log10(c.rms + 1e-12));
    const worstCorr = Math.min(...channelStats.map((c) => c.correlationWithFirst));
    const spread = Math.max(...rmsDb) - Math.min(...rmsDb);
    if (worstCorr < 0.5 || spread > 10) {
      warn("channels_disagree", `The ${layout.channels} channels differ (correlation ${worstCorr.toFixed(2)}, levels ${spread.toFixed(0)} dB apart); their mix was analysed. Record in mono, or check that both microphones hear the strike.`);
    }
  }

  const seg = findOnsets(mono, fs);
  const t2 = now();
  let fftMs = 0;
  let refineMs = 0;
  let partialCount = 0;
  const strikes: StrikeResult[] = [];
  const humSeen = new Set<number>();
  let humFamilyHz: 50 | 60 | null = null;
  const unreliable: number[] = [];
  const notExponential: number[] = [];
  const overlap: number[] = [];
  const masked: Array<{ hz: number; rt60S: number }> = [];
  // No rise found: the recording may have started after the strike (or hold only noise). Analyse
  // it as one strike from the start; if nothing rings in it, it is noise.
  const assumedStrike = seg.onsets.length === 0;
  if (assumedStrike) {
    // Start where the level first comes within 10 dB of its maximum (skips a quiet lead-in).
    const max = Math.max(...seg.levelDb);
    const f = Math.max(0, seg.levelDb.findIndex((l) => l >= max - 10));
    seg.onsets.push(f * seg.hop);
  }
  // The lead-in (before the first strike, less 5 ms) is where hum shows itself without the unit.
  // Without a rise there is no lead-in: the recording may have started after the strike.
  const leadInEnd = assumedStrike ? 0 : Math.max(0, seg.onsets[0] - Math.round(0.005 * fs));
  for (let s = 0; s < seg.onsets.length; s++) {
    const onset = seg.onsets[s];
    const segEnd = s + 1 < seg.onsets.length ? seg.onsets[s + 1] : mono.length;
    let analysisStart = onset;
    for (const [a, b] of decoded.clipRegions) if (b >= onset && a < segEnd) analysisStart = Math.max(analysisStart, b + 1);
    // The strike transient: until the level peaks (plus one frame), at least 10 ms, at most 60 ms.
    const f0 = Math.floor(onset / seg.hop);
    let fPeak = f0;
    for (let f = f0; f < Math.min(seg.levelDb.length, f0 + Math.round(0.06 * fs / seg.hop)); f++) if (seg.levelDb[f] > seg.levelDb[fPeak]) fPeak = f;
    const transientEnd = Math.min(onset + Math.round(0.06 * fs), Math.max(onset + Math.round(0.01 * fs), (fPeak + 2) * seg.hop));
    const fitStart = Math.max(analysisStart, transientEnd);
    const available = segEnd - fitStart;
    const ta = now();
    const result: StrikeResult = { onsetS: onset / fs, partials: [], noiseFloorDb: seg.quietDb };
    if ((segEnd - analysisStart) / fs < 0.5 || available < 512) {
      warn("short_recording", `A strike at ${(onset / fs).toFixed(2)} s was recorded for only ${(Math.max(0, segEnd - onset) / fs).toFixed(2)} s after the strike${analysisStart > onset ? " (after clipping)" : ""}. Record at least 2 s after each strike so the decay can be measured.`);
    }
    if (available < 512) {
      strikes.push(result);
      continue;
    }
    // Peak-finding window ≈ 0.34 s at 48 kHz: enough to separate partials a few Hz apart (closer ones
    // are resolved by the two-mode fit), short enough to keep this FFT cheap.
    const lp = Math.min(available, nextPow2(Math.round(fs * 0.25)));
    const spec = windowedSpectrum(mono, fitStart, lp, fs);
    result.noiseFloorDb = round(broadbandNoiseDb(spec), 2);
    const peakOptions = {
      minProminenceDb: PEAK_PROMINENCE_DB,
      rangeDb: PEAK_RANGE_DB,
      minHz: Math.max(MIN_PARTIAL_HZ, (3 * fs) / spec.size),
      maxHz: Math.min(0.45 * fs, 30000),
      maxPeaks: 2 * MAX_PARTIALS,
    };
    const peaks = findPeaks(spec, peakOptions);
    // The strike segment for refinement, zero-padded so the band filters do not wrap around.
    const segLen = Math.min(segEnd - analysisStart, MAX_SEGMENT);
    const M = nextPow2(Math.ceil(segLen * 1.07));
    const X = realDft(mono.subarray(analysisStart, analysisStart + segLen), M);
    const tb = now();
    fftMs += tb - ta;

    const refined: RefinedPartial[] = [];
    // Lines that do not decay (or barely: under 3 dB over the strike) are judged together once all
    // groups are refined: hum needs the family and the lead-in, not one line's frequency.
    const lines: Array<{ line: SteadyLine; candidate: RefinedPartial | null }> = [];
    const leadIn = (fHz: number) => (leadInEnd > 0 ? leadInAmplitude(mono, 0, leadInEnd, fs, fHz) : null);
    /** Refines the groups of `list` (peaks of spectrum `sp`); returns how many bands held no
     *  measurable partial (noise, or a decay the band could not follow). */
    const refineAll = (list: SpectralPeak[], sp: Spectrum, budget: number, context: SpectralPeak[] = list): number => {
      let unresolved = 0;
      const groups = groupPeaks(list.map((p) => p.frequencyHz));
      const powerOf = new Map(list.map((p) => [p.frequencyHz, p.powerDb]));
      const binHz = sp.sampleRate / sp.size;
      for (const group of groups.slice(0, budget)) {
        // Neighbours that limit the band: peaks outside the group no more than 20 dB weaker. Weaker
        // ones inside the band act as a little extra noise; excluding them would shrink the band
        // until too few samples remain.
        const level = Math.max(...group.map((f) => powerOf.get(f)!));
        const others = context.filter((p) => !group.includes(p.frequencyHz) && p.powerDb >= level - 20).map((p) => p.frequencyHz);
        const lo = Math.min(...group);
        const hi = Math.max(...group);
        const neighbourHz = others.length ? Math.min(...others.map((f) => (f < lo ? lo - f : f > hi ? f - hi : 0))) : Infinity;
        // White noise of variance σ² per sample gives E|X[k]|² = σ²·Σw² in the Hann spectrum.
        const noisePower = sp.floor[Math.min(sp.floor.length - 1, Math.round(group[0] / binHz))] / sp.windowSumSq;
        const r = refinePartial({ X, M, sampleRate: fs, segStart: analysisStart, segLen, onsetSample: onset, fitStartSample: fitStart, peaksHz: group, neighbourHz, noisePower });
        if (r === "unresolved") unresolved++;
        if (!r || r === "unresolved") continue;
        const p = r.partial;
        // Without a finite fit and covariance there is no measurement to report.
        if (![p.frequencyHz, p.tauS, p.amplitudeDb, p.frequencyUncertaintyHz, p.tauUncertaintyS].every(Number.isFinite)) continue;
        if ((p.snrDb ?? 0) < 6) continue;
        // A band whose envelope parts erratically from every model holds noise (a room's diffuse
        // tail excited by the strike, the thud), not a ringing mode.
        if (r.noiseLike) {
          unresolved++;
          continue;
        }
        if (r.steadyLine) lines.push({ line: { ...r.steadyLine, leadIn: leadInEvidence(leadIn(r.steadyLine.frequencyHz), r.steadyLine.amplitudeDb) }, candidate: null });
        const steady = !(r.alpha > 3 * r.alphaUncertainty) || r.alpha <= 0;
        const decayDb = (20 / Math.LN10) * r.alpha * ((analysisStart + segLen) / fs - onset / fs);
        if (steady || decayDb < 3) {
          lines.push({ line: { frequencyHz: p.frequencyHz, frequencyUncertaintyHz: p.frequencyUncertaintyHz, amplitudeDb: p.amplitudeDb, leadIn: leadInEvidence(leadIn(p.frequencyHz), p.amplitudeDb) }, candidate: steady || p.tauS <= 0 || p.q < MIN_Q ? null : r });
          continue;
        }
        if (p.tauS <= 0) continue;
        if (p.q < MIN_Q) continue;
        refined.push(r);
      }
      return unresolved;
    };
    const unresolved = refineAll(peaks, spec, MAX_PARTIALS);
    // A second look, later: in a reverberant room the first window holds the room's early energy,
    // whose random spectrum splits a partial into several peaks (bands too narrow to measure). In
    // the next window the room has died down and the partials stand out; peaks there that no
    // measured partial explains are refined too.
    if (unresolved > 0 && available >= 2 * lp) {
      const spec2 = windowedSpectrum(mono, fitStart + lp, lp, fs);
      const have = () => [...refined.map((r) => r.partial.frequencyHz), ...lines.map((l) => l.line.frequencyHz)];
      const fresh = findPeaks(spec2, peakOptions).filter((q) => !have().some((f) => Math.abs(f - q.frequencyHz) < 4 * (fs / lp)));
      // Neighbours from both windows limit the bands (levels compared within each spectrum's own scale).
      if (fresh.length) refineAll(fresh, spec2, Math.max(0, MAX_PARTIALS - refined.length), [...fresh, ...findPeaks(spec2, peakOptions)]);
    }
    const judged = judgeHum(lines.map((l) => l.line));
    lines.forEach((l, i) => {
      if (judged.hum[i]) {
        humSeen.add(round(l.line.frequencyHz, 1));
        humFamilyHz = humFamilyHz ?? judged.mainsHz;
      } else if (l.candidate) refined.push(l.candidate); // a slow partial, not hum: the unit rings longer than the recording
    });
    // A hard-walled room: where a partial showed an early stage, read the room's own decay from
    // the strike's broadband sound. It counts only when a partial that outlasts the room shows the
    // room's early energy too (a faster companion within a factor of 3 of the room's time constant): the
    // broadband sound may also be the unit's own dense, fast high modes. A partial that dies away
    // within about three of the room's time constants is then heard through the room's
    // reverberation for its whole measurable decay: its τ and any "beat" are the room's as much
    // as the unit's.
    if (refined.some((r) => r.fastCompanion)) {
      const room = roomDecay(mono, onset, segEnd, fs, peaks.map((q) => q.frequencyHz));
      const seen = room && refined.some((r) => r.partial.tauS >= 4 * room.tauS && r.fastCompanionTauS > room.tauS / 3 && r.fastCompanionTauS < 3 * room.tauS);
      if (room && seen) {
        for (let i = 0; i < refined.length; i++) {
          const r = refined[i];
          if (!(r.partial.tauS < ROOM_MASK_FACTOR * room.tauS)) {
            // Outlasting the room: fit again from where the room's early energy (taken as up to
            // 6 dB above the partial: DRR −6 dB) has fallen 46 dB below it, when the recording
            // still holds the partial there; the amplitude stays referred to the strike.
            const skip = (46 / DB_PER_NEPER) / (1 / room.tauS - 1 / r.partial.tauS);
            const from = Math.round(onset + skip * fs);
            if (!(from > fitStart) || r.partial.fitStartS * fs >= from) continue;
            const again = refinePartial({ ...r.request, fitStartSample: from, amplitudeAtSample: fitStart });
            if (again && again !== "unresolved" && !again.noiseLike && again.partial.tauS > 0 && Number.isFinite(again.partial.tauUncertaintyS)) refined[i] = again;
            continue;
          }
          r.partial = { ...r.partial, roomMasked: true, tauUnreliable: true, beatHz: null, modes: undefined };
          masked.push({ hz: r.partial.frequencyHz, rt60S: room.rt60S });
        }
      }
    }
    // The same partial reached from two peaks: keep the stronger.
    const kept: RefinedPartial[] = [];
    for (const r of [...refined].sort((a, b) => b.partial.amplitudeDb - a.partial.amplitudeDb)) {
      const dup = kept.some((k) => Math.abs(k.partial.frequencyHz - r.partial.frequencyHz) < Math.max(0.5, 3 * (k.partial.frequencyUncertaintyHz + r.partial.frequencyUncertaintyHz)));
      if (!dup) kept.push(r);
    }
    kept.sort((a, b) => a.partial.frequencyHz - b.partial.frequencyHz);
    result.partials = kept.map((k) => cleanPartial(k.partial));
    for (const k of kept) {
      if (k.partial.roomMasked) continue;
      if (k.partial.earlyStageOverlap) overlap.push(k.partial.frequencyHz);
      else if (k.partial.nonExponential) notExponential.push(k.partial.frequencyHz);
      else if (k.partial.tauUnreliable) unreliable.push(k.partial.frequencyHz);
    }
    partialCount += kept.length;
    if (options.plot) result.plot = makePlot(spec, [...humSeen], kept);
    if (kept.length === 0) warn("no_partials", "No partials clear of the noise were found in a strike. Strike the unit more firmly or move the microphone closer.");
    refineMs += now() - tb;
    strikes.push(result);
  }
  if (assumedStrike && strikes.every((s) => s.partials.length === 0)) {
    strikes.length = 0;
    warnings.splice(0, warnings.length, ...warnings.filter((w) => w.code !== "no_partials" && w.code !== "short_recording"));
    warn("noise_only", "No strike was found: the recording holds only noise or steady tones (nothing rises above the background and rings down). Strike the unit within the recording, close to the microphone.");
    warn("no_partials", "No partials were found, so nothing was measured.");
  }
  if (humSeen.size > 0) {
    const list = [...humSeen].sort((a, b) => a - b);
    const mains = humFamilyHz ?? 50;
    warn("hum", `Mains hum (${mains} Hz family: ${list.slice(0, 6).map((f) => f.toFixed(1)).join(", ")} Hz) was found and ignored. Keep mains cables, chargers and transformers away from the microphone.`);
  }
  if (unreliable.length > 0) {
    const list = [...new Set(unreliable.map((f) => f.toFixed(1)))];
    warn("tau_unreliable", `The partial${list.length > 1 ? "s" : ""} at ${list.slice(0, 6).join(", ")} Hz decayed less than 3 dB during the recording, so τ, T60 and Q are not reliable there: a longer recording is needed (keep recording until the ringing has clearly died down).`);
  }
  if (notExponential.length > 0) {
    const list = [...new Set(notExponential.map((f) => f.toFixed(1)))];
    const one = list.length === 1;
    warn(
      "not_exponential",
      `The decay of the partial${one ? "" : "s"} at ${list.slice(0, 6).join(", ")} Hz is not exponential: ${one ? "its" : "their"} level does not fall along a straight line in dB (a fade, a hand or stand damping the unit and then letting go, or something touching it), so no single τ, T60 or Q describes ${one ? "it" : "them"} and they are marked unreliable. Let the unit ring freely on its usual support, with nothing touching it, and record the strike again; an edited or faded file cannot be measured.`,
    );
  }
  if (masked.length > 0) {
    const list = [...new Set(masked.map((m) => m.hz.toFixed(1)))];
    const rt = Math.max(...masked.map((m) => m.rt60S));
    const one = list.length === 1;
    warn(
      "reverberant_room",
      `The room rings on for about ${rt.toFixed(1)} s (its reverberation time, read from the strike's own sound), nearly as long as the partial${one ? "" : "s"} at ${list.slice(0, 6).join(", ")} Hz: ${one ? "its" : "their"} decay cannot be told apart from the room's, so τ, T60 and Q are marked unreliable there and no beat is reported. Record with the microphone much closer to the unit (a hand's width), away from bare walls and hard benches, or hang blankets or foam panels around the recording place.`,
    );
  }
  if (overlap.length > 0) {
    const list = [...new Set(overlap.map((f) => f.toFixed(1)))];
    const one = list.length === 1;
    warn(
      "early_decay_overlap",
      `The partial${one ? "" : "s"} at ${list.slice(0, 6).join(", ")} Hz start${one ? "s" : ""} with a faster early decay that lasts through the whole measurable decay, so the unit's own decay is never heard alone and τ, T60 and Q are marked unreliable there. In a hard-walled room this is the room's early reflections; otherwise a hand or support damping the unit at first. Record closer to the unit, away from walls, and let it ring freely.`,
    );
  }
  const t3 = now();
  if (timings) {
    timings.decodeMs += t1 - t0;
    timings.segmentMs += t2 - t1;
    timings.fftMs += fftMs;
    timings.refineMs += refineMs;
    timings.totalMs += t3 - t0;
    timings.partials += partialCount;
  }
  return {
    analyserVersion: ANALYSER_VERSION,
    sampleRate: fs,
    channels: layout.channels,
    bitsPerSample: layout.bitsPerSample,
    encoding: layout.encoding,
    durationS: layout.durationS,
    warnings,
    strikes,
  };
}

/** Broadband noise RMS, dB re full scale, from the spectrum's median (robust to the partials). */
function broadbandNoiseDb(s: Spectrum): number {
  const lo = Math.ceil((20 * s.size) / s.sampleRate);
  const hi = Math.min(s.power.length - 1, Math.floor(0.45 * s.size));
  const tmp = new Float64Array(Math.max(1, Math.floor((hi - lo) / 4)));
  let m = 0;
  for (let k = lo; k < hi && m < tmp.length; k += 4) tmp[m++] = s.power[k];
  const med = quickSelect(tmp.subarray(0, m), m >> 1);
  // E|X[k]|² = σ²·Σw² for white noise; the median of that exponential variable is ln 2 times it.
  return 10 * Math.log10(med / Math.LN2 / s.windowSumSq + 1e-30);
}

/** Close peaks (a doublet the FFT resolved) are analysed together: pairs within max(8 Hz, 0.5 %). */
function groupPeaks(freqs: number[]): number[][] {
  // `freqs` arrive strongest first; keep that order for the groups.
  const used = new Set<number>();
  const groups: number[][] = [];
  for (let i = 0; i < freqs.length; i++) {
    if (used.has(i)) continue;
    used.add(i);
    const f = freqs[i];
    let partner = -1;
    for (let j = 0; j < freqs.length; j++) {
      if (used.has(j)) continue;
      if (Math.abs(freqs[j] - f) <= Math.max(8, 0.005 * f)) {
        partner = j;
        break;
      }
    }
    if (partner >= 0) {
      used.add(partner);
      groups.push([f, freqs[partner]]);
    } else groups.push([f]);
  }
  return groups;
}

/** JSON has no NaN or Infinity: a secondary figure that is not finite (fitR2, snrDb) becomes 0. */
function cleanPartial(p: Partial): Partial {
  const out: Partial = { ...p };
  for (const key of Object.keys(out) as Array<keyof Partial>) {
    const v = out[key];
    if (typeof v === "number" && !Number.isFinite(v)) (out as Record<string, unknown>)[key] = 0;
  }
  return out;
}

function makePlot(s: Spectrum, humHz: number[], kept: RefinedPartial[]): StrikePlot {
  const n = s.power.length;
  const points = Math.min(2000, n);
  const per = n / points;
  const gain = 20 * Math.log10(2 / s.windowSum); // a full-scale sine peaks at 0 dBFS
  const frequencyHz: number[] = [];
  const magnitudeDb: number[] = [];
  const noiseFloorDb: number[] = [];
  for (let b = 0; b < points; b++) {
    const lo = Math.floor(b * per);
    const hi = Math.max(lo + 1, Math.floor((b + 1) * per));
    let best = lo;
    let fl = 0;
    for (let k = lo; k < hi; k++) {
      if (s.power[k] > s.power[best]) best = k;
      fl += s.floor[k];
    }
    frequencyHz.push(round((best * s.sampleRate) / s.size, 3));
    magnitudeDb.push(round(10 * Math.log10(s.power[best] + 1e-30) + gain, 2));
    noiseFloorDb.push(round(10 * Math.log10(fl / (hi - lo) + 1e-30) + gain, 2));
  }
  return { spectrum: { frequencyHz, magnitudeDb, noiseFloorDb }, bands: kept.map((k) => band(s, k.partial.frequencyHz, gain)), humHz: humHz.sort((a, b) => a - b), envelopes: kept.map((k) => k.envelope) };
}

/** Cents either side of a partial kept at full resolution, so a zoomed spectrum can show a doublet. */
const BAND_CENTS = 200;
const BAND_POINTS = 400;

/** The spectrum at full bin resolution within ±BAND_CENTS of fHz, peak-bucketed to BAND_POINTS at most. */
function band(s: Spectrum, fHz: number, gain: number): { frequencyHz: number[]; magnitudeDb: number[] } {
  const k = 2 ** (BAND_CENTS / 1200);
  const binHz = s.sampleRate / s.size;
  const lo = Math.max(1, Math.floor(fHz / k / binHz));
  const hi = Math.min(s.power.length - 1, Math.ceil((fHz * k) / binHz));
  const per = Math.max(1, (hi - lo + 1) / BAND_POINTS);
  const frequencyHz: number[] = [];
  const magnitudeDb: number[] = [];
  for (let b = lo; b <= hi; ) {
    const end = Math.min(hi + 1, Math.max(b + 1, Math.floor(lo + (frequencyHz.length + 1) * per)));
    let best = b;
    for (let i = b; i < end; i++) if (s.power[i] > s.power[best]) best = i;
    frequencyHz.push(round(best * binHz, 4));
    magnitudeDb.push(round(10 * Math.log10(s.power[best] + 1e-30) + gain, 2));
    b = end;
  }
  return { frequencyHz, magnitudeDb };
}

function round(v: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}
