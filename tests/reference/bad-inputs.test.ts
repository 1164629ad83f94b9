/**
 * Bad inputs, each with its own expected code and message: the engine either rejects
 * with a clear message or warns and still analyses.
 */
import { describe, expect, it } from "vitest";
import { AnalysisInputError, analyzeWav, readWavHeader } from "../../server/analysis/index";
import { analyze, analyzeSynth, cents, encodeWav, nearest, soxWrite, synthWav } from "./helpers";

function failure(bytes: Uint8Array): AnalysisInputError {
  try {
    analyzeWav(bytes);
  } catch (e) {
    if (e instanceof AnalysisInputError) return e;
    throw e;
  }
  throw new Error("expected an AnalysisInputError, got a result");
}

const strike = { sampleRate: 48000, durationS: 1.5, seed: 9, snrDb: 45, strikes: [{ onsetS: 0.1, modes: [{ frequencyHz: 660, amplitude: 0.3, tauS: 0.5 }] }] };

describe("files that cannot be analysed", () => {
  it("not RIFF/WAVE (an MP3-like byte stream)", () => {
    const bytes = Uint8Array.from([0x49, 0x44, 0x33, 0x04, 0x00, 0x00, 0x00, 0x00, 0x00, 0x21, 0xff, 0xfb, 0x90, 0x64, 0x00, 0x0f, 0x80]);
    const e = failure(bytes);
    expect(e.code).toBe("not_wav");
    expect(e.message).toMatch(/not a WAV recording \(no RIFF\/WAVE header\)/);
  });

  it("a text file named .wav", () => {
    const e = failure(new TextEncoder().encode("Strike notes for batch 12\nfork 3: rings well\n"));
    expect(e.code).toBe("not_wav");
    expect(e.message).toMatch(/This file is text, not a WAV recording/);
  });

  it("a truncated data chunk", () => {
    const { bytes } = synthWav(strike, { bits: 16 });
    const e = failure(bytes.subarray(0, Math.floor(bytes.length * 0.6)));
    expect(e.code).toBe("truncated");
    expect(e.message).toMatch(/cut short: its header promises 144000 bytes of audio but the file holds \d+/);
  });

  it("zero-length data", () => {
    const e = failure(encodeWav([new Float64Array(0)], 48000, { bits: 16 }));
    expect(e.code).toBe("no_audio");
    expect(e.message).toMatch(/holds no audio \(its data chunk is empty\)/);
  });

  it("an unsupported encoding (A-law and IMA ADPCM written by sox)", () => {
    const alaw = failure(soxWrite(["-D", "-n", "-r", "8000", "-e", "a-law", "OUT", "synth", "0.2", "sine", "440"]));
    expect(alaw.code).toBe("unsupported_encoding");
    expect(alaw.message).toMatch(/A-law compression.*uncompressed/);
    const ima = failure(soxWrite(["-D", "-n", "-r", "8000", "-e", "ima-adpcm", "OUT", "synth", "0.2", "sine", "440"]));
    expect(ima.code).toBe("unsupported_encoding");
    expect(ima.message).toMatch(/IMA ADPCM compression/);
  });

  it("1 s of digital silence", () => {
    const e = failure(encodeWav([new Float64Array(48000)], 48000, { bits: 24 }));
    expect(e.code).toBe("silence");
    expect(e.message).toMatch(/digital silence.*microphone/);
  });

  it("a header with zero channels", () => {
    const bytes = encodeWav([new Float64Array(100)], 48000, { bits: 16 });
    new DataView(bytes.buffer).setUint16(22, 0, true);
    const e = failure(bytes);
    expect(e.code).toBe("bad_format");
    expect(e.message).toMatch(/0 channels/);
  });

  it("NaN samples in a float file", () => {
    const x = new Float64Array(1000).fill(0.1);
    x[500] = Number.NaN;
    const e = failure(encodeWav([x], 48000, { bits: 32, float: true }));
    expect(e.code).toBe("bad_format");
    expect(e.message).toMatch(/1 invalid sample value \(not-a-number or infinite/);
  });
});

describe("files that are analysed with a warning", () => {
  it("pure noise: no strikes, no partials, and a noise-only warning", () => {
    const { result } = analyzeSynth({ sampleRate: 48000, durationS: 2, seed: 4, noiseRms: 0.01, strikes: [] }, { bits: 16 });
    expect(result.strikes).toHaveLength(0);
    const codes = result.warnings.map((w) => w.code);
    expect(codes).toContain("noise_only");
    expect(codes).toContain("no_partials");
    expect(result.warnings.find((w) => w.code === "noise_only")!.message).toMatch(/only noise/);
  });

  it("a clipped strike: a warning, and the partial still measured after the clipping", () => {
    const clipped = { ...strike, durationS: 2.5, strikes: [{ onsetS: 0.1, modes: [{ frequencyHz: 660, amplitude: 1.6, tauS: 0.5 }] }], clipAt: 1 };
    const { result } = analyzeSynth(clipped, { bits: 16 });
    const w = result.warnings.find((x) => x.code === "clipped");
    expect(w?.message).toMatch(/clipped .*only the part after the clipping was analysed/);
    const p = nearest(result.strikes[0].partials, 660);
    expect(Math.abs(cents(p.frequencyHz, 660))).toBeLessThan(0.05);
    expect(Math.abs(p.tauS / 0.5 - 1)).toBeLessThan(0.02);
    // The fit starts after the last clipped sample: the amplitude falls below 1 at ln(1.6)·τ ≈ 0.235 s.
    expect(p.fitStartS).toBeGreaterThan(0.1 + 0.5 * Math.log(1.6) - 0.01);
  });

  it("8 kHz audio: a low-sample-rate warning, partials below 3.6 kHz still measured", () => {
    const { result } = analyzeSynth({ ...strike, sampleRate: 8000 }, { bits: 16 });
    const w = result.warnings.find((x) => x.code === "low_sample_rate");
    expect(w?.message).toMatch(/only 8000 Hz.*44\.1 kHz or 48 kHz/);
    const p = nearest(result.strikes[0].partials, 660);
    expect(Math.abs(cents(p.frequencyHz, 660))).toBeLessThan(0.05);
  });

  it("a DC offset: a warning, and the partial measured as without it", () => {
    const { result } = analyzeSynth({ ...strike, dc: 0.05 }, { bits: 24 });
    expect(result.warnings.map((w) => w.code)).toContain("dc_offset");
    expect(Math.abs(cents(nearest(result.strikes[0].partials, 660).frequencyHz, 660))).toBeLessThan(0.05);
  });

  it("a very low level: a warning", () => {
    const quiet = { ...strike, strikes: [{ onsetS: 0.1, modes: [{ frequencyHz: 660, amplitude: 0.003, tauS: 0.5 }] }] };
    const { result } = analyzeSynth(quiet, { bits: 24 });
    expect(result.warnings.find((w) => w.code === "low_level")?.message).toMatch(/very quiet \(peak -\d+ dBFS\)/);
  });

  it("channels that disagree: a warning naming the mix", () => {
    const a = synthWav(strike, { bits: 16 }).samples;
    const b = synthWav({ ...strike, seed: 10, strikes: [{ onsetS: 0.1, modes: [{ frequencyHz: 1990, amplitude: 0.3, tauS: 0.4 }] }] }, { bits: 16 }).samples;
    const r = analyze(encodeWav([a, b], 48000, { bits: 16 }));
    expect(r.warnings.find((w) => w.code === "channels_disagree")?.message).toMatch(/channels differ.*mix was analysed/);
  });
});

describe("readWavHeader refuses the same files early, from their first bytes", () => {
  const headerFailure = (bytes: Uint8Array, fileSize?: number) => {
    try {
      readWavHeader(bytes, fileSize === undefined ? undefined : { fileSize });
    } catch (e) {
      if (e instanceof AnalysisInputError) return e.code;
      throw e;
    }
    return "accepted";
  };
  it("text, A-law, zero channels and a truncated data chunk (when the file size is given)", () => {
    expect(headerFailure(new TextEncoder().encode("just some notes about fork 7\n"))).toBe("not_wav");
    const alaw = encodeWav([new Float64Array(100)], 8000, { bits: 8 });
    new DataView(alaw.buffer).setUint16(20, 6, true);
    expect(headerFailure(alaw.subarray(0, 64))).toBe("unsupported_encoding");
    const zero = encodeWav([new Float64Array(100)], 48000, { bits: 16 });
    new DataView(zero.buffer).setUint16(22, 0, true);
    expect(headerFailure(zero.subarray(0, 64))).toBe("bad_format");
    const { bytes } = synthWav(strike, { bits: 16 });
    expect(headerFailure(bytes.subarray(0, 64))).toBe("accepted");
    expect(headerFailure(bytes.subarray(0, 64), bytes.length - 1000)).toBe("truncated");
    expect(headerFailure(encodeWav([new Float64Array(0)], 48000, { bits: 16 }))).toBe("no_audio");
  });
});
