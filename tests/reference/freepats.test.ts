/**
 * Real recordings no one here made: struck metal instruments from Debian's freepats package
 * (GUS patches under /usr/share/midi/freepats, GPL-2+ with a use exception — see fixtures/README.md).
 * Each sample's header gives the root frequency of the recorded note; the reported partials are
 * compared with it. Only the part before the sampler's loop point is analysed (that is the natural
 * strike and decay; the loop repeats a stretch of it).
 */
import { existsSync, readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parsePatch, type PatchSample } from "../../fixtures/gus-patch";
import { FREE_FREE_RATIOS } from "../../shared/physics";
import { analyze, cents, encodeWav } from "./helpers";

const DIR = "/usr/share/midi/freepats";

function samples(file: string): PatchSample[] {
  const path = `${DIR}/${file}`;
  if (!existsSync(path)) throw new Error(`These reference tests need Debian's freepats package (${path}): apt-get install -y freepats`);
  return parsePatch(new Uint8Array(readFileSync(path)));
}

function partialsOf(s: PatchSample) {
  const pcm = s.looped ? s.pcm.subarray(0, s.loopStart) : s.pcm;
  const r = analyze(encodeWav([pcm], s.sampleRate, { bits: 16 }));
  expect(r.strikes.length).toBeGreaterThanOrEqual(1);
  return r.strikes[0].partials;
}

const strongest = (ps: ReturnType<typeof partialsOf>) => [...ps].sort((a, b) => b.amplitudeDb - a.amplitudeDb)[0];
const closestCents = (ps: ReturnType<typeof partialsOf>, hz: number) => Math.min(...ps.map((p) => Math.abs(cents(p.frequencyHz, hz))));

describe("freepats celesta (Tone_000/008_Celesta.pat)", () => {
  // A celesta's bars sit over tuned resonators, so the fundamental is the strongest partial.
  // 15 cents allows for the tuning of the sampled instrument, which we cannot know.
  for (const s of samples("Tone_000/008_Celesta.pat")) {
    it(`sample "${s.name}" (root ${s.rootHz} Hz): the strongest partial is the fundamental, within 15 cents of the root`, () => {
      const p = strongest(partialsOf(s));
      expect(Math.abs(cents(p.frequencyHz, s.rootHz))).toBeLessThan(15);
    });
  }
});

describe("freepats glockenspiel (Tone_000/009_Glockenspiel.pat)", () => {
  const all = samples("Tone_000/009_Glockenspiel.pat");
  // Samples whose fundamental is in the recording: a partial within 5 cents of the root.
  for (const name of ["Glock G", "Ilocken", "Jlocken"]) {
    it(`sample "${name}": a partial within 5 cents of the root frequency`, () => {
      const s = all.find((x) => x.name === name)!;
      expect(closestCents(partialsOf(s), s.rootHz)).toBeLessThan(5);
    });
  }
  // In "Glocken" (root 1046.4 Hz) the fundamental is too weak to find; its second bar mode sits
  // at the free–free Euler–Bernoulli ratio 2.757 (Blevins; Thomson App. D) within 10 cents.
  it('sample "Glocken": the second bar mode at 2.757 × the root, within 10 cents', () => {
    const s = all.find((x) => x.name === "Glocken")!;
    expect(closestCents(partialsOf(s), FREE_FREE_RATIOS[1] * s.rootHz)).toBeLessThan(10);
  });
  // "Klocken" (root 3950.7 Hz) is not compared: none of its partials lies near the root or a
  // free–free ratio of it, so the recording does not show which note it is.
});

describe("freepats tubular bells (Tone_000/014_Tubular_Bells.pat)", () => {
  // A tube's strike note sits an octave below its strongest partial (the note on bells):
  // compare the strongest partial with 2 × the root.
  for (const s of samples("Tone_000/014_Tubular_Bells.pat")) {
    it(`sample "${s.name}": the strongest partial within 15 cents of 2 × the root (${(2 * s.rootHz).toFixed(1)} Hz)`, () => {
      const p = strongest(partialsOf(s));
      expect(Math.abs(cents(p.frequencyHz, 2 * s.rootHz))).toBeLessThan(15);
    });
  }
});

describe("freepats steel drums and triangle: analysed without error, decaying partials only", () => {
  // No root comparison: steel-pan samples are dominated by octave partials whose order the
  // recording does not reveal, and a triangle is unpitched (its "root" is only a keyboard mapping).
  for (const file of ["Tone_000/114_Steel_Drums.pat", "Drum_000/081_Triangle_2_Open.pat"]) {
    it(file, () => {
      let found = 0;
      for (const s of samples(file)) {
        const ps = partialsOf(s);
        found += ps.length;
        for (const p of ps) {
          expect(p.tauS).toBeGreaterThan(0);
          expect(p.frequencyHz).toBeLessThan(0.45 * s.sampleRate);
        }
      }
      expect(found).toBeGreaterThan(0);
    });
  }
});
