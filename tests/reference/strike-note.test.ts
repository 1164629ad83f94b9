/**
 * The strike note of a tube read from the engine's partials, against the virtual-pitch rule: the
 * pitch heard from partials near 2 : 3 : 4 is their common fundamental, an octave below the
 * lowest of them (the usual reading for tubular chimes; T. D. Rossing, Science of Percussion
 * Instruments, ch. on chimes — quoted from memory).
 *
 * 1. A synthetic tube whose partials include three at exactly 2, 3 and 4 × a known fundamental
 *    (the fundamental itself absent, as in a real chime) plus free–free modes below them that
 *    are no part of the series: the strike note must be the known fundamental.
 * 2. The freepats tubular bell (Debian's freepats, GPL-2+ with a use exception, fixtures/README.md):
 *    the patch's root frequency is the note the sampler plays it as; the strike note must be
 *    within 20 cents of it (the tuning of the sampled instrument is not known to us).
 */
import { existsSync, readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parsePatch } from "../../fixtures/gus-patch";
import { findStrikeNote } from "../../shared/strike-note";
import { analyze, analyzeSynth, cents, encodeWav } from "./helpers";

describe("strike note of a synthetic tube (partials at 2 : 3 : 4 of a known fundamental)", () => {
  // Known strike note C5 at A4 = 440 Hz: 440·2^(3/12) = 523.2511 Hz (equal temperament, ISO 16).
  const f0 = 440 * Math.pow(2, 3 / 12);
  // Below the series, free–free modes at (β₁L)² : (β₂L)² : (β₃L)² scaled so the 4th mode is 2·f0
  // (roots 4.7300, 7.8532, 10.9956, 14.1372 — Blevins, Formulas for Natural Frequency and Mode
  // Shape, Table 8-1): 0.2239, 0.6170, 1.2097 × f0. None of them is near a multiple of f0 that
  // would complete a 2 : 3 : 4 series.
  const scale = (2 * f0) / 14.1372 ** 2;
  const lower = [4.73, 7.8532, 10.9956].map((r) => r * r * scale);
  const { result } = analyzeSynth({
    sampleRate: 48000,
    durationS: 5,
    seed: 523,
    snrDb: 50,
    strikes: [
      {
        onsetS: 0.1,
        modes: [
          ...lower.map((frequencyHz, i) => ({ frequencyHz, amplitude: 0.05 / (i + 1), tauS: 0.8 })),
          { frequencyHz: 2 * f0, amplitude: 0.3, tauS: 3 },
          { frequencyHz: 3 * f0, amplitude: 0.2, tauS: 2 },
          { frequencyHz: 4 * f0, amplitude: 0.15, tauS: 1.5 },
        ],
      },
    ],
  });
  const partials = result.strikes[0].partials;

  it("finds the strike note within 0.5 cent of the known fundamental, though no partial sounds there", () => {
    expect(partials.some((p) => Math.abs(cents(p.frequencyHz, f0)) < 50)).toBe(false);
    const note = findStrikeNote(partials)!;
    expect(note).not.toBeNull();
    expect(Math.abs(cents(note.frequencyHz, f0))).toBeLessThan(0.5);
  });

  it("names the three partials it used, at harmonics 2, 3 and 4, and none of the lower modes", () => {
    const note = findStrikeNote(partials)!;
    expect(note.members.map((m) => m.harmonic)).toEqual([2, 3, 4]);
    note.members.forEach((m) => expect(Math.abs(cents(m.frequencyHz, m.harmonic * f0))).toBeLessThan(0.5));
    expect(note.misfitCents).toBeLessThan(0.5);
  });

  it("reads the same note when a spec targets it, and none when the target is a semitone-and-more away", () => {
    expect(Math.abs(cents(findStrikeNote(partials, 523.25, 150)!.frequencyHz, f0))).toBeLessThan(0.5);
    expect(findStrikeNote(partials, f0 * Math.pow(2, 4 / 12), 150)).toBeNull();
  });
});

describe("strike note of the freepats tubular bell (Tone_000/014_Tubular_Bells.pat)", () => {
  const path = "/usr/share/midi/freepats/Tone_000/014_Tubular_Bells.pat";
  if (!existsSync(path)) throw new Error(`These reference tests need Debian's freepats package (${path}): apt-get install -y freepats`);
  for (const s of parsePatch(new Uint8Array(readFileSync(path)))) {
    it(`sample "${s.name}": the strike note within 20 cents of the patch root (${s.rootHz.toFixed(1)} Hz)`, () => {
      const pcm = s.looped ? s.pcm.subarray(0, s.loopStart) : s.pcm;
      const partials = analyze(encodeWav([pcm], s.sampleRate, { bits: 16 })).strikes[0].partials;
      const note = findStrikeNote(partials)!;
      expect(note).not.toBeNull();
      expect(Math.abs(cents(note.frequencyHz, s.rootHz))).toBeLessThan(20);
      // Heard an octave below the lowest partial of the series.
      expect(Math.abs(cents(note.members[0].frequencyHz, 2 * note.frequencyHz))).toBeLessThan(100);
    });
  }
});
