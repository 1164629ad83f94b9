/**
 * Matching under a common stiffness scale and the least-squares k, on synthetic sets with a known k
 * (invented numbers, exact by construction). The assignment step is checked against an outside
 * implementation of the Hungarian method (the `munkres` npm package, Munkres 1957) on random sets.
 */
import munkres from "munkres";
import { describe, expect, it } from "vitest";
import { mulberry32 } from "../fixtures/synth";
import { assignSorted, matchAtScale, matchModes, stiffnessFit } from "./mode-matching";

const CENTS = 1200 / Math.LN2;
const model = [452.9, 287.4, 706.2, 1163, 1874, 2762.7, 3620, 4410];
const predicted = model.map((f, i) => ({ key: `p${i}`, frequencyHz: f }));
const measuredAt = (k: number, f: number[] = model) => f.map((hz, i) => ({ key: `m${i}`, frequencyHz: hz * k }));

describe("matchModes on a set with a known k", () => {
  it("recovers k exactly and matches every mode to its own partial", () => {
    const k = 440 / 452.9;
    const r = matchModes([{ predicted, measured: measuredAt(k) }]);
    expect(r.fit!.k).toBeCloseTo(k, 12);
    expect(r.fit!.n).toBe(model.length);
    expect(r.pairs[0].map((p) => [p.predictedKey.slice(1), p.measuredKey.slice(1)]).every(([a, b]) => a === b)).toBe(true);
    for (const p of r.pairs[0]) expect(Math.abs(p.residualCents)).toBeLessThan(1e-9);
    // All the modes agree exactly: only the measurement term remains, and it is zero here.
    expect(r.fit!.uK).toBeLessThan(1e-12);
  });

  it("leaves a deliberately shifted mode as a residual, out of the fit, and still recovers k", () => {
    const k = 1.0154;
    const shifted = model.map((f, i) => (i === 3 ? f * 2 ** (60 / 1200) : f));
    const r = matchModes([{ predicted, measured: measuredAt(k, shifted) }]);
    expect(r.fit!.k).toBeCloseTo(k, 12);
    expect(r.fit!.n).toBe(model.length - 1);
    const off = r.pairs[0].find((p) => p.predictedKey === "p3")!;
    expect(off.measuredKey).toBe("m3");
    expect(off.residualCents).toBeCloseTo(60, 9);
    expect(off.inFit).toBe(false);
    expect(r.pairs[0].filter((p) => p.inFit).every((p) => Math.abs(p.residualCents) < 1e-9)).toBe(true);
  });

  it("handles a missing mode and an extra partial: both stay unmatched", () => {
    const k = 0.97;
    const measured = measuredAt(k).filter((m) => m.key !== "m5");
    measured.push({ key: "extra", frequencyHz: 1500 }, { key: "low", frequencyHz: 83.4 });
    const r = matchModes([{ predicted, measured }]);
    expect(r.fit!.k).toBeCloseTo(k, 12);
    expect(r.pairs[0].map((p) => p.predictedKey)).not.toContain("p5");
    expect(r.pairs[0].map((p) => p.measuredKey)).not.toContain("extra");
    expect(r.pairs[0].map((p) => p.measuredKey)).not.toContain("low");
    expect(r.pairs[0]).toHaveLength(model.length - 1);
  });

  it("finds a scale far from 1 when the modulus was badly guessed (k = 1.25)", () => {
    const r = matchModes([{ predicted, measured: measuredAt(1.25) }]);
    expect(r.fit!.k).toBeCloseTo(1.25, 12);
    expect(r.fit!.n).toBe(model.length);
  });

  it("shares one k between a free and a held model of the same part", () => {
    const k = 0.98;
    // The hold stiffens one mode by 3 % (51 cents): far enough off to be left out of the fit.
    const held = model.map((f, i) => (i === 0 ? f * 1.03 : f));
    const r = matchModes([
      { predicted, measured: measuredAt(k) },
      { predicted: held.map((f, i) => ({ key: `h${i}`, frequencyHz: f })), measured: measuredAt(k) },
    ]);
    expect(r.pairs[0]).toHaveLength(model.length);
    expect(r.pairs[1]).toHaveLength(model.length);
    expect(r.fit!.n).toBe(2 * model.length - 1);
    expect(r.fit!.k).toBeCloseTo(k, 12);
  });

  it("returns no fit when nothing is within reach", () => {
    expect(matchModes([{ predicted, measured: [{ key: "m", frequencyHz: 20 }] }]).fit).toBeNull();
    expect(matchModes([{ predicted: [], measured: measuredAt(1) }]).fit).toBeNull();
  });
});

