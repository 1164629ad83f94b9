import { describe, expect, it } from "vitest";
import { families, specInputSchema } from "./schemas/spec.ts";
import { BELL_PARTIAL_RATIOS, FORK_OVERTONE_RATIO_THEORY, FREE_FREE_OVERTONE_RATIOS, specTemplate } from "./spec-templates.ts";

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
const parsed = (family: (typeof families)[number]) => specInputSchema.parse(specTemplate(family));

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
      const result = specInputSchema.safeParse(t);
      expect(result.success, `${family}: ${result.success ? "" : JSON.stringify(result.error.issues)}`).toBe(true);
      expect(t.family).toBe(family);
      expect(t.partials.filter((p) => p.isFundamental)).toHaveLength(1);
      expect(t.description!.length).toBeLessThanOrEqual(2000);
    }
  });

  it("speaks as a professional: no source marks meant for contributors, and says where a value is a starting point", () => {
    for (const family of families) {
      const text = specTemplate(family).description!;
      expect(text, family).not.toMatch(/from memory|common practice|no published source|quoted/i);
      expect(text, family).toContain("typical starting value");
      expect(text, family).toContain("confirm with your own");
    }
  });

  it("starts each fundamental at a note at A4 = 440 Hz (ISO 16:1975): A4 for most, C5 for the chime tube", () => {
    for (const family of families) {
      const s = parsed(family);
      expect(s.referencePitchHz).toBe(440);
      const f = s.partials.find((p) => p.isFundamental)!;
      expect(f.required).toBe(true);
      if (family === "tube") {
        expect(f.targetKind).toBe("strike_note");
        expect(f.targetNote).toBe("C5");
        expect(f.targetHz).toBeCloseTo(440 * 2 ** (3 / 12), 9); // 523.2511 Hz, three semitones above A4
      } else {
        expect(f.targetKind).toBe("absolute");
        expect(f.targetNote).toBe("A4");
        expect(f.targetHz).toBe(440);
      }
    }
  });

  it("puts a fork's overtone at the cantilever ratio (β₂L/β₁L)², within 0.5 cent of the solved roots", () => {
    const expected = (cantileverRoot(2) / cantileverRoot(1)) ** 2; // ≈ 6.2669
    const fork = parsed("tuning_fork");
    const overtone = fork.partials.find((p) => !p.isFundamental)!;
    expect(overtone.targetKind).toBe("ratio");
    expect(Math.abs(centsBetween(overtone.ratio!, expected))).toBeLessThan(0.5);
    expect(FORK_OVERTONE_RATIO_THEORY).toBe(overtone.ratio);
    expect(fork.partials.find((p) => p.isFundamental)!.toleranceCents).toBe(5);
    // Its tolerance covers a real fork's ~6× overtone (common practice, no published source).
    expect(Math.abs(centsBetween(6, overtone.ratio!))).toBeLessThan(overtone.toleranceCents);
  });

  it("puts bar overtones at the free–free ratios (βₙL/β₁L)², within 0.5 cent of the solved roots", () => {
    const r1 = freeFreeRoot(1);
    const expected = [2, 3, 4].map((n) => (freeFreeRoot(n) / r1) ** 2); // ≈ 2.7566, 5.4040, 8.9330
    const ratios = parsed("free_bar").partials.filter((p) => p.targetKind === "ratio").map((p) => p.ratio!);
    expect(ratios).toHaveLength(3);
    ratios.forEach((r, i) => expect(Math.abs(centsBetween(r, expected[i]))).toBeLessThan(0.5));
    expect(FREE_FREE_OVERTONE_RATIOS).toEqual([1, 2.757, 5.404, 8.933]);
  });

  it("reads a chime tube by its strike note, with the 2 : 3 : 4 series optional and wide enough for a uniform tube", () => {
    const tube = parsed("tube");
    const series = tube.partials.filter((p) => p.targetKind === "ratio");
    expect(series.map((p) => p.ratio)).toEqual([2, 3, 4]);
    expect(series.every((p) => !p.required)).toBe(true);
    // Euler–Bernoulli 4th–6th free–free modes, (9π/2)² : (11π/2)² : (13π/2)² ≈ 2 : 2.988 : 4.173 of
    // half the 4th: the tolerance must cover the 4.173 (+73 cents).
    const [m4, m5, m6] = [4, 5, 6].map((n) => freeFreeRoot(n) ** 2);
    expect(Math.abs(centsBetween((2 * m6) / m4, 4))).toBeLessThan(series[2].toleranceCents);
    expect(Math.abs(centsBetween((2 * m5) / m4, 3))).toBeLessThan(series[1].toleranceCents);
  });

  it("names a bell's partials as the trade does, at the stated ratios to the prime, with no beam guidance", () => {
    const bell = parsed("handbell");
    expect(bell.partials.map((p) => p.label)).toEqual(["Hum", "Prime", "Tierce", "Quint", "Nominal"]);
    // The starting ratios (common practice for tuned bells): about 0.5, 1, 1.2, 1.5, 2.
    expect(BELL_PARTIAL_RATIOS.map((b) => b.ratio)).toEqual([0.5, 1, 1.2, 1.5, 2]);
    expect(bell.partials.filter((p) => p.targetKind === "ratio").map((p) => p.ratio)).toEqual([0.5, 1.2, 1.5, 2]);
    expect(bell.partials.find((p) => p.isFundamental)!.label).toBe("Prime");
    expect(bell.lengthMm).toBeNull();
    expect(bell.description).not.toMatch(/beam theory|Euler|cantilever/);
  });

  it("points bowls to a master unit and gives bowls and other parts a fundamental only", () => {
    for (const family of ["bowl", "other"] as const) expect(specTemplate(family).partials).toHaveLength(1);
    expect(specTemplate("bowl").description).toContain("master unit");
  });

  it("widens the tolerance on higher overtones and returns a fresh object each call", () => {
    const bar = specTemplate("free_bar");
    const tolerances = bar.partials.map((p) => p.toleranceCents!);
    expect([...tolerances].sort((a, b) => a - b)).toEqual(tolerances);
    bar.partials[0].targetHz = 523.25;
    expect(specTemplate("free_bar").partials[0].targetHz).toBe(440);
  });
});
