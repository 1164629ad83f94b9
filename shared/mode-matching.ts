/**
 * Matching a model's predicted modes to measured partials under one common stiffness scale, and
 * the least-squares stiffness factor k with its uncertainty. Pure; frequencies in Hz.
 *
 * For a linear elastic part every natural frequency scales with √(E/ρ), so a wrong modulus in the
 * model moves every mode by the same factor k: ln f_measured = ln k + ln f_predicted + residual.
 * We look for the assignment and the shift s = ln k that minimise Σ (ln fₘ − s − ln fₚ)² over
 * matched pairs, where each match must beat a gate (|residual| < gate) and modes and partials may
 * stay unmatched. With s fixed, the best assignment of two sorted lists under a convex cost of the
 * difference never crosses, so dynamic programming over the sorted lists finds it (the same optimum
 * as the Hungarian method with "unmatched" columns; the tests compare the two). s is then the mean
 * of the matched log-ratios (the least-squares solution), and the two steps alternate from the most
 * plausible starting shifts (those that bring the most modes near a partial); the lowest total
 * cost wins.
 *
 * A matched mode whose residual stays far from the others' after calibration is left out of the fit
 * (it points at geometry — a tine length, a thickness — not at the material) and reported with its
 * residual.
 */

const CENTS_PER_NEPER = 1200 / Math.LN2;

export type MatchPredicted = { key: string; frequencyHz: number };
export type MatchMeasured = { key: string; frequencyHz: number; /** standard uncertainty, Hz */ uncertaintyHz?: number };
/** One model list against the measured partials it may match (e.g. the free model against suspended strikes). */
export type MatchSet = { predicted: MatchPredicted[]; measured: MatchMeasured[] };

export type MatchOptions = {
  /** A pair further apart than this after calibration is not the same mode, cents. */
  gateCents: number;
  /** Largest stiffness factor considered (and its inverse the smallest). */
  maxScale: number;
  /** A residual further than this from the median residual is left out of the fit, at least, cents… */
  outlierMinCents: number;
  /** …or this many robust standard deviations (1.4826·MAD), whichever is larger. */
  outlierSigmas: number;
};

/**
 * Defaults, our own choices: a model whose first modes are within a few percent of the part (a
 * guessed modulus is rarely off by more than ±20 %, i.e. k within about 0.9–1.1) — 150 cents (9 %)
 * of residual after calibration is far more than a material error leaves, and less than half the
 * spacing of a fork's or a bar's neighbouring modes; k up to 1.5 (E off by 2.25×) covers a wrong
 * alloy. 25 cents is well above the scatter a careful model leaves between modes of one part.
 */
export const defaultMatchOptions: MatchOptions = { gateCents: 150, maxScale: 1.5, outlierMinCents: 25, outlierSigmas: 4 };

export type MatchedPair = {
  predictedKey: string;
  measuredKey: string;
  predictedHz: number;
  measuredHz: number;
  /** 1200·log2(f_measured / (k·f_predicted)), cents. */
  residualCents: number;
  inFit: boolean;
};

export type StiffnessFit = {
  /** k = f_measured / f_predicted. */
  k: number;
  /** Standard uncertainty of k (coverage factor 1): spread of the per-mode ratios and the measurement uncertainties. */
  uK: number;
  /** Modes in the fit. */
  n: number;
  /** Standard deviation of the per-mode log-ratios in the fit, cents (null for one mode). */
  scatterCents: number | null;
};

export type MatchResult = {
  /** Per match set (same order), the matched pairs sorted by predicted frequency. */
  pairs: MatchedPair[][];
  fit: StiffnessFit | null;
};

/** How many of the best-voted starting shifts are refined by alternating assignment and fit. */
const MAX_REFINED_STARTS = 32;

type Item = { key: string; ln: number; hz: number; u: number };

function prepare<T extends { key: string; frequencyHz: number; uncertaintyHz?: number }>(list: T[]): Item[] {
  return list
    .filter((x) => Number.isFinite(x.frequencyHz) && x.frequencyHz > 0)
    .map((x) => ({ key: x.key, ln: Math.log(x.frequencyHz), hz: x.frequencyHz, u: x.uncertaintyHz ?? 0 }))
    .sort((a, b) => a.ln - b.ln || a.key.localeCompare(b.key));
}

/**
 * Best non-crossing partial assignment of sorted `p` to sorted `m` at shift s: each match costs
 * r² − gate² (r the residual in nepers), so a match is taken only when |r| < gate, and unmatched
 * items cost nothing. Returns index pairs [i, j] and the total cost.
 */
