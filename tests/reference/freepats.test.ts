/**
 * Real recordings no one here made: struck metal instruments from Debian's freepats package
 * (GUS patches under /usr/share/midi/freepats, GPL-2+ with a use exception — see fixtures/README.md).
 * Only the part before the sampler's loop point is analysed (that is the natural strike and decay;
 * the loop repeats a stretch of it).
 *
 * Two outside checks:
 * - frequency: each pitched sample against the root frequency in its patch header (within 10
 *   cents, saying which partial: the fundamental, or an octave of it where the instrument sounds
 *   that); where a sample is not at its header's pitch, against an independent frequency (the
 *   phase slope of the isolated band, tests/reference/band-envelope.ts);
 * - decay: each clear partial's τ against the slope of the isolated band's log envelope over the
 *   window the engine used. Where that envelope is a straight line (linear fit R² ≥ 0.99 in dB),
 *   the engine's τ agrees within 10 %; where it is not, the engine has not given one confident τ:
 *   it marked the partial two-stage, a doublet (with its beat) or unreliable.
 */
import { existsSync, readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parsePatch, type PatchSample } from "../../fixtures/gus-patch";
import { analyze, cents, encodeWav } from "./helpers";
import { bandEnvelope, bandFrequency, envelopeLine } from "./band-envelope";
import type { Partial } from "../../shared/schemas/analysis";

const DIR = "/usr/share/midi/freepats";

function samples(file: string): PatchSample[] {
  const path = `${DIR}/${file}`;
  if (!existsSync(path)) throw new Error(`These reference tests need Debian's freepats package (${path}): apt-get install -y freepats`);
  return parsePatch(new Uint8Array(readFileSync(path)));
}

const pcmOf = (s: PatchSample) => (s.looped ? s.pcm.subarray(0, s.loopStart) : s.pcm);

function partialsOf(s: PatchSample): Partial[] {
  const r = analyze(encodeWav([pcmOf(s)], s.sampleRate, { bits: 16 }));
  expect(r.strikes.length).toBeGreaterThanOrEqual(1);
  return r.strikes[0].partials;
}

const strongest = (ps: Partial[]) => [...ps].sort((a, b) => b.amplitudeDb - a.amplitudeDb)[0];
const closest = (ps: Partial[], hz: number) => [...ps].sort((a, b) => Math.abs(cents(a.frequencyHz, hz)) - Math.abs(cents(b.frequencyHz, hz)))[0];

describe("frequency against the patch header's root", () => {
  const celesta = samples("Tone_000/008_Celesta.pat");
  // A celesta's bars sit over tuned resonators, so the fundamental is the strongest partial.
  for (const name of ["CELESTE", "GELESTE"]) {
    it(`celesta "${name}": the strongest partial is the fundamental, within 10 cents of the root`, () => {
      const s = celesta.find((x) => x.name === name)!;
      expect(Math.abs(cents(strongest(partialsOf(s)).frequencyHz, s.rootHz))).toBeLessThan(10);
    });
  }
  it('celesta "IELESTE" (root 3135.657 Hz) sounds 10.6 cents above its root: its fundamental against the band\'s own phase slope instead, within 0.5 cent', () => {
    const s = celesta.find((x) => x.name === "IELESTE")!;
    const p = strongest(partialsOf(s));
    const c = cents(p.frequencyHz, s.rootHz);
    expect(c).toBeGreaterThan(9);
    expect(c).toBeLessThan(12);
    const f = bandFrequency(pcmOf(s), s.sampleRate, p.frequencyHz, 20, p.fitStartS, p.fitEndS);
    expect(Math.abs(cents(p.frequencyHz, f))).toBeLessThan(0.5);
  });

  const glock = samples("Tone_000/009_Glockenspiel.pat");
  for (const s of glock) {
    it(`glockenspiel "${s.name}" (root ${s.rootHz} Hz): the fundamental within 10 cents of the root`, () => {
      expect(Math.abs(cents(closest(partialsOf(s), s.rootHz).frequencyHz, s.rootHz))).toBeLessThan(10);
    });
  }

  // A tube's strike note sits an octave below its strongest partial: compare with 2 × the root.
  for (const s of samples("Tone_000/014_Tubular_Bells.pat")) {
    it(`tubular bell "${s.name}": the strongest partial within 10 cents of 2 × the root (${(2 * s.rootHz).toFixed(1)} Hz), the octave`, () => {
      expect(Math.abs(cents(strongest(partialsOf(s)).frequencyHz, 2 * s.rootHz))).toBeLessThan(10);
    });
  }

  const pans = samples("Tone_000/114_Steel_Drums.pat");
  for (const name of ["Bteeldr", "Cteeldr"]) {
    it(`steel drum "${name}": the fundamental within 10 cents of the root`, () => {
      const s = pans.find((x) => x.name === name)!;
      expect(Math.abs(cents(closest(partialsOf(s), s.rootHz).frequencyHz, s.rootHz))).toBeLessThan(10);
    });
  }
  it('steel drum "Steel D" (root 261.6 Hz): its fundamental is not in the sample; the octave, 2 × the root, within 10 cents', () => {
    const s = pans.find((x) => x.name === "Steel D")!;
    expect(Math.abs(cents(closest(partialsOf(s), 2 * s.rootHz).frequencyHz, 2 * s.rootHz))).toBeLessThan(10);
  });
  it('steel drum "STEELDR" (root 378.387 Hz) sounds 37 cents flat of its root: its fundamental against the band\'s own phase slope instead, within 0.5 cent', () => {
    const s = pans.find((x) => x.name === "STEELDR")!;
    const p = strongest(partialsOf(s));
    expect(cents(p.frequencyHz, s.rootHz)).toBeLessThan(-30);
    const f = bandFrequency(pcmOf(s), s.sampleRate, p.frequencyHz, 20, p.fitStartS, p.fitEndS);
    expect(Math.abs(cents(p.frequencyHz, f))).toBeLessThan(0.5);
  });
});

