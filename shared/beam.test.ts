/**
 * Euler–Bernoulli beam templates against hand calculations with the handbook roots
 * β₁L = 1.8751 (cantilever) and β₁L = 4.7300 (free–free) — R. D. Blevins, Formulas for Natural
 * Frequency and Mode Shape, Table 8-1; W. T. Thomson, Theory of Vibration with Applications, App. D —
 * and f = (βL)²/(2πL²)·√(EI/(ρA)). E ≈ 200 GPa and ρ ≈ 7850 kg/m³ are handbook values for carbon
 * steel. Every intermediate number below was worked by hand (and checked on a calculator).
 */
import { describe, expect, it } from "vitest";
import { BeamInputError, beamFrequencyHz, betaL, radiusOfGyrationM, youngsModulusFromFrequencyPa, youngsModulusRelativeUncertainty } from "./beam";

const STEEL = { youngsModulusPa: 200e9, densityKgM3: 7850 };

describe("free–free steel bar, 300 mm × 10 mm thick (β₁L = 4.7300)", () => {
  // r = h/√12 = 0.010/3.46410 = 2.88675 mm; √(E/ρ) = √(200e9/7850) = 5047.54 m/s; r·c = 14.5710 m²/s
  // (β₁L)² = 22.3729; 22.3729 / (2π·0.300²) = 22.3729 / 0.565487 = 39.5640 1/m²
  // f₁ = 39.5640 × 14.5710 = 576.49 Hz
  const bar = { template: "free_free" as const, lengthM: 0.3, section: { shape: "rectangular" as const, thicknessM: 0.01 } };
  it("rings at 576.49 Hz", () => {
    expect(radiusOfGyrationM(bar.section)).toBeCloseTo(0.00288675, 8);
    expect(beamFrequencyHz({ ...bar, ...STEEL })).toBeCloseTo(576.49, 1);
  });
  it("gives back E = 200 GPa from its own frequency", () => {
    expect(youngsModulusFromFrequencyPa({ ...bar, frequencyHz: 576.49, densityKgM3: 7850 }) / 1e9).toBeCloseTo(200, 1);
  });
  it("its second mode is 2.757× the first: (7.8532/4.7300)²", () => {
    expect(beamFrequencyHz({ ...bar, ...STEEL, mode: 2 }) / beamFrequencyHz({ ...bar, ...STEEL })).toBeCloseTo((7.8532 / 4.73) ** 2, 3);
  });
});

describe("steel fork tine as a cantilever, 94 mm × 6 mm thick (β₁L = 1.8751)", () => {
  // r = 0.006/√12 = 1.73205 mm; r·c = 0.00173205 × 5047.54 = 8.74260 m²/s
  // (β₁L)² = 3.51600; 3.51600 / (2π·0.094²) = 3.51600 / 0.0555186 = 63.3302 1/m²
  // f₁ = 63.3302 × 8.74260 = 553.67 Hz: a steel fork near 550 Hz has tines about this long
  // (common practice, no published source).
  const tine = { template: "cantilever" as const, lengthM: 0.094, section: { shape: "rectangular" as const, thicknessM: 0.006 } };
  it("rings at 553.67 Hz", () => {
    expect(beamFrequencyHz({ ...tine, ...STEEL })).toBeCloseTo(553.67, 1);
  });
  it("E from 553.67 Hz is 200 GPa; 3 % higher in pitch is 6.09 % stiffer (E ∝ f²)", () => {
    expect(youngsModulusFromFrequencyPa({ ...tine, frequencyHz: 553.67, densityKgM3: 7850 }) / 1e9).toBeCloseTo(200, 1);
    expect(youngsModulusFromFrequencyPa({ ...tine, frequencyHz: 553.67 * 1.03, densityKgM3: 7850 }) / 1e9).toBeCloseTo(200 * 1.0609, 1);
  });
  it("a round tine of 6 mm diameter has r = d/4 = 1.5 mm, so it rings 1.5/1.73205 = 0.866× as high", () => {
    const round = beamFrequencyHz({ ...tine, section: { shape: "round", diameterM: 0.006 }, ...STEEL });
    expect(round / beamFrequencyHz({ ...tine, ...STEEL })).toBeCloseTo(0.8660, 4);
  });
});

describe("preconditions and uncertainty", () => {
  it("names what is wrong", () => {
    expect(() => betaL("cantilever", 9)).toThrow(/modes 1–4/);
    expect(() => beamFrequencyHz({ template: "cantilever", lengthM: 0, section: { shape: "rectangular", thicknessM: 0.006 }, ...STEEL })).toThrow(BeamInputError);
  });
  it("combines relative uncertainties with the exponents of E ∝ ρ·f²·L⁴/h² (GUM §5.1.6)", () => {
    // 0.1 mm on 94 mm, 0.01 mm on 6 mm, 0.5 % density, 0.1 % frequency:
    // √((2·0.001)² + (4·0.0010638)² + (2·0.0016667)² + 0.005²) = √(4.000e-6 + 1.8108e-5 + 1.1111e-5 + 2.5e-5) = √5.8219e-5 = 0.007630
    expect(youngsModulusRelativeUncertainty({ frequency: 0.001, length: 0.1 / 94, thickness: 0.01 / 6, density: 0.005 })).toBeCloseTo(0.00763, 5);
  });
});
