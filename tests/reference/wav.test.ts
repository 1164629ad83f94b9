/**
 * WAV decoding against files written by Debian's sox (SoX 14.4) — which also writes
 * WAVE_FORMAT_EXTENSIBLE for 24/32-bit PCM and a fact chunk for float — and against two decoders
 * from npm: wavefile (11.0) and node-wav (0.0.2). Header fields are checked against soxi.
 */
import { execFileSync } from "node:child_process";
import { createRequire } from "node:module";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import wavefile from "wavefile";
import { describe, expect, it } from "vitest";
import { decodeWav } from "../../server/analysis/wav";
import { readWavHeader } from "../../server/analysis/index";
import { analyze, cents, encodeWav, nearest, requireTool, soxWrite } from "./helpers";

const { WaveFile } = wavefile;
const require = createRequire(import.meta.url);
const nodeWav = require("node-wav") as { decode: (b: Uint8Array) => { sampleRate: number; channelData: Float32Array[] } };

const FS = 48000;
// `-D`: no dither, so the samples are the rounded sine; sox's synth sine starts at phase 0 with amplitude 1.
const formats: Array<{ name: string; args: string[]; bits: number; lsb: number }> = [
  { name: "8-bit unsigned PCM", args: ["-b", "8"], bits: 8, lsb: 1 / 128 },
  { name: "16-bit PCM", args: ["-b", "16"], bits: 16, lsb: 1 / 32768 },
  { name: "24-bit PCM (extensible)", args: ["-b", "24"], bits: 24, lsb: 1 / 8388608 },
  { name: "32-bit PCM (extensible)", args: ["-b", "32"], bits: 32, lsb: 1 / 2147483648 },
  { name: "32-bit float", args: ["-e", "floating-point", "-b", "32"], bits: 32, lsb: 1e-7 },
  { name: "64-bit float", args: ["-e", "floating-point", "-b", "64"], bits: 64, lsb: 1e-15 },
];