export function assignSorted(p: { ln: number }[], m: { ln: number }[], s: number, gate: number): { pairs: [number, number][]; cost: number } {
  const n = p.length;
  const w = m.length;
  const g2 = gate * gate;
  const cost = new Float64Array((n + 1) * (w + 1));
  const move = new Uint8Array((n + 1) * (w + 1)); // 1 skip predicted, 2 skip measured, 3 match
  const at = (i: number, j: number) => i * (w + 1) + j;
  for (let i = 1; i <= n; i++) move[at(i, 0)] = 1;
  for (let j = 1; j <= w; j++) move[at(0, j)] = 2;
  for (let i = 1; i <= n; i++) {
    for (let j = 1; j <= w; j++) {
      let best = cost[at(i - 1, j)];
      let how = 1;
      if (cost[at(i, j - 1)] < best) {
        best = cost[at(i, j - 1)];
        how = 2;
      }
      const r = m[j - 1].ln - s - p[i - 1].ln;
      const c = r * r - g2;
      if (c < 0 && cost[at(i - 1, j - 1)] + c < best) {
        best = cost[at(i - 1, j - 1)] + c;
        how = 3;
      }
      cost[at(i, j)] = best;
      move[at(i, j)] = how;
    }
  }
  const pairs: [number, number][] = [];
  for (let i = n, j = w; i > 0 || j > 0; ) {
    const how = move[at(i, j)];
    if (how === 3) {
      pairs.push([i - 1, j - 1]);
      i--;
      j--;
    } else if (how === 1) i--;
    else j--;
  }
  return { pairs: pairs.reverse(), cost: cost[at(n, w)] };
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

/** Which of the log-ratios d stay in the fit: all, unless one sits far from the median of at least three. */
function inliers(d: number[], opts: MatchOptions): boolean[] {
  if (d.length < 3) return d.map(() => true);
  const med = median(d);
  const mad = median(d.map((x) => Math.abs(x - med)));
  const limit = Math.max(opts.outlierMinCents / CENTS_PER_NEPER, opts.outlierSigmas * 1.4826 * mad);
  const keep = d.map((x) => Math.abs(x - med) <= limit);
  // Never leave fewer than two in the fit: then the data cannot tell which is off.
  return keep.filter(Boolean).length >= 2 ? keep : d.map(() => true);
}

type Solution = { s: number; cost: number; pairs: [number, number][][]; keep: boolean[][] };

function solveFrom(sets: { p: Item[]; m: Item[] }[], s0: number, gate: number, opts: MatchOptions): Solution {
  let s = s0;
  let signature = "";
  let last: Solution | null = null;
  for (let iter = 0; iter < 25; iter++) {
    const assigned = sets.map((set) => assignSorted(set.p, set.m, s, gate));
    const d = assigned.flatMap((a, k) => a.pairs.map(([i, j]) => sets[k].m[j].ln - sets[k].p[i].ln));
    const keepFlat = inliers(d, opts);
    const kept = d.filter((_, i) => keepFlat[i]);
    const cost = assigned.reduce((sum, a) => sum + a.cost, 0);
    let offset = 0;
    const keep = assigned.map((a) => {
      const part = keepFlat.slice(offset, offset + a.pairs.length);
      offset += a.pairs.length;
      return part;
    });
    last = { s, cost, pairs: assigned.map((a) => a.pairs), keep };
    if (!kept.length) return last;
    const next = kept.reduce((a, b) => a + b, 0) / kept.length;
    const sig = assigned.map((a) => a.pairs.map((p) => p.join(":")).join(",")).join("|") + `#${keepFlat.join("")}`;
    if (sig === signature && Math.abs(next - s) < 1e-12) break;
    signature = sig;
    s = next;
  }
  // Cost at the final shift with the final assignment, so candidates compare fairly.
  const assigned = sets.map((set) => assignSorted(set.p, set.m, last!.s, gate));
  return { ...last!, cost: assigned.reduce((sum, a) => sum + a.cost, 0) };
}

/**
 * Matches every set's predicted modes to its measured partials with one common stiffness factor,
 * and fits that factor. Sets share k (the free and the held model of one part are the same metal).
 */
export function matchModes(sets: MatchSet[], opts: MatchOptions = defaultMatchOptions): MatchResult {
  const prepared = sets.map((set) => ({ p: prepare(set.predicted), m: prepare(set.measured) }));
  const gate = opts.gateCents / CENTS_PER_NEPER;
  const maxShift = Math.log(opts.maxScale);
  // Starting shifts: every pairing of a predicted mode with a measured partial within the scale
  // range, on a 1-cent grid, and no shift at all. Each is scored by a quick vote (every predicted
  // mode's best partial within the gate, one-to-one ignored); the best-scored starts are refined.
  const grid = new Set<number>([0]);
  for (const { p, m } of prepared) {
    for (const a of p) for (const b of m) {
      const s = b.ln - a.ln;
      if (Math.abs(s) <= maxShift) grid.add(Math.round(s * CENTS_PER_NEPER) / CENTS_PER_NEPER);
    }
  }
  const g2 = gate * gate;
  const vote = (s: number) => {
    let score = 0;
    for (const { p, m } of prepared) {
      for (const a of p) {
        // m is sorted: only the partials within the gate of a·k count.
        let lo = 0;
        let hi = m.length;
        const from = a.ln + s - gate;
        while (lo < hi) {
          const mid = (lo + hi) >> 1;
          if (m[mid].ln < from) lo = mid + 1;
          else hi = mid;
        }
        let bestPair = 0;
        for (let j = lo; j < m.length && m[j].ln <= a.ln + s + gate; j++) {
          const r = m[j].ln - s - a.ln;
          bestPair = Math.max(bestPair, g2 - r * r);
        }
        score += bestPair;
      }
    }
    return score;
  };
  const starts = [...grid]
    .map((s) => ({ s, score: vote(s) }))
    .sort((a, b) => b.score - a.score || Math.abs(a.s) - Math.abs(b.s))
    .slice(0, MAX_REFINED_STARTS)
    .map((x) => x.s);
  let best: Solution | null = null;
  for (const s0 of starts) {
    const sol = solveFrom(prepared, s0, gate, opts);
    if (Math.abs(sol.s) > maxShift) continue;
    if (!best || sol.cost < best.cost - 1e-12 || (Math.abs(sol.cost - best.cost) <= 1e-12 && Math.abs(sol.s) < Math.abs(best.s))) best = sol;
  }
  if (!best || best.pairs.every((p) => p.length === 0)) return { pairs: sets.map(() => []), fit: null };
  const s = best.s;
  const pairs = best.pairs.map((list, k) =>
    list.map(([i, j], idx) => {
      const p = prepared[k].p[i];
      const m = prepared[k].m[j];
      return { predictedKey: p.key, measuredKey: m.key, predictedHz: p.hz, measuredHz: m.hz, residualCents: (m.ln - s - p.ln) * CENTS_PER_NEPER, inFit: best!.keep[k][idx] };
    }),
  );
  const inFit = best.pairs.flatMap((list, k) => list.filter((_, idx) => best!.keep[k][idx]).map(([i, j]) => ({ d: prepared[k].m[j].ln - prepared[k].p[i].ln, uRel: prepared[k].m[j].u / prepared[k].m[j].hz })));
  return { pairs, fit: stiffnessFit(inFit) };
}

/**
 * k from the per-mode log-ratios dᵢ = ln(fₘ/fₚ) (least squares: ln k = mean dᵢ) and its standard
 * uncertainty (GUM, JCGM 100:2008 §4.2 type A for the spread, §5.1.2 for the sum): the standard
 * error of the mean of dᵢ, which holds the model's mode-to-mode error, combined with the measured
 * frequencies' own relative uncertainties propagated through the mean, u(ln k)² = s_d²/n + Σuᵢ²/n².
 */
export function stiffnessFit(modes: { d: number; uRel: number }[]): StiffnessFit | null {
  const n = modes.length;
  if (!n) return null;
  const mean = modes.reduce((a, m) => a + m.d, 0) / n;
  const sd = n > 1 ? Math.sqrt(modes.reduce((a, m) => a + (m.d - mean) ** 2, 0) / (n - 1)) : null;
  const measurement = modes.reduce((a, m) => a + m.uRel * m.uRel, 0) / (n * n);
  const uLn = Math.sqrt((sd !== null ? (sd * sd) / n : 0) + measurement);
  const k = Math.exp(mean);
  return { k, uK: k * uLn, n, scatterCents: sd !== null ? sd * CENTS_PER_NEPER : null };
}

/**
 * Matches further predicted modes at a fixed k (the support modes of a held model, whose frequency
 * depends on the hand or stand, not on the metal): same gate, same sorted assignment.
 */
export function matchAtScale(set: MatchSet, k: number, opts: MatchOptions = defaultMatchOptions): MatchedPair[] {
  const p = prepare(set.predicted);
  const m = prepare(set.measured);
  const s = Math.log(k);
  return assignSorted(p, m, s, opts.gateCents / CENTS_PER_NEPER).pairs.map(([i, j]) => ({
    predictedKey: p[i].key,
    measuredKey: m[j].key,
    predictedHz: p[i].hz,
    measuredHz: m[j].hz,
    residualCents: (m[j].ln - s - p[i].ln) * CENTS_PER_NEPER,
    inFit: false,
  }));
}
