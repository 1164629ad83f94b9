/**
 * The recorder's WAV writer, read back by an independent decoder: the `wavefile` npm package
 * (v11). Values are compared after 24-bit quantisation, within half a step (1/(2²³ − 1)).
 */
import wavefile from "wavefile";
import { describe, expect, it } from "vitest";
import { WavEncodeError, encodeWav24 } from "./wav-encode";

const { WaveFile } = wavefile;

describe("encodeWav24", () => {
  it("writes mono 24-bit PCM that wavefile reads back sample for sample", () => {
    const rate = 48_000;
    const n = 4801; // odd, so the data chunk needs its pad byte
    const x = new Float32Array(n);
    for (let i = 0; i < n; i++) x[i] = 0.8 * Math.sin((2 * Math.PI * 440 * i) / rate) * Math.exp(-i / rate / 0.5);
    const bytes = new Uint8Array(encodeWav24(x, rate));
    const wav = new WaveFile(bytes);
    const fmt = wav.fmt as { audioFormat: number; numChannels: number; sampleRate: number; bitsPerSample: number; blockAlign: number; byteRate: number };
    expect(fmt).toMatchObject({ audioFormat: 1, numChannels: 1, sampleRate: rate, bitsPerSample: 24, blockAlign: 3, byteRate: rate * 3 });
    const back = wav.getSamples(false, Float64Array) as unknown as Float64Array;
    expect(back.length).toBe(n);
    for (let i = 0; i < n; i++) expect(Math.abs(back[i] / 8_388_607 - x[i])).toBeLessThanOrEqual(0.5 / 8_388_607 + 1e-7);
    // RIFF size counts the pad byte; the file length is even.
    expect(bytes.length % 2).toBe(0);
    expect(new DataView(bytes.buffer).getUint32(4, true)).toBe(bytes.length - 8);
  });

  it("clips values beyond full scale to ±(2²³ − 1)", () => {
    const back = new WaveFile(new Uint8Array(encodeWav24(Float32Array.from([1.5, -2, 1, -1, 0]), 44_100))).getSamples(false, Float64Array) as unknown as Float64Array;
    expect(Array.from(back)).toEqual([8_388_607, -8_388_607, 8_388_607, -8_388_607, 0]);
  });

  it("refuses an empty take and an impossible sample rate with plain messages", () => {
    expect(() => encodeWav24(new Float32Array(0), 48_000)).toThrow(new WavEncodeError("Nothing was recorded: there are no samples to write."));
    expect(() => encodeWav24(new Float32Array(10), 44_100.5)).toThrow(/whole number of Hz from 8000 to 384000, got 44100.5/);
  });
});