function soxi(bytes: Uint8Array, flag: string): string {
  const dir = mkdtempSync(join(tmpdir(), "tinelog-soxi-"));
  try {
    const f = join(dir, "x.wav");
    writeFileSync(f, bytes);
    return execFileSync("soxi", [flag, f], { encoding: "utf8" }).trim();
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function wavefileSamples(bytes: Uint8Array): Float64Array[] {
  const w = new WaveFile(bytes);
  const fmt = w.fmt as { numChannels: number; bitsPerSample: number; audioFormat: number };
  const raw = w.getSamples(false, Float64Array) as unknown as Float64Array | Float64Array[];
  const chans = fmt.numChannels === 1 ? [raw as Float64Array] : (raw as Float64Array[]);
  // wavefile names float depths "32f" and "64" (64-bit is always float in its model).
  const depth = (w as unknown as { bitDepth: string }).bitDepth;
  const isFloat = depth.endsWith("f") || depth === "64";
  if (isFloat) return chans;
  const b = fmt.bitsPerSample;
  return chans.map((c) => c.map((v) => (b === 8 ? (v - 128) / 128 : v / 2 ** (b - 1))));
}

describe("decoding sox-written files", () => {
  requireTool("sox", "sox");
  for (const f of formats) {
    it(`${f.name}: matches the analytic sine, wavefile, and soxi's header facts`, () => {
      const bytes = soxWrite(["-D", "-n", "-r", String(FS), ...f.args, "OUT", "synth", "0.05", "sine", "440", "gain", "-1"]);
      const d = decodeWav(bytes);
      expect(d.layout.sampleRate).toBe(FS);
      expect(d.layout.bitsPerSample).toBe(f.bits);
      expect(d.layout.channels).toBe(1);
      expect(String(d.layout.frames)).toBe(soxi(bytes, "-s"));
      expect(String(d.layout.sampleRate)).toBe(soxi(bytes, "-r"));
      const g = 10 ** (-1 / 20);
      // 8-bit: sox rounds to the nearest code of its own (asymmetric) scale; allow 1.5 codes.
      for (let i = 0; i < d.mono.length; i++) {
        expect(Math.abs(d.mono[i] - g * Math.sin((2 * Math.PI * 440 * i) / FS))).toBeLessThan(1.5 * f.lsb + 1e-6);
      }
      const ref = wavefileSamples(bytes)[0];
      expect(ref.length).toBe(d.mono.length);
      for (let i = 0; i < ref.length; i++) expect(Math.abs(d.mono[i] - ref[i])).toBeLessThan(1e-9);
      const h = readWavHeader(bytes.subarray(0, 80));
      expect(h).toMatchObject({ sampleRate: FS, channels: 1, bitsPerSample: f.bits });
      expect(h.durationS).toBeCloseTo(0.05, 6);
    });
  }

  it("stereo 16-bit: each channel decodes, the mix is their mean, and channels that differ are flagged", () => {
    const bytes = soxWrite(["-D", "-n", "-r", String(FS), "-b", "16", "-c", "2", "OUT", "synth", "0.5", "sine", "440", "sine", "1234", "gain", "-3"]);
    const d = decodeWav(bytes);
    expect(d.layout.channels).toBe(2);
    const nw = nodeWav.decode(bytes);
    expect(nw.channelData).toHaveLength(2);
    for (let i = 0; i < d.mono.length; i += 7) {
      // node-wav scales positive codes by 1/32767 and negative by 1/32768: allow that difference.
      const mix = (nw.channelData[0][i] + nw.channelData[1][i]) / 2;
      expect(Math.abs(d.mono[i] - mix)).toBeLessThan(4e-5);
    }
    expect(d.channelStats[1].correlationWithFirst).toBeLessThan(0.1);
  });
});

describe("decoding against node-wav", () => {
  for (const bits of [16, 24, 32] as const) {
    it(`${bits}-bit PCM written by our fixture writer`, () => {
      const x = Float64Array.from({ length: 3000 }, (_, i) => 0.8 * Math.sin(i * 0.05) * Math.exp(-i / 2000));
      const bytes = encodeWav([x], 44100, { bits });
      const ours = decodeWav(bytes).mono;
      const theirs = nodeWav.decode(bytes).channelData[0];
      for (let i = 0; i < x.length; i++) expect(Math.abs(ours[i] - theirs[i])).toBeLessThan(2 ** -(bits - 1) + 1e-7);
    });
  }
  it("32-bit float written by our fixture writer", () => {
    const x = Float64Array.from({ length: 3000 }, (_, i) => 0.5 * Math.cos(i * 0.01));
    const bytes = encodeWav([x], 44100, { bits: 32, float: true });
    const ours = decodeWav(bytes).mono;
    const theirs = nodeWav.decode(bytes).channelData[0];
    for (let i = 0; i < x.length; i++) expect(ours[i]).toBe(theirs[i]);
  });
});

describe("analysis of sox-synthesised tones", () => {
  it("a plucked string (sox synth pluck 440, Karplus–Strong): fundamental within 1 cent of 440 Hz, harmonics near integer multiples, higher ones dying faster", () => {
    const bytes = soxWrite(["-D", "-n", "-r", String(FS), "-b", "24", "OUT", "synth", "3", "pluck", "440"]);
    const r = analyze(bytes);
    expect(r.strikes).toHaveLength(1);
    const ps = r.strikes[0].partials;
    const f1 = nearest(ps, 440);
    // sox tunes its delay line with a fractional delay; 1 cent covers that tuning, not our error.
    expect(Math.abs(cents(f1.frequencyHz, 440))).toBeLessThan(1);
    for (const h of [2, 3, 4]) {
      const p = nearest(ps, 440 * h);
      expect(Math.abs(cents(p.frequencyHz, h * f1.frequencyHz))).toBeLessThan(5);
      expect(p.tauS).toBeLessThan(f1.tauS);
    }
  });

  it("a steady sine (sox synth sine 440) does not decay, so it is not reported as a partial", () => {
    const bytes = soxWrite(["-D", "-n", "-r", String(FS), "-b", "24", "OUT", "synth", "2", "sine", "440", "gain", "-6"]);
    const r = analyze(bytes);
    expect(r.strikes).toHaveLength(0);
    expect(r.warnings.map((w) => w.code)).toContain("noise_only");
  });
});

describe("readWavHeader", () => {
  it("reads the facts from the first bytes only, and checks the data chunk fits when given the file size", () => {
    const x = new Float64Array(48000);
    const bytes = encodeWav([x, x], 48000, { bits: 24 });
    const h = readWavHeader(bytes.subarray(0, 64));
    expect(h).toEqual({ sampleRate: 48000, channels: 2, bitsPerSample: 24, encoding: "pcm", dataBytes: 48000 * 6, durationS: 1 });
    expect(() => readWavHeader(bytes.subarray(0, 64), { fileSize: 1000 })).toThrow(/cut short/);
  });
});
