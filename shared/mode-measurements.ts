/**
 * The measured modes of a design: partials of many strikes of many units gathered into one mode
 * each, with the frequency across units and τ per support, and what the hold does to each mode
 * (τ_held / τ_free over the units struck both ways). Pure; Hz, s.
 */
import type { HoldEffect, HoldVerdict, MeasuredModeView, ModeKind, TauBySupport } from "./schemas/modes.ts";
import type { Support } from "./schemas/spec.ts";

export type StrikeObservation = { unitId: string; strikeId: string; segment: number; support: Support | null };

export type PartialObservation = StrikeObservation & {
  /** At the reference temperature, Hz. */
  frequencyHz: number;
  frequencyUncertaintyHz: number;
  tauS: number;
  tauUncertaintyS: number;
  /** False when the partial decayed too little within the recording for τ to be read. */
  tauReliable: boolean;
};

/**
 * Two partials closer than this (cents) are the same mode. Units of one batch sit within a few
 * cents to a few tens of cents of each other, and neighbouring modes of forks, bars and bells are
 * hundreds of cents apart (see shared/evaluation.ts), so 35 cents joins a batch's scatter without
 * joining neighbours. Our own choice; a part with closer modes shows as two measured modes when the
 * units' scatter is smaller than their spacing.
 */
export const SAME_MODE_CENTS = 35;

/**
 * Hold verdict thresholds on τ_held / τ_free, our own choice: at half the free τ or less the hold
 * takes most of the ring (T60 halves too, which any listener hears); within 20 % of the free τ is
 * within the scatter of hand-held strikes; between the two, partly damped.
 */
export const DAMPED_AT_MOST = 0.5;
export const RINGS_AT_LEAST = 0.8;

const HELD: Extract<Support, "hand" | "stand">[] = ["hand", "stand"];

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

function sampleSd(xs: number[]): number | null {
  if (xs.length < 2) return null;
  const m = xs.reduce((a, b) => a + b, 0) / xs.length;
  return Math.sqrt(xs.reduce((a, x) => a + (x - m) ** 2, 0) / (xs.length - 1));
}

/**
 * Gathers partials into modes: sorted by frequency, a gap of more than {@link SAME_MODE_CENTS}
 * starts a new mode; a group holding two partials of one strike is split at its widest gap until no
 * strike appears twice (two partials of one strike are two modes, however close).
 */
export function clusterPartials(partials: PartialObservation[], sameModeCents = SAME_MODE_CENTS): PartialObservation[][] {
  const sorted = partials.filter((p) => Number.isFinite(p.frequencyHz) && p.frequencyHz > 0).sort((a, b) => a.frequencyHz - b.frequencyHz);
  const groups: PartialObservation[][] = [];
  const gap = (a: PartialObservation, b: PartialObservation) => 1200 * Math.log2(b.frequencyHz / a.frequencyHz);
  for (const p of sorted) {
    const last = groups[groups.length - 1];
    if (last && gap(last[last.length - 1], p) <= sameModeCents) last.push(p);
    else groups.push([p]);
  }
  const out: PartialObservation[][] = [];
  const split = (g: PartialObservation[]) => {
    const seen = new Set<string>();
    const repeated = g.some((p) => {
      const key = `${p.strikeId}#${p.segment}`;
      if (seen.has(key)) return true;
      seen.add(key);
      return false;
    });
    if (!repeated || g.length < 2) return void out.push(g);
    let at = 1;
    for (let i = 2; i < g.length; i++) if (gap(g[i - 1], g[i]) > gap(g[at - 1], g[at])) at = i;
    split(g.slice(0, at));
    split(g.slice(at));
  };
  groups.forEach(split);
  return out;
}

type PerUnit = Map<string, Map<Support | "unknown", PartialObservation[]>>;

function byUnitAndSupport(group: PartialObservation[]): PerUnit {
  const out: PerUnit = new Map();
  for (const p of group) {
    const unit = out.get(p.unitId) ?? new Map();
    const key = p.support ?? "unknown";
    unit.set(key, [...(unit.get(key) ?? []), p]);
    out.set(p.unitId, unit);
  }
  return out;
}

/** Each unit's median τ under one support (reliable τ only), and the relative uncertainty of that median. */
function unitTau(list: PartialObservation[] | undefined): { tau: number; uRel: number } | null {
  const ok = (list ?? []).filter((p) => p.tauReliable && p.tauS > 0);
  if (!ok.length) return null;
  const tau = median(ok.map((p) => p.tauS));
  const fitU = median(ok.map((p) => p.tauUncertaintyS)) / Math.sqrt(ok.length);
  const sd = sampleSd(ok.map((p) => p.tauS));
  // Strike-to-strike scatter of τ (the hand is never placed twice the same way) where there are several strikes.
  const scatter = sd !== null ? (1.2533 * sd) / Math.sqrt(ok.length) : 0;
  return { tau, uRel: Math.hypot(fitU, scatter) / tau };
}

/**
 * τ_held / τ_free of one mode over the units struck both ways with `support` and suspended:
 * geometric mean of the per-unit ratios, with the standard uncertainty of that mean from the spread
 * between units (GUM §4.2, type A) and the units' own τ uncertainties (GUM §5.1.6, relative form).
 */
