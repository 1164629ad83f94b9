/**
 * The recorder calibration's measurement of a reference tone, checked against tones whose true
 * offset is known by construction, and against tones made by an outside generator (Debian's sox).
 *
 * A recorder whose clock runs fast or slow by ε reads every frequency as f·(1 + ε): a tone written
 * at f·(1 + ε) and labelled with the nominal rate is what such a recorder records, so the offset
 * (measured − reference)/reference × 10⁶ must come out as ε in ppm (the definition of the offset).
 * The stated uncertainty is a standard uncertainty (k = 1, GUM JCGM 100:2008 §2.3.1): the errors
 * over many tones must scatter within it (RMS of error/u about 1 or less, none beyond 3).
 */
import { describe, expect, it } from "vitest";
import { measureReferenceTone, ReferenceToneRefused } from "../../server/analysis/reference-tone";
import { synthWav, soxWrite } from "./helpers";

const ppmOf = (measuredHz: number, referenceHz: number) => ((measuredHz - referenceHz) / referenceHz) * 1e6;

function tone(o: { hz: number; ppm: number; snrDb: number; sampleRate?: number; seed: number; durationS?: number }) {
  const amplitude = 0.4;
  return synthWav(
    {
      sampleRate: o.sampleRate ?? 48000,
      durationS: o.durationS ?? 3,
      strikes: [{ onsetS: 0, modes: [{ frequencyHz: o.hz * (1 + o.ppm * 1e-6), amplitude, tauS: Infinity, phaseRad: o.seed % 6 }] }],
      // SNR of the tone's RMS (A/√2) over white noise.
      noiseRms: amplitude / Math.SQRT2 / 10 ** (o.snrDb / 20),
      seed: o.seed,
    },
    { bits: 24 },
  ).bytes;
}

describe("clock offset from synthetic tones at known offsets", () => {
  it("recovers 1000 Hz × (1 + 73·10⁻⁶) labelled 48 kHz as +73 ppm within its stated uncertainty", () => {
    const m = measureReferenceTone(tone({ hz: 1000, ppm: 73, snrDb: 60, seed: 1, durationS: 5 }), { expectedHz: 1000 });
    const u = (m.frequencyUncertaintyHz / 1000) * 1e6;
    expect(Math.abs(ppmOf(m.frequencyHz, 1000) - 73)).toBeLessThanOrEqual(3 * u);
    expect(u).toBeLessThan(0.01); // a 5 s tone at 60 dB: far below any clock error of interest
    expect(m.decays).toBe(false);
  });

  it("across offsets −150…+210 ppm, SNRs 30–70 dB, 440 Hz and 1 kHz, 44.1 and 48 kHz, the errors scatter within the stated uncertainty", () => {
    const z: number[] = [];
    for (const sampleRate of [48000, 44100]) {
      for (const hz of [440, 1000]) {
        for (const ppm of [-150, 0, 73, 210]) {
          for (const snrDb of [30, 50, 70]) {
            const seed = (ppm + 1000) * 7 + snrDb + hz + sampleRate;
            const m = measureReferenceTone(tone({ hz, ppm, snrDb, sampleRate, seed }), { expectedHz: hz });
            const u = (m.frequencyUncertaintyHz / hz) * 1e6;
            z.push((ppmOf(m.frequencyHz, hz) - ppm) / u);
          }
        }
      }
    }
    const rms = Math.sqrt(z.reduce((s, v) => s + v * v, 0) / z.length);
    expect(Math.max(...z.map(Math.abs))).toBeLessThanOrEqual(3);
    // Not optimistic (RMS ≤ 1.5), and not so pessimistic that the bound says nothing (RMS ≥ 0.3).
    expect(rms).toBeLessThanOrEqual(1.5);
    expect(rms).toBeGreaterThanOrEqual(0.3);
  });

  it("measures a struck reference fork (a decaying tone with its overtone) as well as a steady one", () => {
    const wav = synthWav(
      {
        sampleRate: 48000,
        durationS: 6,
        strikes: [{ onsetS: 0.3, click: 0.3, modes: [{ frequencyHz: 440 * (1 + 30e-6), amplitude: 0.3, tauS: 5 }, { frequencyHz: 440 * 6.1, amplitude: 0.05, tauS: 0.4 }] }],
        noiseRms: 1e-4,
        seed: 5,
      },
      { bits: 24 },
    ).bytes;
    const m = measureReferenceTone(wav, { expectedHz: 440 });
    expect(m.decays).toBe(true);
    expect(Math.abs(ppmOf(m.frequencyHz, 440) - 30)).toBeLessThanOrEqual(3 * (m.frequencyUncertaintyHz / 440) * 1e6);
    expect(m.fitStartS).toBeGreaterThan(0.3); // after the strike's transient
  });
});