describe("stiffnessFit uncertainty (GUM, JCGM 100:2008 §4.2 and §5.1.2)", () => {
  it("is the standard error of the mean log-ratio combined with the measurement term", () => {
    // d = ln(1.01), ln(1.03): mean ln(√(1.01·1.03)), s_d = |ln(1.03/1.01)|/√2.
    const d = [Math.log(1.01), Math.log(1.03)];
    const fit = stiffnessFit(d.map((x) => ({ d: x, uRel: 0.001 })))!;
    const sd = Math.abs(d[1] - d[0]) / Math.SQRT2;
    expect(fit.k).toBeCloseTo(Math.sqrt(1.01 * 1.03), 12);
    expect(fit.uK / fit.k).toBeCloseTo(Math.sqrt((sd * sd) / 2 + (2 * 1e-6) / 4), 12);
    expect(fit.scatterCents).toBeCloseTo(sd * CENTS, 9);
  });
  it("for one mode only the measurement term remains", () => {
    const fit = stiffnessFit([{ d: Math.log(1.02), uRel: 0.002 }])!;
    expect(fit.uK).toBeCloseTo(1.02 * 0.002, 12);
    expect(fit.scatterCents).toBeNull();
  });
});

describe("assignSorted against the Hungarian method (munkres npm package)", () => {
  it("finds the same optimal cost on random sets at a fixed scale", () => {
    const rand = mulberry32(14);
    const gate = 150 / CENTS;
    for (let trial = 0; trial < 300; trial++) {
      const n = 1 + Math.floor(rand() * 9);
      const m = 1 + Math.floor(rand() * 9);
      // Dense clusters on purpose, so many pairs compete within the gate.
      const p = Array.from({ length: n }, () => ({ ln: Math.log(400 + rand() * 300) })).sort((a, b) => a.ln - b.ln);
      const q = Array.from({ length: m }, () => ({ ln: Math.log(400 + rand() * 300) })).sort((a, b) => a.ln - b.ln);
      const s = (rand() - 0.5) * 0.1;
      const ours = assignSorted(p, q, s, gate);
      // Rectangular assignment where a pair outside the gate costs 0, as staying unmatched does.
      const cost = p.map((a) => q.map((b) => Math.min(0, (b.ln - s - a.ln) ** 2 - gate * gate)));
      const theirs = munkres(cost).reduce((sum, [i, j]) => sum + cost[i][j], 0);
      expect(ours.cost).toBeCloseTo(theirs, 12);
      // Our pairs are real matches (inside the gate), each item used once.
      expect(new Set(ours.pairs.map(([i]) => i)).size).toBe(ours.pairs.length);
      expect(new Set(ours.pairs.map(([, j]) => j)).size).toBe(ours.pairs.length);
    }
  });
});

describe("matchAtScale", () => {
  it("matches support modes at a given k without refitting it", () => {
    const pairs = matchAtScale({ predicted: [{ key: "s1", frequencyHz: 86 }, { key: "s2", frequencyHz: 205 }], measured: [{ key: "a", frequencyHz: 83.4 }, { key: "b", frequencyHz: 212.6 }] }, 0.97);
    expect(pairs.map((p) => [p.predictedKey, p.measuredKey])).toEqual([
      ["s1", "a"],
      ["s2", "b"],
    ]);
    expect(pairs[0].residualCents).toBeCloseTo(1200 * Math.log2(83.4 / (86 * 0.97)), 9);
  });
});
