/**
 * WAV (RIFF/WAVE) header parsing and sample decoding.
 *
 * Why our own decoder rather than wavefile at run time: wavefile needs ~15 ms to decode a 5 s
 * 48 kHz file (a third of the analysis budget) and trusts chunk sizes; this one decodes straight
 * into the mono mix while measuring clipping, DC and channel agreement in the same pass, and
 * bounds-checks every chunk so mutated files end in a clear AnalysisInputError. It is checked
 * against wavefile, node-wav and files written by Debian's sox in tests/reference/wav.test.ts.
 */
import { AnalysisInputError } from "./errors";

export type SampleEncoding = "pcm" | "float";

export interface WavHeader {
  sampleRate: number;
  channels: number;
  bitsPerSample: number;
  encoding: SampleEncoding;
  /** Bytes in the data chunk as declared by the header. */
  dataBytes: number;
  durationS: number;
}

export interface WavLayout extends WavHeader {
  /** Byte offset of the first sample. */
  dataOffset: number;
  blockAlign: number;
  frames: number;
}

/** Longest recording accepted, s: bounds the work per file (a strike needs seconds, not hours). */
export const MAX_DURATION_S = 600;
/** Largest data chunk accepted, bytes (1 GiB). */
export const MAX_DATA_BYTES = 1 << 30;
/** Most frames accepted (2^24 ≈ 5.8 min at 48 kHz): bounds the decoder's memory (~130 MB a buffer). */
export const MAX_FRAMES = 1 << 24;
const MIN_SAMPLE_RATE = 2000;
const MAX_SAMPLE_RATE = 768000;
const MAX_CHANNELS = 8;

const WAVE_FORMAT_PCM = 0x0001;
const WAVE_FORMAT_IEEE_FLOAT = 0x0003;
const WAVE_FORMAT_EXTENSIBLE = 0xfffe;
const KNOWN_COMPRESSED: Record<number, string> = {
  0x0002: "Microsoft ADPCM",
  0x0006: "A-law",
  0x0007: "µ-law",
  0x0011: "IMA ADPCM",
  0x0031: "GSM 6.10",
  0x0055: "MP3",
  0x00ff: "AAC",
};

const EXPORT_HINT = "Export the strike as an uncompressed WAV (PCM 16/24-bit or 32-bit float) and upload it again.";

function fourcc(bytes: Uint8Array, at: number): string {
  return String.fromCharCode(bytes[at], bytes[at + 1], bytes[at + 2], bytes[at + 3]);
}

/**
 * Reads and checks the RIFF/WAVE header, the fmt chunk and the start of the data chunk. Works on a
 * prefix of the file (the upload route can pass the first few kB); pass `fileSize` to also check
 * that the data chunk fits in the file. Throws AnalysisInputError with a message for the maker.
 */
export function readWavHeader(bytes: Uint8Array, opts?: { fileSize?: number }): WavHeader {
  const l = parseWavLayout(bytes, opts?.fileSize ?? Infinity);
  return {
    sampleRate: l.sampleRate,
    channels: l.channels,
    bitsPerSample: l.bitsPerSample,
    encoding: l.encoding,
    dataBytes: l.dataBytes,
    durationS: l.durationS,
  };
}

/**
 * Full layout (offsets) of a WAV file. `fileSize` defaults to bytes.length (the whole file);
 * Infinity means "bytes is a prefix of unknown length" (no check that the data chunk fits).
 */
