/**
 * Gathering partials into measured modes, and the hold effect, on invented observations with a
 * known answer. (The same on real synthetic recordings through the analysis engine is in
 * tests/integration/modes.test.ts.)
 */
import { describe, expect, it } from "vitest";
import { clusterPartials, holdAgreement, holdRatio, holdVerdict, measuredModes, type PartialObservation, type StrikeObservation } from "./mode-measurements";
import type { Support } from "./schemas/spec";

function strikeOf(unitId: string, support: Support, n = 0): StrikeObservation {
  return { unitId, strikeId: `${unitId}-${support}-${n}`, segment: 0, support };
}
function obs(s: StrikeObservation, frequencyHz: number, tauS: number): PartialObservation {
  return { ...s, frequencyHz, frequencyUncertaintyHz: 0.001, tauS, tauUncertaintyS: 0.001, tauReliable: true };
}

describe("clusterPartials", () => {
  it("joins one mode's scatter across units and keeps neighbours apart", () => {
    const units = ["a", "b", "c"].map((u) => strikeOf(u, "hand"));
    const cents = [-9.4, 0.3, 12.6]; // 22 cents from lowest to highest
    const parts = units.flatMap((s, i) => [obs(s, 440 * 2 ** (cents[i] / 1200), 5), obs(s, 686 * 2 ** (cents[i] / 1200), 1)]);
    const groups = clusterPartials(parts);
    expect(groups.map((g) => g.length)).toEqual([3, 3]);
  });
  it("splits a group holding two partials of one strike (a close pair is two modes)", () => {
    const s = strikeOf("a", "hand");
    const t = strikeOf("b", "hand");
    const groups = clusterPartials([obs(s, 1000, 1), obs(s, 1010, 1), obs(t, 1001, 1), obs(t, 1011, 1)]);
    expect(groups.map((g) => g.map((p) => p.frequencyHz))).toEqual([
      [1000, 1001],
      [1010, 1011],
    ]);
  });
});

describe("holdRatio (GUM §4.2 type A over units, §5.1.6 relative form)", () => {
  it("is the geometric mean of the per-unit ratios", () => {
    const r = holdRatio([
      { held: { tau: 0.2, uRel: 0 }, free: { tau: 1, uRel: 0 } },
      { held: { tau: 0.45, uRel: 0 }, free: { tau: 1.5, uRel: 0 } },
    ])!;
    expect(r.ratio).toBeCloseTo(Math.sqrt(0.2 * 0.3), 12);
    const d = [Math.log(0.2), Math.log(0.3)];
    const sd = Math.abs(d[1] - d[0]) / Math.SQRT2;
    expect(r.uncertainty).toBeCloseTo(r.ratio * (sd / Math.SQRT2), 12);
  });
  it("thresholds: ≤ 0.5 damped, ≥ 0.8 rings, partly damped between", () => {
    expect([0.2, 0.5, 0.6, 0.79, 0.8, 1.1].map(holdVerdict)).toEqual(["damped", "damped", "partly_damped", "partly_damped", "rings", "rings"]);
  });
  it("compares with the model's labels", () => {
    expect(holdAgreement("rings", "balanced")).toBe("agrees");
    expect(holdAgreement("damped", "balanced")).toBe("disagrees");
    expect(holdAgreement("rings", "unbalanced")).toBe("disagrees");
    expect(holdAgreement("partly_damped", "unbalanced")).toBeNull();
    expect(holdAgreement("support_mode", "support")).toBe("agrees");
    expect(holdAgreement("rings", null)).toBeNull();
  });
});

describe("measuredModes: the same units held and suspended", () => {
  // Three units struck both ways, one only in the hand. Balanced fundamental barely damped by the
  // hand, an unbalanced mode damped to a fifth, one mode gone when held, a support mode only held.
  const strikes: StrikeObservation[] = [];
  const partials: PartialObservation[] = [];
  ["u1", "u2", "u3"].forEach((u, i) => {
    const free = strikeOf(u, "suspended");
    const hand = strikeOf(u, "hand");
    strikes.push(free, hand);
    const c = 1 + i * 0.001;
    partials.push(obs(free, 440 * c, 6), obs(hand, 440 * c, 5.4));
    partials.push(obs(free, 686 * c, 1.2), obs(hand, 686 * c, 0.24));
    partials.push(obs(free, 1160 * c, 0.9)); // not found in the hand
    partials.push(obs(hand, 83.4 * c, 0.18)); // the hand and the fork together
  });
  const only = strikeOf("u4", "hand");
  strikes.push(only);
  partials.push(obs(only, 440.5, 5));
  const modes = measuredModes(strikes, partials);

  it("finds four modes, median over units", () => {
    expect(modes.map((m) => Math.round(m.measuredHz))).toEqual([83, 440, 687, 1161]);
    expect(modes[1].units).toBe(4);
    expect(modes[1].tauBySupport).toEqual({ hand: 5.4, suspended: 6, stand: null });
  });
  it("marks the partial found only when held as a mode of the support", () => {
    expect(modes.map((m) => m.supportMode)).toEqual([true, false, false, false]);
    expect(modes[0].holdEffect!.verdict).toBe("support_mode");
  });
  it("gives τ_held/τ_free per mode over the units measured both ways", () => {
    expect(modes[1].holdEffect).toMatchObject({ support: "hand", units: 3, goneWhenHeld: 0, verdict: "rings" });
    expect(modes[1].holdEffect!.ratio).toBeCloseTo(0.9, 9);
    expect(modes[2].holdEffect!.ratio).toBeCloseTo(0.2, 9);
    expect(modes[2].holdEffect!.verdict).toBe("damped");
    expect(modes[3].holdEffect).toMatchObject({ ratio: null, goneWhenHeld: 3, verdict: "damped" });
  });
  it("cannot call anything a support mode before a unit is struck both ways", () => {
    const heldOnly = measuredModes([only], [obs(only, 440, 5), obs(only, 83, 0.2)]);
    expect(heldOnly.map((m) => m.supportMode)).toEqual([null, null]);
    expect(heldOnly.every((m) => m.holdEffect === null)).toBe(true);
  });
});