export function holdRatio(units: { held: { tau: number; uRel: number }; free: { tau: number; uRel: number } }[]): { ratio: number; uncertainty: number } | null {
  if (!units.length) return null;
  const d = units.map((u) => Math.log(u.held.tau / u.free.tau));
  const n = d.length;
  const mean = d.reduce((a, b) => a + b, 0) / n;
  const sd = sampleSd(d);
  const own = units.reduce((a, u) => a + u.held.uRel ** 2 + u.free.uRel ** 2, 0) / (n * n);
  const uLn = Math.sqrt((sd !== null ? (sd * sd) / n : 0) + own);
  const ratio = Math.exp(mean);
  return { ratio, uncertainty: ratio * uLn };
}

export function holdVerdict(ratio: number): Exclude<HoldVerdict, "support_mode"> {
  if (ratio <= DAMPED_AT_MOST) return "damped";
  if (ratio >= RINGS_AT_LEAST) return "rings";
  return "partly_damped";
}

/** Measurement against the model's label: balanced modes should ring when held, unbalanced ones be damped. */
export function holdAgreement(verdict: HoldVerdict, kind: ModeKind | null): HoldEffect["agreement"] {
  if (kind === "balanced") return verdict === "rings" ? "agrees" : verdict === "damped" || verdict === "support_mode" ? "disagrees" : null;
  if (kind === "unbalanced") return verdict === "damped" ? "agrees" : verdict === "rings" || verdict === "support_mode" ? "disagrees" : null;
  if (kind === "support") return verdict === "support_mode" ? "agrees" : "disagrees";
  return null;
}

/**
 * The measured modes of a set of strikes. `strikes` lists every analysed strike segment in scope
 * (also those in which a mode was not found: a mode missing from a held strike of a unit that rang
 * it suspended is "gone when held").
 */
export function measuredModes(strikes: StrikeObservation[], partials: PartialObservation[], sameModeCents = SAME_MODE_CENTS): MeasuredModeView[] {
  // Which supports each unit was struck with.
  const struck = new Map<string, Set<Support | "unknown">>();
  for (const s of strikes) {
    const set = struck.get(s.unitId) ?? new Set();
    set.add(s.support ?? "unknown");
    struck.set(s.unitId, set);
  }
  const bothWays = (support: Support) => [...struck].filter(([, set]) => set.has("suspended") && set.has(support)).map(([unit]) => unit);
  const anyBothWays = HELD.some((s) => bothWays(s).length > 0);

  return clusterPartials(partials, sameModeCents).map((group, id) => {
    const perUnit = byUnitAndSupport(group);
    const unitMedians = [...perUnit.values()].map((m) => median([...m.values()].flat().map((p) => p.frequencyHz)));
    const measuredHz = median(unitMedians);
    const spread = sampleSd(unitMedians);
    const fitU = median(group.map((p) => p.frequencyUncertaintyHz));
    // Standard uncertainty of a median of n normal values is about 1.2533·σ/√n.
    const measuredUncertaintyHz = Math.hypot(spread !== null ? (1.2533 * spread) / Math.sqrt(unitMedians.length) : 0, fitU / Math.sqrt(unitMedians.length));
    const medianOf = (supports: Support[]) => {
      const values = [...perUnit.values()].flatMap((m) => {
        const list = supports.flatMap((s) => m.get(s) ?? []);
        return list.length ? [median(list.map((p) => p.frequencyHz))] : [];
      });
      return values.length ? median(values) : null;
    };
    const tauOf = (support: Support) => {
      const values = [...perUnit.values()].map((m) => unitTau(m.get(support))?.tau).filter((t): t is number => t !== undefined);
      return values.length ? median(values) : null;
    };
    const tauBySupport: TauBySupport = { hand: tauOf("hand"), suspended: tauOf("suspended"), stand: tauOf("stand") };

    const seenFree = group.some((p) => p.support === "suspended");
    const seenHeldInBothWaysUnit = HELD.some((s) => bothWays(s).some((u) => perUnit.get(u)?.has(s)));
    const supportMode = !anyBothWays ? null : !seenFree && seenHeldInBothWaysUnit;

    let holdEffect: HoldEffect | null = null;
    const candidates = HELD.map((support) => {
      const units = bothWays(support).filter((u) => perUnit.has(u));
      const pairs: { held: { tau: number; uRel: number }; free: { tau: number; uRel: number } }[] = [];
      let gone = 0;
      for (const u of units) {
        const m = perUnit.get(u)!;
        const free = unitTau(m.get("suspended"));
        const held = unitTau(m.get(support));
        if (m.has("suspended") && !m.has(support)) gone++;
        else if (free && held) pairs.push({ held, free });
      }
      return { support, units: units.length, pairs, gone };
    }).filter((c) => c.units > 0);
    if (candidates.length) {
      const c = candidates.sort((a, b) => b.units - a.units)[0];
      const r = holdRatio(c.pairs);
      let verdict: HoldVerdict;
      if (supportMode) verdict = "support_mode";
      // Gone in most held strikes of the units that rang it free: the hold took it.
      else if (c.gone > c.pairs.length || !r) verdict = "damped";
      else verdict = holdVerdict(r.ratio);
      holdEffect = { support: c.support, ratio: r?.ratio ?? null, ratioUncertainty: r?.uncertainty ?? null, units: c.units, goneWhenHeld: c.gone, verdict, modelKind: null, agreement: null };
    }
    return {
      id,
      measuredHz,
      measuredSpreadHz: spread,
      measuredUncertaintyHz,
      freeHz: medianOf(["suspended"]),
      heldHz: medianOf(HELD),
      units: perUnit.size,
      tauBySupport,
      holdEffect,
      supportMode,
    };
  });
}
