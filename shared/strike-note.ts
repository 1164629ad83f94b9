/**
 * The strike note of a struck tube: the pitch the ear hears is not the tube's lowest partial but a
 * virtual pitch, the common fundamental of the partials that stand near a harmonic series. For
 * tubular chimes the usual reading takes the three modes that stand near 2 : 3 : 4 and hears their
 * missing fundamental, about an octave below the lowest of the three.
 *
 * The common fundamental is the f₀ that minimises the squared cents misfit of the three partials
 * from 2·f₀, 3·f₀ and 4·f₀: ln f₀ = mean(ln(fₖ / nₖ)), the geometric mean of fₖ/nₖ. Each
 * partial's misfit counts the same in cents, as pitch is heard on a log scale.
 *
 * Pure functions over the analysis' partials (Hz, dBFS); no I/O.
 */
import type { Partial as MeasuredPartial } from "./schemas/analysis.ts";
import { cents } from "./physics.ts";

/** "2 : 3 : 4" with no-break spaces, for screens (the ratio never breaks across lines). */
export const SERIES_WORDS = "2\u00a0:\u00a03\u00a0:\u00a04";

/** The harmonic numbers of the series a strike note is read from. */
export const STRIKE_NOTE_HARMONICS = [2, 3, 4] as const;

/**
 * How far a partial may stand from its place in the series and still count, cents. A semitone:
 * an Euler–Bernoulli free–free tube puts its 4th, 5th and 6th modes at 2 : 2.99 : 4.17 of their
 * common fundamental (the 6th 73 cents sharp), and real tubes sit between that and 2 : 3 : 4.
 */
export const NEAR_HARMONIC_CENTS = 100;

export type StrikeNoteMember = {
  /** Index into the strike's partials. */
  index: number;
  /** Its place in the series (2, 3 or 4). */
  harmonic: number;
  frequencyHz: number;
  /** How far it stands from harmonic × the strike note, cents. */
  deviationCents: number;
};

export type StrikeNote = {
  /** The strike note (the series' common fundamental), Hz. */
  frequencyHz: number;
  /** Its standard uncertainty (k = 1) from the partials' fit uncertainties, Hz. */
  uncertaintyHz: number;
  /** The partials it was read from, lowest first. */
  members: StrikeNoteMember[];
  /** Root-mean-square misfit of the members from the series, cents. */
  misfitCents: number;
};

const usable = (p: MeasuredPartial) => Number.isFinite(p.frequencyHz) && p.frequencyHz > 0;
const linear = (db: number) => Math.pow(10, db / 20);

/** The partial nearest to `hz` within {@link NEAR_HARMONIC_CENTS}, ties within 1 cent to the stronger. */
function nearestWithin(partials: readonly MeasuredPartial[], hz: number, exclude: number): number | null {
  let best: number | null = null;
  let bestDistance = Infinity;
  partials.forEach((p, i) => {
    if (i === exclude || !usable(p)) return;
    const d = Math.abs(cents(p.frequencyHz, hz));
    if (d > NEAR_HARMONIC_CENTS) return;
    if (d < bestDistance - 1 || (Math.abs(d - bestDistance) <= 1 && best !== null && p.amplitudeDb > partials[best].amplitudeDb)) {
      best = i;
      bestDistance = Math.min(d, bestDistance);
    }
  });
  return best;
}

/** The common fundamental of `members` (indices with harmonic numbers), with its misfit and uncertainty. */
function fit(partials: readonly MeasuredPartial[], chosen: { index: number; harmonic: number }[]): StrikeNote {
  const logs = chosen.map((c) => Math.log(partials[c.index].frequencyHz / c.harmonic));
  const f0 = Math.exp(logs.reduce((a, b) => a + b, 0) / logs.length);
  const members = chosen.map((c) => ({ index: c.index, harmonic: c.harmonic, frequencyHz: partials[c.index].frequencyHz, deviationCents: cents(partials[c.index].frequencyHz, c.harmonic * f0) }));
  // ln f₀ is the mean of the ln fₖ: u(ln f₀) = √(Σ u(ln fₖ)²)/n for independent fits (GUM §5.1.2).
  const uRel = Math.sqrt(chosen.reduce((a, c) => a + (Math.abs(partials[c.index].frequencyUncertaintyHz) / partials[c.index].frequencyHz) ** 2, 0)) / chosen.length;
  const misfitCents = Math.sqrt(members.reduce((a, m) => a + m.deviationCents ** 2, 0) / members.length);
  return { frequencyHz: f0, uncertaintyHz: f0 * uRel, members, misfitCents };
}

/** Every reading of a strike note the partials allow: each partial as the 2, with a 3 and a 4 near their places. */
export function strikeNoteCandidates(partials: readonly MeasuredPartial[]): StrikeNote[] {
  const out: StrikeNote[] = [];
  partials.forEach((p, i) => {
    if (!usable(p)) return;
    const base = p.frequencyHz / STRIKE_NOTE_HARMONICS[0];
    const chosen: { index: number; harmonic: number }[] = [{ index: i, harmonic: STRIKE_NOTE_HARMONICS[0] }];
    for (const h of STRIKE_NOTE_HARMONICS.slice(1)) {
      const j = nearestWithin(partials, h * base, i);
      if (j === null || chosen.some((c) => c.index === j)) return;
      chosen.push({ index: j, harmonic: h });
    }
    out.push(fit(partials, chosen));
  });
  return out;
}

const loudness = (partials: readonly MeasuredPartial[], n: StrikeNote) => n.members.reduce((a, m) => a + linear(partials[m.index].amplitudeDb), 0);

/**
 * The strike note of one strike, or null when no three partials stand near 2 : 3 : 4.
 * With `expectedHz` (a spec's target), the reading nearest to it within `windowCents`; without,
 * the loudest reading (the sum of its partials' amplitudes), as the loud partials are the ones heard.
 */
export function findStrikeNote(partials: readonly MeasuredPartial[], expectedHz?: number, windowCents?: number): StrikeNote | null {
  const all = strikeNoteCandidates(partials);
  if (expectedHz === undefined) {
    return all.reduce<StrikeNote | null>((best, n) => (best === null || loudness(partials, n) > loudness(partials, best) ? n : best), null);
  }
  let best: StrikeNote | null = null;
  let bestDistance = Infinity;
  for (const n of all) {
    const d = Math.abs(cents(n.frequencyHz, expectedHz));
    if (windowCents !== undefined && d > windowCents) continue;
    // Within a cent of each other, the reading that fits the series better wins.
    if (d < bestDistance - 1 || (Math.abs(d - bestDistance) <= 1 && best !== null && n.misfitCents < best.misfitCents)) {
      best = n;
      bestDistance = Math.min(d, bestDistance);
    }
  }
  return best;
}

/**
 * The strike note as one "partial" for the evaluation: its frequency and uncertainty, the level of
 * its strongest member and that member's decay (τ, T60, Q, fit), which is the decay heard.
 */
export function strikeNoteAsPartial(partials: readonly MeasuredPartial[], note: StrikeNote): MeasuredPartial {
  const strongest = note.members.map((m) => partials[m.index]).reduce((a, b) => (b.amplitudeDb > a.amplitudeDb ? b : a));
  return {
    ...strongest,
    frequencyHz: note.frequencyHz,
    frequencyUncertaintyHz: note.uncertaintyHz,
    beatHz: null,
    modes: undefined,
  };
}