export function parseWavLayout(bytes: Uint8Array, fileSize?: number): WavLayout {
  const isPrefix = fileSize !== undefined && fileSize > bytes.length;
  const total = fileSize ?? bytes.length;
  if (bytes.length < 12) {
    if (bytes.length >= 4 && fourcc(bytes, 0) === "RIFF") {
      throw new AnalysisInputError("truncated", "The WAV file is cut off inside its header. The upload or copy was probably interrupted; export the strike again.");
    }
    throw new AnalysisInputError("not_wav", "This file is not a WAV recording (no RIFF/WAVE header). Export the strike as WAV and upload it again.");
  }
  const riff = fourcc(bytes, 0);
  const wave = fourcc(bytes, 8);
  if (riff === "RF64" || riff === "BW64") {
    throw new AnalysisInputError("unsupported_encoding", `This is an RF64/BW64 file (a WAV variant for files over 4 GB), which Tinelog does not read. ${EXPORT_HINT}`);
  }
  if (riff !== "RIFF" || wave !== "WAVE") {
    const looksText = isMostlyText(bytes.subarray(0, Math.min(bytes.length, 512)));
    throw new AnalysisInputError(
      "not_wav",
      looksText
        ? "This file is text, not a WAV recording (no RIFF/WAVE header), even though its name may end in .wav. Export the strike as WAV and upload it again."
        : "This file is not a WAV recording (no RIFF/WAVE header). Export the strike as WAV and upload it again.",
    );
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let at = 12;
  let fmt: { tag: number; channels: number; sampleRate: number; blockAlign: number; bits: number; subTag: number | null } | null = null;
  // Chunk walk: every chunk is id(4) + size(4) + body, padded to an even length (RIFF, Microsoft
  // Multimedia Programming Interface and Data Specifications 1.0, 1991).
  for (let chunks = 0; chunks < 1000; chunks++) {
    if (at + 8 > bytes.length) {
      if (isPrefix || at + 8 <= total) {
        throw new AnalysisInputError("truncated", "The WAV header could not be read completely from the start of the file. Export the strike again without extra metadata.");
      }
      throw new AnalysisInputError(
        fmt ? "no_audio" : "bad_format",
        fmt
          ? "The WAV file has no data chunk, so it holds no audio. Record the strike again."
          : "The WAV file has no fmt chunk describing its samples. " + EXPORT_HINT,
      );
    }
    const id = fourcc(bytes, at);
    const size = view.getUint32(at + 4, true);
    const body = at + 8;
    if (id === "fmt ") {
      if (size < 16 || body + 16 > bytes.length) {
        throw new AnalysisInputError("bad_format", "The WAV fmt chunk is too short to describe the samples. " + EXPORT_HINT);
      }
      const tag = view.getUint16(body, true);
      let subTag: number | null = null;
      if (tag === WAVE_FORMAT_EXTENSIBLE) {
        if (size < 40 || body + 40 > bytes.length) {
          throw new AnalysisInputError("bad_format", "The WAV fmt chunk says WAVE_FORMAT_EXTENSIBLE but is too short to name the sample format. " + EXPORT_HINT);
        }
        subTag = view.getUint16(body + 24, true); // first two bytes of the SubFormat GUID
      }
      fmt = {
        tag,
        channels: view.getUint16(body + 2, true),
        sampleRate: view.getUint32(body + 4, true),
        blockAlign: view.getUint16(body + 12, true),
        bits: view.getUint16(body + 14, true),
        subTag,
      };
    } else if (id === "data") {
      if (!fmt) {
        throw new AnalysisInputError("bad_format", "The WAV data chunk comes before any fmt chunk, so the samples cannot be interpreted. " + EXPORT_HINT);
      }
      return finishLayout(fmt, body, size, total);
    }
    const next = body + size + (size & 1);
    if (next > total) {
      throw new AnalysisInputError("truncated", `The WAV file ends inside its "${printable(id)}" chunk before any audio data. The upload or copy was probably cut short; export the strike again.`);
    }
    at = next;
  }
  throw new AnalysisInputError("bad_format", "The WAV file has too many chunks before its audio data. " + EXPORT_HINT);
}

function finishLayout(
  fmt: { tag: number; channels: number; sampleRate: number; blockAlign: number; bits: number; subTag: number | null },
  dataOffset: number,
  dataBytes: number,
  total: number,
): WavLayout {
  const effective = fmt.tag === WAVE_FORMAT_EXTENSIBLE ? (fmt.subTag ?? -1) : fmt.tag;
  let encoding: SampleEncoding;
  if (effective === WAVE_FORMAT_PCM) encoding = "pcm";
  else if (effective === WAVE_FORMAT_IEEE_FLOAT) encoding = "float";
  else {
    const name = KNOWN_COMPRESSED[effective];
    throw new AnalysisInputError(
      "unsupported_encoding",
      `This WAV file uses ${name ? `${name} compression` : `an encoding Tinelog does not read (format tag 0x${effective.toString(16).padStart(4, "0")})`}. Tinelog reads uncompressed PCM (8, 16, 24 or 32-bit) and 32/64-bit float. ${EXPORT_HINT}`,
    );
  }
  if (fmt.channels < 1) {
    throw new AnalysisInputError("bad_format", "The WAV header says the file has 0 channels. The file is damaged; export the strike again.");
  }
  if (fmt.channels > MAX_CHANNELS) {
    throw new AnalysisInputError("unsupported_encoding", `The WAV file has ${fmt.channels} channels; Tinelog reads 1 to ${MAX_CHANNELS}. Export a mono or stereo WAV and upload it again.`);
  }
  const okBits = encoding === "pcm" ? [8, 16, 24, 32] : [32, 64];
  if (!okBits.includes(fmt.bits)) {
    throw new AnalysisInputError(
      "unsupported_encoding",
      `The WAV file stores ${fmt.bits}-bit ${encoding === "pcm" ? "PCM" : "float"} samples; Tinelog reads ${encoding === "pcm" ? "8, 16, 24 or 32-bit PCM" : "32 or 64-bit float"}. ${EXPORT_HINT}`,
    );
  }
  if (fmt.sampleRate < MIN_SAMPLE_RATE || fmt.sampleRate > MAX_SAMPLE_RATE) {
    throw new AnalysisInputError("bad_format", `The WAV header gives a sample rate of ${fmt.sampleRate} Hz, outside ${MIN_SAMPLE_RATE}–${MAX_SAMPLE_RATE} Hz. Record at 44.1 or 48 kHz and upload again.`);
  }
  const blockAlign = fmt.channels * (fmt.bits / 8);
  if (fmt.blockAlign !== blockAlign) {
    throw new AnalysisInputError("bad_format", `The WAV header is inconsistent (block size ${fmt.blockAlign} bytes, but ${fmt.channels} × ${fmt.bits}-bit samples need ${blockAlign}). The file is damaged; export the strike again.`);
  }
  if (dataBytes === 0) {
    throw new AnalysisInputError("no_audio", "The WAV file holds no audio (its data chunk is empty). Record the strike again and check that the recording ran.");
  }
  if (dataBytes > MAX_DATA_BYTES || dataBytes / blockAlign / fmt.sampleRate > MAX_DURATION_S || dataBytes / blockAlign > MAX_FRAMES) {
    const minutes = Math.min(MAX_DURATION_S, MAX_FRAMES / fmt.sampleRate) / 60;
    throw new AnalysisInputError("too_large", `The recording is too long (over ${minutes.toFixed(1)} minutes at ${fmt.sampleRate} Hz, or over 1 GiB of audio). Trim it to the strikes (a few seconds each) and upload again.`);
  }
  if (dataOffset + dataBytes > total) {
    const have = Math.max(0, total - dataOffset);
    throw new AnalysisInputError(
      "truncated",
      `The WAV file is cut short: its header promises ${dataBytes} bytes of audio but the file holds ${have}. The upload or copy was probably interrupted; export the strike again.`,
    );
  }
  const frames = Math.floor(dataBytes / blockAlign);
  if (frames === 0) {
    throw new AnalysisInputError("no_audio", "The WAV file holds less than one sample of audio. Record the strike again.");
  }
  return {
    sampleRate: fmt.sampleRate,
    channels: fmt.channels,
    bitsPerSample: fmt.bits,
    encoding,
    dataBytes,
    durationS: frames / fmt.sampleRate,
    dataOffset,
    blockAlign,
    frames,
  };
}

function isMostlyText(b: Uint8Array): boolean {
  if (b.length === 0) return false;
  let text = 0;
  for (const c of b) if ((c >= 32 && c < 127) || c === 9 || c === 10 || c === 13) text++;
  return text / b.length > 0.95;
}

function printable(id: string): string {
  return id.replace(/[^\x20-\x7e]/g, "?");
}

/** Per-channel facts gathered while decoding, for warnings. */
export interface ChannelStats {
  mean: number;
  rms: number;
  peak: number;
  /** Correlation coefficient with channel 0 (1 for channel 0). */
  correlationWithFirst: number;
}

export interface DecodedWav {
  layout: WavLayout;
  /** Mono mix (mean of the channels), full scale = ±1. */
  mono: Float64Array;
  channelStats: ChannelStats[];
  /** Index of the last frame in a clipped run (≥ 3 consecutive samples at full scale), or −1. */
  lastClippedFrame: number;
  clippedRuns: number;
  /** Clipped regions [first, last] frame, runs closer than 10 ms merged (full scale and flat tops). */
  clipRegions: Array<[number, number]>;
  /** Flat tops below full scale (see flatTops): runs, the level (full scale = 1) and the last frame. */
  flatTopRuns: number;
  flatTopLevel: number;
  lastFlatTopFrame: number;
}

/** Minimum run of consecutive full-scale samples counted as clipping (a sine peak touches once). */
const CLIP_RUN = 3;

/**
 * Decodes the samples into a mono mix (full scale ±1) and gathers clipping, DC and channel facts.
 * Throws AnalysisInputError for structural problems and invalid float values (NaN, ±Inf).
 */
export function decodeWav(bytes: Uint8Array): DecodedWav {
  const layout = parseWavLayout(bytes);
  const { channels: nc, frames, bitsPerSample: bits, encoding, dataOffset, blockAlign } = layout;
  const mono = new Float64Array(frames);
  const sum = new Float64Array(nc);
  const sumSq = new Float64Array(nc);
  const cross = new Float64Array(nc);
  const peak = new Float64Array(nc);
  let lastClipped = -1;
  let clippedRuns = 0;
  let flatTopRuns = 0;
  let flatTopLevel = 0;
  let lastFlat = -1;
  const clipRegions: Array<[number, number]> = [];
  const mergeGap = Math.round(layout.sampleRate * 0.01);
  let invalid = 0;
  let huge = 0;
  // Full-scale thresholds: the largest code (or ±1.0 for float) counts as clipped.
  const clipLevel = encoding === "float" ? 0.99999 : 1 - 1.5 / 2 ** (bits - 1);
  const inv = 1 / nc;
  const first = nc > 1 ? new Float64Array(frames) : new Float64Array(0);
  const ch = new Float64Array(frames);
  for (let c = 0; c < nc; c++) {
    // One channel at a time, through a loop specialised for the sample format.
    readChannel(bytes, dataOffset, blockAlign, c, frames, bits, encoding, ch);
    let s1 = 0;
    let s2 = 0;
    let pk = 0;
    let mx = 0;
    let mn = 0;
    let run = 0;
    let x = 0;
    // Samples near the channel's running extremes, for the flat-top search: a sample within five
    // tolerances of the final extreme is also within five of the running one when it is read
    // (the running extreme is never larger, and x − 5·tol(x) grows with x), so this is a superset.
    const lsb = encoding === "float" ? 0 : 1 / 2 ** (bits - 1);
    const near = (level: number) => level - 5 * Math.max(2 * lsb, 2e-3 * level);
    let hiRun = near(0);
    let loRun = -near(0);
    let nearAbs = 0; // min(hiRun, −loRun): below it a sample is neither a new extreme nor a candidate
    let cand = new Int32Array(1024);
    let nCand = 0;
    for (let i = 0; i < frames; i++) {
      let v = ch[i];
      if (encoding === "float") {
        if (v !== v || v === Infinity || v === -Infinity) {
          invalid++;
          v = 0;
        } else if (v > 1000 || v < -1000) {
          huge++;
          v = 0;
        }
        ch[i] = v;
      }
      s1 += v;
      s2 += v * v;
      const a = v < 0 ? -v : v;
      if (a >= nearAbs) {
        if (v > mx) {
          mx = v;
          hiRun = near(v);
        } else if (v < mn) {
          mn = v;
          loRun = -near(-v);
        }
        nearAbs = Math.min(hiRun, -loRun);
        if (v >= hiRun || v <= loRun) {
          if (nCand === cand.length) {
            const grown = new Int32Array(2 * cand.length);
            grown.set(cand);
            cand = grown;
          }
          cand[nCand++] = i;
        }
      }
      if (a >= clipLevel) {
        run++;
        if (run >= CLIP_RUN) {
          if (run === CLIP_RUN) clippedRuns++;
          if (i > lastClipped) lastClipped = i;
          addClip(clipRegions, i, mergeGap);
        }
      } else run = 0;
      mono[i] += v * inv;
      if (c === 0) { if (nc > 1) first[i] = v; }
      else x += first[i] * v;
    }
    sum[c] = s1;
    sumSq[c] = s2;
    pk = Math.max(mx, -mn);
    peak[c] = pk;
    cross[c] = x;
    // Clipping below full scale: an analogue stage that clipped, or a file normalised after
    // clipping, leaves flat tops at the recording's own extremes instead of at full scale.
    const t = flatTops(ch, cand.subarray(0, nCand), [mx, mn].filter((e) => Math.abs(e) > 0 && Math.abs(e) < clipLevel), lsb, clipRegions, mergeGap);
    if (t.runs > 0) {
      flatTopRuns += t.runs;
      flatTopLevel = Math.max(flatTopLevel, t.level);
      lastFlat = Math.max(lastFlat, t.last);
    }
  }
  clipRegions.sort((p, q) => p[0] - q[0]);
  if (invalid > 0) {
    throw new AnalysisInputError("bad_format", `The recording contains ${invalid} invalid sample value${invalid === 1 ? "" : "s"} (not-a-number or infinite floats). The file is damaged; export the strike again.`);
  }
  if (huge > 0) {
    throw new AnalysisInputError("bad_format", `The recording contains ${huge} float sample${huge === 1 ? "" : "s"} more than 1000 times full scale. The file is damaged or mislabelled; export the strike again.`);
  }
  const channelStats: ChannelStats[] = [];
  const m0 = sum[0] / frames;
  const var0 = Math.max(0, sumSq[0] / frames - m0 * m0);
  for (let c = 0; c < nc; c++) {
    const mean = sum[c] / frames;
    const variance = Math.max(0, sumSq[c] / frames - mean * mean);
    let corr = 1;
    if (c > 0) {
      const cov = cross[c] / frames - m0 * mean;
      corr = var0 > 0 && variance > 0 ? cov / Math.sqrt(var0 * variance) : var0 === variance ? 1 : 0;
    }
    channelStats.push({ mean, rms: Math.sqrt(variance), peak: peak[c], correlationWithFirst: corr });
  }
  return { layout, mono, channelStats, lastClippedFrame: lastClipped, clippedRuns, clipRegions, flatTopRuns, flatTopLevel, lastFlatTopFrame: lastFlat };
}

/** Flat tops need at least this many runs at one extreme (a decaying strike reaches its own peak in one or two cycles). */
const FLAT_MIN_RUNS = 3;
/** …and a pile-up there: at least 4 times as many samples within the tolerance of the extreme as
 *  in the band from 2 to 5 tolerances below it. For a sine the two counts are about equal (its
 *  samples' density near a peak A goes as 1/√(A² − x²)); clipping stacks samples on the flat top. */
const FLAT_PILE_UP = 4;

/**
 * Runs of ≥ CLIP_RUN consecutive samples within a tolerance of each of `extremes` (a channel's own
 * most positive and most negative sample): equal, or nearly equal (2 LSB, or 0.2 % of the level
 * when noise was added after the clipping), among the candidate frames collected while decoding. The runs of an extreme whose samples
 * pile up there as a clipped signal's do are added to `regions`; returns their count, the highest
 * such level and the last frame (0 runs when none does).
 */
function flatTops(ch: Float64Array, candidates: Int32Array, extremes: number[], lsb: number, regions: Array<[number, number]>, gap: number): { runs: number; level: number; last: number } {
  const E = extremes.map((extreme) => {
    const level = Math.abs(extreme);
    const tol = Math.max(2 * lsb, 2e-3 * level);
    return { sign: extreme > 0 ? 1 : -1, level, tol, near: level - 5 * tol, top: 0, below: 0, runs: 0, run: 0, found: [] as Array<[number, number]> };
  });
  // Only the candidates (samples near the running extremes, in order) can lie within 5 tolerances
  // of the final ones; a gap between consecutive ones ends a run.
  const pos = E.find((e) => e.sign > 0);
  const neg = E.find((e) => e.sign < 0);
  const hi = pos ? pos.near : Infinity;
  const lo = neg ? -neg.near : -Infinity;
  const idx = candidates;
  const count = candidates.length;
  let prev = -2;
  for (let j = 0; j < count; j++) {
    const i = idx[j];
    const v = ch[i];
    if (v < hi && v > lo) continue;
    if (i !== prev + 1) for (const e of E) e.run = 0;
    prev = i;
    for (const e of E) {
      const d = e.level - e.sign * v;
      if (d <= e.tol) {
        e.top++;
        e.run++;
        if (e.run === CLIP_RUN) {
          e.runs++;
          e.found.push([i - CLIP_RUN + 1, i]);
        } else if (e.run > CLIP_RUN) e.found[e.found.length - 1][1] = i;
      } else {
        e.run = 0;
        if (d >= 2 * e.tol && d < 5 * e.tol) e.below++;
      }
    }
  }
  let runs = 0;
  let level = 0;
  let last = -1;
  for (const e of E) {
    if (e.runs < FLAT_MIN_RUNS || e.top < FLAT_PILE_UP * Math.max(1, e.below)) continue;
    for (const [a, b] of e.found) for (let i = a; i <= b; i++) addClip(regions, i, gap);
    runs += e.runs;
    level = Math.max(level, e.level);
    last = Math.max(last, e.found[e.found.length - 1][1]);
  }
  return { runs, level, last };
}

/** Adds a clipped sample to the regions, merging with a region that ends within `gap` frames. */
function addClip(regions: Array<[number, number]>, i: number, gap: number): void {
  for (let r = regions.length - 1; r >= Math.max(0, regions.length - 4); r--) {
    const reg = regions[r];
    if (i >= reg[0] - gap && i <= reg[1] + gap) {
      if (i > reg[1]) reg[1] = i;
      if (i - CLIP_RUN + 1 < reg[0]) reg[0] = i - CLIP_RUN + 1;
      return;
    }
  }
  regions.push([i - CLIP_RUN + 1, i]);
}

/** Channel `c` of the data chunk as floats (full scale ±1), one tight loop per format. */
function readChannel(bytes: Uint8Array, dataOffset: number, blockAlign: number, c: number, frames: number, bits: number, encoding: SampleEncoding, out: Float64Array): void {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const bps = bits >> 3;
  let p = dataOffset + c * bps;
  if (encoding === "float") {
    if (bits === 32) for (let i = 0; i < frames; i++, p += blockAlign) out[i] = view.getFloat32(p, true);
    else for (let i = 0; i < frames; i++, p += blockAlign) out[i] = view.getFloat64(p, true);
    return;
  }
  switch (bits) {
    case 8:
      for (let i = 0; i < frames; i++, p += blockAlign) out[i] = (bytes[p] - 128) / 128; // 8-bit WAV is unsigned, offset 128
      return;
    case 16:
      for (let i = 0; i < frames; i++, p += blockAlign) out[i] = (((bytes[p] | (bytes[p + 1] << 8)) << 16) >> 16) / 32768;
      return;
    case 24:
      for (let i = 0; i < frames; i++, p += blockAlign) out[i] = ((bytes[p] | (bytes[p + 1] << 8) | (bytes[p + 2] << 16)) << 8 >> 8) / 8388608;
      return;
    default:
      for (let i = 0; i < frames; i++, p += blockAlign) out[i] = (bytes[p] | (bytes[p + 1] << 8) | (bytes[p + 2] << 16) | (bytes[p + 3] << 24)) / 2147483648;
  }
}