describe("reference tones made by Debian's sox (synth sine)", () => {
  // sox(1): "synth … sine FREQUENCY" writes a sine of that frequency at the output's sample rate,
  // so it is a recorder with no clock error: offset 0 at the nominal frequency, +73 ppm at 1000.073 Hz.
  it("reads sox's 1000 Hz at 48 kHz as 0 ppm and its 1000.073 Hz as +73 ppm", () => {
    for (const [set, ppm] of [["1000", 0], ["1000.073", 73]] as const) {
      const wav = soxWrite(["-n", "-r", "48000", "-b", "24", "-c", "1", "OUT", "synth", "5", "sine", set, "vol", "0.5"]);
      const m = measureReferenceTone(wav, { expectedHz: 1000 });
      const u = (m.frequencyUncertaintyHz / 1000) * 1e6;
      // 24-bit quantisation is the only noise: u is tiny; allow 0.01 ppm for sox's own phase arithmetic.
      expect(Math.abs(ppmOf(m.frequencyHz, 1000) - ppm)).toBeLessThanOrEqual(3 * u + 0.01);
    }
  });

  it("reads sox's 440 Hz at 44.1 kHz, 16 bit, as 0 ppm", () => {
    const wav = soxWrite(["-n", "-r", "44100", "-b", "16", "-c", "1", "OUT", "synth", "4", "sine", "440", "vol", "0.5"]);
    const m = measureReferenceTone(wav, { expectedHz: 440 });
    expect(Math.abs(ppmOf(m.frequencyHz, 440))).toBeLessThanOrEqual(3 * (m.frequencyUncertaintyHz / 440) * 1e6 + 0.01);
  });

  it("refuses sox's two tones at once, a clipped tone and a tone drowned in noise, in words", () => {
    const refused = (wav: Uint8Array, hz = 1000) => {
      try {
        measureReferenceTone(wav, { expectedHz: hz });
      } catch (error) {
        if (error instanceof ReferenceToneRefused) return error;
        throw error;
      }
      throw new Error("the recording was accepted");
    };
    const two = refused(soxWrite(["-n", "-r", "48000", "-b", "24", "-c", "2", "OUT", "synth", "4", "sine", "1000", "sine", "440", "vol", "0.4"]));
    expect(two.code).toBe("several_tones");
    expect(two.message).toMatch(/more than one tone \(440\.00 Hz, 1000\.0 Hz/);
    // sox clips (and warns) when the gain drives the sine past full scale.
    const clipped = refused(soxWrite(["-n", "-r", "48000", "-b", "16", "-c", "1", "OUT", "synth", "4", "sine", "1000", "gain", "6"]));
    expect(clipped.code).toBe("clipped");
    expect(clipped.message).toMatch(/Lower the generator's level/);
    const noisy = refused(tone({ hz: 1000, ppm: 0, snrDb: 10, seed: 9 }));
    expect(noisy.code).toBe("noisy");
    expect(noisy.message).toMatch(/needs at least 20 dB/);
    const wrong = refused(soxWrite(["-n", "-r", "48000", "-b", "24", "-c", "1", "OUT", "synth", "4", "sine", "1020", "vol", "0.5"]));
    expect(wrong.code).toBe("wrong_frequency");
    const short = refused(soxWrite(["-n", "-r", "48000", "-b", "24", "-c", "1", "OUT", "synth", "0.6", "sine", "1000", "vol", "0.5"]));
    expect(short.code).toBe("too_short");
  });
});
