/**
 * The Modes page's sentences and its CSV, on a hand-made mode map. Arithmetic checked by hand:
 * k = 0.9722 gives k² − 1 = −5.48 % (less stiff) and 1200·log2(0.9722) = −48.8 cents.
 */
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import type { HoldEffect, MeasuredModeView, ModeMap, ModeMapRow } from "@shared/schemas/modes";
import { modeMapCsv } from "./mode-csv";
import { holdSentences, ratioText, residualSentences, stiffnessSentence, withUncertainty } from "./words";

const none = { hand: null, suspended: null, stand: null };
const hold = (o: Partial<HoldEffect>): HoldEffect => ({ support: "hand", ratio: 0.9, ratioUncertainty: 0.02, units: 5, goneWhenHeld: 0, verdict: "rings", modelKind: null, agreement: null, ...o });
const row = (o: Partial<ModeMapRow>): ModeMapRow => ({
  mode: 8,
  label: "first balanced",
  kind: "balanced",
  condition: "free",
  listId: "l",
  predictedHz: 452.9,
  calibratedHz: 440.3,
  measuredHz: 440.4,
  measuredSpreadHz: 1.4,
  ratio: 0.9724,
  residualCents: 0.3,
  inFit: true,
  units: 10,
  tauBySupport: { hand: 5.38, suspended: 5.84, stand: null },
  holdEffect: hold({}),
  measuredModeId: 1,
  ...o,
});
const measured = (o: Partial<MeasuredModeView>): MeasuredModeView => ({ id: 0, measuredHz: 83, measuredSpreadHz: 0.5, measuredUncertaintyHz: 0.3, freeHz: null, heldHz: 83, units: 5, tauBySupport: { ...none, hand: 0.18 }, holdEffect: hold({ ratio: null, ratioUncertainty: null, verdict: "support_mode" }), supportMode: true, ...o });

function mapOf(o: Partial<ModeMap>): ModeMap {
  return {
    stiffnessFactor: 0.9722,
    stiffnessFactorUncertainty: 0.0011,
    youngsModulusGPa: 198.47,
    youngsModulusUncertaintyGPa: 0.44,
    youngsModulusSource: "model",
    modelYoungsModulusGPa: 210,
    modelDensityKgM3: 7850,
    fitModes: 12,
    modes: [],
    unmatchedPartials: [],
    measuredModes: [],
    models: [{ id: "l", specId: "s", specVersionId: "v", version: 1, condition: "free", name: "Free", sourceName: null, youngsModulusGPa: 210, densityKgM3: 7850, createdAt: "", createdBy: null }],
    geometry: null,
    scope: { batch: null, specVersion: 1, units: [], unitsMeasured: 10, unitsBothWays: 5, strikes: { hand: 15, suspended: 5, stand: 0, other: 0, unknown: 0 }, referenceTemperatureC: 20 },
    ...o,
  };
}

describe("stiffnessSentence", () => {
  it("says how much stiffer or softer the parts are, with E and k and their uncertainties", () => {
    const s = stiffnessSentence(mapOf({}));
    expect(s).toContain("The parts are 5.5 % less stiff than the model assumed: E ≈ 198.47 ± 0.44 GPa instead of 210 GPa");
    expect(s).toContain("2.8 % (−48.8 ¢) below");
    expect(s).toContain("k = 0.9722 ± 0.0011, standard uncertainty");
  });
  it("asks for the model's modulus when it is missing, and for a model when there is none", () => {
    expect(stiffnessSentence(mapOf({ youngsModulusGPa: null, youngsModulusUncertaintyGPa: null, modelYoungsModulusGPa: null }))).toMatch(/Enter the Young's modulus the model assumed/);
    expect(stiffnessSentence(mapOf({ stiffnessFactor: null, stiffnessFactorUncertainty: null, models: [] }))).toMatch(/^No model yet/);
  });
  it("rounds to the uncertainty's two significant figures (GUM 7.2.6)", () => {
    expect(withUncertainty(205.123, 2.04, " GPa")).toBe("205.1 ± 2.0 GPa");
    expect(ratioText(0.1829, 0.0035)).toBe("0.183 ± 0.004");
    expect(ratioText(0.918, 0.013)).toBe("0.92 ± 0.01");
  });
});

describe("residual and hold sentences", () => {
  it("names a mode that stays off once, with each model's residual", () => {
    const rows = [row({ mode: 10, label: "Twist", inFit: false, residualCents: 45.3, measuredModeId: 4 }), row({ mode: 6, label: "Twist", condition: "held", inFit: false, residualCents: 40.7, measuredModeId: 4 })];
    const s = residualSentences(rows);
    expect(s).toHaveLength(1);
    expect(s[0]).toMatch(/^Mode 10 \(Twist\) stays \+45\.3 ¢ off in the free model after calibration \(\+40\.7 ¢ in the held model, its mode 6\)/);
  });
  it("counts what the hold does, lists the modes of the support, and says where the model disagrees", () => {
    const disagree = row({ mode: 11, label: "Out of plane", kind: "unbalanced", holdEffect: hold({ ratio: 0.92, ratioUncertainty: 0.013, agreement: "disagrees", modelKind: "unbalanced" }), measuredModeId: 2 });
    const map = mapOf({
      modes: [disagree],
      measuredModes: [measured({}), measured({ id: 1, supportMode: false, measuredHz: 440, holdEffect: hold({}) }), measured({ id: 2, supportMode: false, measuredHz: 1825, holdEffect: hold({ ratio: 0.92 }) }), measured({ id: 3, supportMode: false, measuredHz: 686, holdEffect: hold({ ratio: 0.18, verdict: "damped" }) })],
    });
    expect(holdSentences(map)).toEqual([
      "Held in the hand (5 units struck both ways): of the modes of the part, 2 ring on, 1 damped by the hold.",
      "One partial appears only when held — modes of the support: 83.0 Hz.",
      "The free model calls its mode 11 (Out of plane) unbalanced, but it rings when held (τ held/free 0.92 ± 0.01): model and measurement disagree.",
    ]);
  });
  it("tells what to do when no unit was struck both ways", () => {
    expect(holdSentences(mapOf({ scope: { ...mapOf({}).scope, unitsBothWays: 0 } }))[0]).toMatch(/strike a few units both ways/);
  });
});

describe("modeMapCsv (read back with papaparse, RFC 4180)", () => {
  it("has one row per predicted mode and per unmatched partial, numbers with a decimal point", () => {
    const map = mapOf({ modes: [row({}), row({ mode: 1, kind: "rigid_body", predictedHz: 0.0003, measuredHz: null, calibratedHz: null, ratio: null, residualCents: null, inFit: null, units: 0, tauBySupport: none, holdEffect: null, label: 'tines, "in" plane' })], unmatchedPartials: [measured({})] });
    const parsed = Papa.parse<Record<string, string>>(modeMapCsv(map), { header: true, skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toHaveLength(3);
    expect(parsed.data[0]).toMatchObject({ model: "free", mode: "8", predictedHz: "452.900", measuredHz: "440.400", residualCents: "0.3", inFit: "yes", tauSuspendedS: "5.840", tauHeldOverFree: "0.900", holdEffect: "rings" });
    expect(parsed.data[1]).toMatchObject({ label: 'tines, "in" plane', kind: "rigid_body", predictedHz: "0.000300", measuredHz: "" });
    expect(parsed.data[2]).toMatchObject({ model: "measured only", kind: "support", measuredHz: "83.000", holdEffect: "support_mode" });
  });
});
