/**
 * Euler–Bernoulli beam templates: the natural frequency of a uniform beam, and the Young's modulus
 * a measured frequency implies, for a fork tine (cantilever, clamped at the crotch) and a bar
 * (free–free). SI units inside (m, Pa, kg/m³, Hz).
 *
 *   fₙ = (βₙL)² / (2π L²) · √(E·I / (ρ·A))   (Blevins, Formulas for Natural Frequency and Mode Shape,
 *                                              Table 8-1; Thomson, Theory of Vibration, App. D)
 *
 * so E = ρ · (2π fₙ L² / (βₙL)²)² / r², with r = √(I/A) the radius of gyration of the section:
 * h/√12 for a rectangle of thickness h in the plane of bending, d/4 for a round rod of diameter d.
 * Shear and rotary inertia are neglected, which holds for slender parts (length ≫ thickness).
 */
import { CANTILEVER_BETA_L, FREE_FREE_BETA_L } from "./physics.ts";

export type BeamTemplate = "cantilever" | "free_free";
export type BeamSection = { shape: "rectangular"; thicknessM: number } | { shape: "round"; diameterM: number };

export class BeamInputError extends Error {
  override name = "BeamInputError";
}

const ROOTS: Record<BeamTemplate, readonly number[]> = { cantilever: CANTILEVER_BETA_L, free_free: FREE_FREE_BETA_L };

function positive(value: number, what: string): number {
  if (!(Number.isFinite(value) && value > 0)) throw new BeamInputError(`${what} must be a positive number, got ${value}.`);
  return value;
}

/** βₙL of the template's n-th bending mode (n from 1). */
export function betaL(template: BeamTemplate, mode = 1): number {
  const root = ROOTS[template][mode - 1];
  if (root === undefined) throw new BeamInputError(`The ${template} template has roots for modes 1–${ROOTS[template].length}; mode ${mode} is not tabulated.`);
  return root;
}

/** Radius of gyration √(I/A) of the section about the bending axis, m. */
export function radiusOfGyrationM(section: BeamSection): number {
  return section.shape === "rectangular" ? positive(section.thicknessM, "Thickness") / Math.sqrt(12) : positive(section.diameterM, "Diameter") / 4;
}

/** Natural frequency of bending mode n, Hz. */
export function beamFrequencyHz(o: { template: BeamTemplate; mode?: number; lengthM: number; section: BeamSection; youngsModulusPa: number; densityKgM3: number }): number {
  const L = positive(o.lengthM, "Length");
  const b = betaL(o.template, o.mode ?? 1);
  const c = Math.sqrt(positive(o.youngsModulusPa, "Young's modulus") / positive(o.densityKgM3, "Density"));
  return ((b * b) / (2 * Math.PI * L * L)) * radiusOfGyrationM(o.section) * c;
}

/** Young's modulus implied by a measured frequency of bending mode n, Pa. */
export function youngsModulusFromFrequencyPa(o: { template: BeamTemplate; mode?: number; frequencyHz: number; lengthM: number; section: BeamSection; densityKgM3: number }): number {
  const L = positive(o.lengthM, "Length");
  const b = betaL(o.template, o.mode ?? 1);
  const f = positive(o.frequencyHz, "Frequency");
  const r = radiusOfGyrationM(o.section);
  const wave = (2 * Math.PI * f * L * L) / (b * b * r); // = √(E/ρ), m/s
  return positive(o.densityKgM3, "Density") * wave * wave;
}

/**
 * Relative standard uncertainty of E from the inputs' relative standard uncertainties, uncorrelated
 * (GUM, JCGM 100:2008 §5.1.6, for a product of powers): E ∝ ρ·f²·L⁴/h², so
 * u(E)/E = √((2·u_f/f)² + (4·u_L/L)² + (2·u_h/h)² + (u_ρ/ρ)²).
 */
export function youngsModulusRelativeUncertainty(r: { frequency: number; length: number; thickness: number; density: number }): number {
  return Math.hypot(2 * r.frequency, 4 * r.length, 2 * r.thickness, r.density);
}