describe("decay against the isolated band's log envelope", () => {
  // Struck metal with a natural decay before the loop point. The triangle, metronome bell, cow
  // bell and bell tree have no usable root (their headers hold a keyboard mapping), but their
  // decays are real.
  const files = [
    "Tone_000/008_Celesta.pat",
    "Tone_000/009_Glockenspiel.pat",
    "Tone_000/014_Tubular_Bells.pat",
    "Tone_000/114_Steel_Drums.pat",
    "Drum_000/081_Triangle_2_Open.pat",
    "Drum_000/034_Metronome_Bell.pat",
    "Drum_000/056_Cow_Bell.pat",
    "Drum_000/084_Belltree.pat",
  ];
  let straight = 0;
  for (const file of files) {
    it(file, () => {
      for (const s of samples(file)) {
        const pcm = pcmOf(s);
        const ps = partialsOf(s);
        const top = Math.max(...ps.map((p) => p.amplitudeDb));
        // Clear partials: within 30 dB of the strongest, 25 dB over the band's noise, and a window
        // of at least 0.2 s (40 envelope blocks of 5 ms) for the line.
        for (const p of ps.filter((q) => q.amplitudeDb >= top - 30 && (q.snrDb ?? 0) >= 25 && q.fitEndS - q.fitStartS >= 0.2)) {
          // The band: ten linewidths 1/(π·τ) wide each side (the envelope then follows the decay),
          // at least 15 Hz, at most 100 Hz, and never past halfway to the next reported partial.
          const others = ps.filter((q) => q !== p).map((q) => Math.abs(q.frequencyHz - p.frequencyHz));
          const half = Math.min(0.45 * Math.min(Infinity, ...others), Math.max(15, 10 / (Math.PI * p.tauS)), 100);
          const line = envelopeLine(bandEnvelope(pcm, s.sampleRate, p.frequencyHz, half, 0.005), p.fitStartS, p.fitEndS);
          const where = `${s.name} ${p.frequencyHz.toFixed(1)} Hz: engine τ ${p.tauS.toFixed(3)} s, envelope τ ${line.tauS.toFixed(3)} s (R² ${line.r2.toFixed(3)})`;
          if (line.r2 >= 0.99) {
            straight++;
            expect(Math.abs(p.tauS / line.tauS - 1), where).toBeLessThan(0.1);
          } else {
            expect(Boolean(p.twoStage) || p.beatHz !== null || p.tauUnreliable, `${where} — not a straight line, so the engine must not give one confident τ`).toBe(true);
          }
        }
      }
    });
  }
  it("the comparison has teeth: at least 12 partials across the files decay as straight lines and were compared", () => {
    expect(straight).toBeGreaterThanOrEqual(12);
  });
});
