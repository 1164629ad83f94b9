/**
 * The mode map assembled from model lists and measured modes (invented numbers with a known answer),
 * with a fact of the trade as check value (common practice, no published source): a steel fork
 * near 550 Hz in the model has its second balanced mode near 3.3 kHz, about 6× — below the 6.27×
 * of a cantilever (Blevins Table 8-1), because the stem is no rigid clamp — and the first six modes
 * of a free part are rigid-body modes near 0 Hz.
 */
import { describe, expect, it } from "vitest";
import { buildModeMap, geometryEstimate, isRigidBody } from "./mode-map";
import type { MeasuredModeView, ModeKind, PredictedMode } from "./schemas/modes";
import { modeMapQuerySchema } from "./schemas/modes";

const list = (condition: "free" | "held", modes: PredictedMode[], e: number | null = 200) => ({
  id: `list-${condition}`,
  specId: "s",
  specVersionId: "v",
  version: 1,
  condition,
  name: condition,
  sourceName: null,
  youngsModulusGPa: e,
  densityKgM3: 7850,
  createdAt: new Date(0).toISOString(),
  createdBy: null,
  modes,
});
const pm = (mode: number, frequencyHz: number, kind: ModeKind | null, label = ""): PredictedMode => ({ mode, frequencyHz, kind, label });
let nextId = 0;
const measured = (hz: number, o: Partial<MeasuredModeView> = {}): MeasuredModeView => ({
  id: nextId++,
  measuredHz: hz,
  measuredSpreadHz: hz * 0.002,
  measuredUncertaintyHz: hz * 0.0005,
  freeHz: hz,
  heldHz: hz,
  units: 10,
  tauBySupport: { hand: null, suspended: null, stand: null },
  holdEffect: null,
  supportMode: false,
  ...o,
});

// A free steel fork model: six rigid-body modes, then balanced and unbalanced modes.
const rigid = [0.0003, 0.0005, 0.0009, 0.0012, 0.0018, 0.0021].map((f, i) => pm(i + 1, f, null));
const forkModel = [...rigid, pm(7, 350, "unbalanced"), pm(8, 550, "balanced", "first balanced"), pm(9, 860, "unbalanced"), pm(10, 3300, "balanced", "second balanced")];

describe("a steel fork near 550 Hz (common practice, no published source)", () => {
  it("the first six modes of the free model are rigid-body motion near 0 Hz, the second balanced mode about 6× the first", () => {
    expect(forkModel.slice(0, 6).every((m) => isRigidBody(m))).toBe(true);
    expect(forkModel.slice(6).some((m) => isRigidBody(m))).toBe(false);
    expect(3300 / 550).toBeCloseTo(6, 1);
  });
  it("parts 2 % higher than the model: k = 1.02, E_eff = 1.02² × 200 = 208.08 GPa; rigid-body modes never matched", () => {
    nextId = 0;
    const parts = [350, 550, 860, 3300].map((f) => measured(f * 1.02));
    const map = buildModeMap([list("free", forkModel)], parts);
    expect(map.stiffnessFactor).toBeCloseTo(1.02, 12);
    expect(map.youngsModulusGPa).toBeCloseTo(208.08, 9);
    expect(map.modes.slice(0, 6).every((r) => r.kind === "rigid_body" && r.measuredHz === null && r.calibratedHz === null)).toBe(true);
    expect(map.modes.slice(6).map((r) => Math.round(r.measuredHz!))).toEqual([357, 561, 877, 3366]);
    expect(map.modes.slice(6).every((r) => Math.abs(r.residualCents!) < 1e-9 && r.ratio! > 1.0199)).toBe(true);
    expect(map.unmatchedPartials).toEqual([]);
  });
});

