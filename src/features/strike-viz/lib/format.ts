/** Number formats for the strike page; every number carries its unit. */

/** A frequency with a precision that suits its size (Hz). */
export function formatHz(hz: number, digits?: number): string {
  const d = digits ?? (hz < 100 ? 2 : hz < 10_000 ? 1 : 0);
  return `${hz.toLocaleString("en-GB", { minimumFractionDigits: d, maximumFractionDigits: d })} Hz`;
}

/**
 * A value with its standard uncertainty, rounded so the uncertainty has two significant digits
 * (the usual way to quote a result with its uncertainty; GUM JCGM 100:2008 §7.2.6).
 */
export function withUncertainty(value: number, u: number, unit: string): string {
  if (!Number.isFinite(u) || u <= 0) return `${fixed(value, 3)} ${unit}`;
  const exponent = Math.floor(Math.log10(u)) - 1;
  const decimals = Math.max(0, -exponent);
  return `${value.toFixed(decimals)} ± ${u.toFixed(decimals)} ${unit}`;
}

export function fixed(value: number, decimals: number): string {
  return value.toFixed(decimals);
}

export function signed(value: number, decimals: number): string {
  const s = value.toFixed(decimals);
  // A typographic minus reads better in tables than a hyphen.
  return value > 0 ? `+${s}` : s.replace("-", "−");
}
