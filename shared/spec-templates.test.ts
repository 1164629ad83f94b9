import { describe, expect, it } from "vitest";
import { families, specInputSchema } from "./schemas/spec.ts";
import { FORK_OVERTONE_RATIO_THEORY, FREE_FREE_OVERTONE_RATIOS, specTemplate } from "./spec-templates.ts";

// Independent check of the template ratios: solve the Euler–Bernoulli characteristic equations
// here, by bisection, instead of trusting any tabulated constant (Thomson, Theory of Vibration with
// Applications, App. D; Blevins, Formulas for Natural Frequency and Mode Shape, ch. 8):
//   clamped–free (cantilever):  cos(βL)·cosh(βL) = −1
//   free–free:                  cos(βL)·cosh(βL) = +1
// The n-th root lies in ((n − ½)π − ½, (n − ½)π + ½) for the cantilever and near (n + ½)π for
// free–free; those brackets hold exactly one sign change each.
function bisect(f: (x: number) => number, lo: number, hi: number): number {
  expect(Math.sign(f(lo))).not.toBe(Math.sign(f(hi)));
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (Math.sign(f(lo)) === Math.sign(f(mid))) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}
const cantileverRoot = (n: number) => bisect((x) => Math.cos(x) * Math.cosh(x) + 1, (n - 0.5) * Math.PI - 0.5, (n - 0.5) * Math.PI + 0.5);
const freeFreeRoot = (n: number) => bisect((x) => Math.cos(x) * Math.cosh(x) - 1, (n + 0.5) * Math.PI - 0.5, (n + 0.5) * Math.PI + 0.5);
const centsBetween = (a: number, b: number) => 1200 * Math.log2(a / b); // cents: 1200·log2(f/fref)

describe("beam roots solved in the test", () => {
  it("reproduce the handbook roots 1.8751, 4.6941 (cantilever) and 4.7300, 7.8532, 10.9956, 14.1372 (free–free)", () => {
    // Blevins Table 8-1 / Thomson App. D, four decimals.
    expect(cantileverRoot(1)).toBeCloseTo(1.8751, 4);
    expect(cantileverRoot(2)).toBeCloseTo(4.6941, 4);
    [4.73, 7.8532, 10.9956, 14.1372].forEach((r, i) => expect(freeFreeRoot(i + 1)).toBeCloseTo(r, 4));
  });
});

describe("specTemplate", () => {
  it("gives every family a template the spec schema accepts", () => {
    for (const family of families) {
      const t = specTemplate(family);
      const parsed = specInputSchema.safeParse(t);
      expect(parsed.success, `${family}: ${parsed.success ? "" : JSON.stringify(parsed.error.issues)}`).toBe(true);
      expect(t.family).toBe(family);
      expect(t.partials.filter((p) => p.isFundamental)).toHaveLength(1);
      expect(t.description!.length).toBeLessThanOrEqual(2000);
    }
  });

  it("starts each fundamental at A4 = 440 Hz (ISO 16:1975)", () => {
    for (const family of families) {
      const f = specTemplate(family).partials.find((p) => p.isFundamental)!;
      expect(f.targetKind).toBe("absolute");
      expect(f.targetHz).toBe(440);
      expect(f.required).toBe(true);
    }
  });

  it("puts a fork's overtone at the cantilever ratio (β₂L/β₁L)², within 0.5 cent of the solved roots", () => {
    const expected = (cantileverRoot(2) / cantileverRoot(1)) ** 2; // ≈ 6.2669
    const fork = specTemplate("tuning_fork");
    const overtone = fork.partials.find((p) => !p.isFundamental)!;
    expect(overtone.targetKind).toBe("ratio");
    expect(Math.abs(centsBetween(overtone.ratio!, expected))).toBeLessThan(0.5);
    expect(FORK_OVERTONE_RATIO_THEORY).toBe(overtone.ratio);
    expect(fork.partials.find((p) => p.isFundamental)!.toleranceCents).toBe(5);
    // Its tolerance covers a real fork's ~6× overtone (common practice, no published source).
    expect(Math.abs(centsBetween(6, overtone.ratio!))).toBeLessThan(overtone.toleranceCents);
  });

  it("puts bar and tube overtones at the free–free ratios (βₙL/β₁L)², within 0.5 cent of the solved roots", () => {
    const r1 = freeFreeRoot(1);
    const expected = [2, 3, 4].map((n) => (freeFreeRoot(n) / r1) ** 2); // ≈ 2.7566, 5.4040, 8.9330
    for (const family of ["free_bar", "tube"] as const) {
      const ratios = specTemplate(family).partials.filter((p) => p.targetKind === "ratio").map((p) => p.ratio!);
      expect(ratios).toHaveLength(3);
      ratios.forEach((r, i) => expect(Math.abs(centsBetween(r, expected[i]))).toBeLessThan(0.5));
    }
    expect(FREE_FREE_OVERTONE_RATIOS).toEqual([1, 2.757, 5.404, 8.933]);
  });

  it("gives handbells, bowls and other parts a fundamental only", () => {
    for (const family of ["handbell", "bowl", "other"] as const) {
      expect(specTemplate(family).partials).toHaveLength(1);
    }
  });

  it("widens the tolerance on higher overtones and returns a fresh object each call", () => {
    const bar = specTemplate("free_bar");
    const tolerances = bar.partials.map((p) => p.toleranceCents);
    expect([...tolerances].sort((a, b) => a - b)).toEqual(tolerances);
    bar.partials[0].targetHz = 523.25;
    expect(specTemplate("free_bar").partials[0].targetHz).toBe(440);
  });
});