describe("free and held models with support modes and the hold effect", () => {
  nextId = 0;
  const hold = (ratio: number | null, verdict: "damped" | "rings" | "support_mode") => ({ support: "hand" as const, ratio, ratioUncertainty: 0.02, units: 4, goneWhenHeld: 0, verdict, modelKind: null, agreement: null });
  const parts = [
    measured(83.4, { supportMode: true, freeHz: null, holdEffect: hold(null, "support_mode") }),
    measured(440, { holdEffect: hold(0.9, "rings") }),
    measured(686, { holdEffect: hold(0.2, "damped") }),
    measured(1821, { holdEffect: hold(0.9, "rings") }), // the model says unbalanced
    measured(5000), // not in any model
  ];
  const k = 440 / 452.9;
  const free = list("free", [...rigid, pm(7, 452.9, "balanced"), pm(8, 706.1, "unbalanced"), pm(9, 1874.2, "unbalanced")], 210);
  const held = list("held", [pm(1, 86, "support"), pm(2, 453.5, "balanced"), pm(3, 712, "unbalanced"), pm(4, 1876, "unbalanced")], null);
  const map = buildModeMap([held, free], parts);

  it("fits one k over both models and E from the free model's modulus", () => {
    expect(map.stiffnessFactor!).toBeGreaterThan(k * 0.995);
    expect(map.stiffnessFactor!).toBeLessThan(k * 1.005);
    expect(map.modelYoungsModulusGPa).toBe(210);
    expect(map.youngsModulusGPa).toBeCloseTo(map.stiffnessFactor! ** 2 * 210, 9);
    expect(map.youngsModulusSource).toBe("model");
  });
  it("lists the free model first, and matches the support mode only to what rang when held", () => {
    expect(map.modes.map((r) => r.condition)).toEqual([...Array(9).fill("free"), ...Array(4).fill("held")]);
    const support = map.modes.find((r) => r.kind === "support")!;
    expect(support.measuredHz).toBe(83.4);
    expect(support.inFit).toBe(false);
    expect(map.modes.filter((r) => r.condition === "free" && r.measuredHz === 83.4)).toEqual([]);
  });
  it("says where the model and the measurement disagree", () => {
    const byHz = (hz: number) => map.modes.find((r) => r.condition === "held" && r.measuredHz === hz)!;
    expect(byHz(440).holdEffect).toMatchObject({ modelKind: "balanced", agreement: "agrees" });
    expect(byHz(686).holdEffect).toMatchObject({ modelKind: "unbalanced", agreement: "agrees" });
    expect(byHz(1821).holdEffect).toMatchObject({ modelKind: "unbalanced", agreement: "disagrees" });
    expect(byHz(83.4).holdEffect).toMatchObject({ modelKind: "support", agreement: "agrees" });
  });
  it("leaves the partial no model predicts unmatched", () => {
    expect(map.unmatchedPartials.map((m) => m.measuredHz)).toEqual([5000]);
  });
});

describe("only measurements, only a model", () => {
  it("without a model every measured mode is unmatched and k is unknown", () => {
    const map = buildModeMap([], [measured(440), measured(2690)]);
    expect(map.stiffnessFactor).toBeNull();
    expect(map.modes).toEqual([]);
    expect(map.unmatchedPartials).toHaveLength(2);
  });
  it("without measurements the model's modes are listed unmatched", () => {
    const map = buildModeMap([list("free", forkModel)], []);
    expect(map.stiffnessFactor).toBeNull();
    expect(map.youngsModulusGPa).toBeNull();
    expect(map.modes).toHaveLength(forkModel.length);
    expect(map.modes.every((r) => r.measuredHz === null)).toBe(true);
  });
});

describe("geometryEstimate: E from the fundamental and the beam template", () => {
  it("reads the measured fundamental of a fork as a cantilever tine (hand calculation in shared/beam.test.ts: 94 × 6 mm steel rings at 553.67 Hz with E = 200 GPa)", () => {
    const q = modeMapQuerySchema.parse({ lengthMm: "94", thicknessMm: "6", densityKgM3: "7850" });
    const g = geometryEstimate(q, "tuning_fork", 550, [measured(553.67), measured(3330)])!;
    expect(g.template).toBe("cantilever");
    expect(g.fundamentalHz).toBe(553.67);
    expect(g.youngsModulusGPa).toBeCloseTo(200, 1);
    expect(g.youngsModulusUncertaintyGPa).toBeGreaterThan(0);
  });
  it("needs the whole geometry, and a measured mode near the fundamental", () => {
    expect(geometryEstimate(modeMapQuerySchema.parse({ lengthMm: "94" }), "tuning_fork", 550, [measured(553)])).toBeNull();
    expect(geometryEstimate(modeMapQuerySchema.parse({ lengthMm: "94", thicknessMm: "6", densityKgM3: "7850" }), "tuning_fork", 550, [measured(1200)])).toBeNull();
    expect(geometryEstimate(modeMapQuerySchema.parse({ lengthMm: "94", thicknessMm: "6", densityKgM3: "7850" }), "handbell", 550, [measured(553)])).toBeNull();
  });
});
