/** Number formats for the strike page; every number carries its unit. */

/** A frequency with a precision that suits its size (Hz). */
export function formatHz(hz: number, digits?: number): string {
  const d = digits ?? (hz < 100 ? 2 : hz < 10_000 ? 1 : 0);
  return `${hz.toLocaleString("en-GB", { minimumFractionDigits: d, maximumFractionDigits: d })} Hz`;
}

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };

/** 4.7 × 10⁻⁷ — two significant digits in scientific notation. */
export function scientific(value: number): string {
  const e = Math.floor(Math.log10(Math.abs(value)));
  const m = value / Math.pow(10, e);
  return `${m.toFixed(1)} × 10${String(e).replace(/./g, (c) => SUPERSCRIPT[c] ?? c)}`;
}

/**
 * A value and its standard uncertainty, rounded so the uncertainty has two significant digits
 * (the usual way to quote a result; GUM JCGM 100:2008 §7.2.6). Past `maxDecimals` the value is
 * cut there and the uncertainty is written in scientific notation, so a synthetic or very clean
 * strike does not print ten decimals.
 */
export function splitUncertainty(value: number, u: number, maxDecimals = 4): { value: string; u: string | null } {
  if (!Number.isFinite(u) || u <= 0) return { value: value.toFixed(Math.min(3, maxDecimals)), u: null };
  const decimals = Math.max(0, 1 - Math.floor(Math.log10(u)));
  if (decimals > maxDecimals) return { value: value.toFixed(maxDecimals), u: scientific(u) };
  return { value: value.toFixed(decimals), u: u.toFixed(decimals) };
}

/** One-line form of splitUncertainty: "440.305 ± 0.012 Hz". */
export function withUncertainty(value: number, u: number, unit: string, maxDecimals = 4): string {
  const s = splitUncertainty(value, u, maxDecimals);
  return s.u === null ? `${s.value} ${unit}` : `${s.value} ± ${s.u} ${unit}`;
}

export function fixed(value: number, decimals: number): string {
  return value.toFixed(decimals);
}

export function signed(value: number, decimals: number): string {
  const s = value.toFixed(decimals);
  // A typographic minus reads better in tables than a hyphen.
  return value > 0 ? `+${s}` : s.replace("-", "−");
}

/** Why τ, T60 and Q of a partial are not to be trusted, in a few words (the strike's warnings say more), or null. */
export function unreliableReason(p: { tauUnreliable: boolean; nonExponential?: boolean; roomMasked?: boolean; earlyStageOverlap?: boolean }): string | null {
  if (!p.tauUnreliable) return null;
  if (p.nonExponential) return "decay not exponential";
  if (p.roomMasked) return "masked by the room";
  if (p.earlyStageOverlap) return "early decay overlaps";
  return "record longer";
}
