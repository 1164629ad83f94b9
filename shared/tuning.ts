/**
 * Note names at a chosen reference pitch, and tolerances in cents, Hz or ppm. Pure functions.
 *
 * - Equal temperament: f = A4 · 2^((m − 69)/12), m the MIDI note number (A4 = 69, C4 = 60 — the
 *   MIDI 1.0 numbering; octave numbers as in scientific pitch notation, C4 "middle C").
 * - A4 = 440 Hz is the standard tuning frequency of ISO 16:1975; orchestras also order 442, 443 or
 *   432 Hz, so the reference pitch is a setting of each specification.
 * - Cents: 1200·log2(f/fref). ppm: 10⁶·Δf/f.
 */
import { A4_HZ } from "./physics.ts";

/** The reference pitches a workshop is usually asked for, Hz (A4). Any value in range may be typed. */
export const COMMON_REFERENCE_PITCHES_HZ = [440, 442, 443, 441, 444, 432, 415] as const;
export const MIN_REFERENCE_PITCH_HZ = 380;
export const MAX_REFERENCE_PITCH_HZ = 480;

const LETTER_SEMITONES: Record<string, number> = { C: 0, D: 2, E: 4, F: 5, G: 7, A: 9, B: 11 };
const SHARP_NAMES = ["C", "C♯", "D", "D♯", "E", "F", "F♯", "G", "G♯", "A", "A♯", "B"] as const;

/** A note name: a letter A–G, an optional sharp (#, ♯) or flat (b, ♭), and an octave −1…9. */
export const NOTE_NAME_PATTERN = /^\s*([A-Ga-g])\s*([#♯b♭]?)\s*(-?\d)\s*$/;

/** MIDI note number of a note name ("A4" → 69, "C#5" → 73, "Bb3" → 58), or null when it is not one. */
export function parseNoteName(name: string): number | null {
  const m = NOTE_NAME_PATTERN.exec(name);
  if (!m) return null;
  const letter = m[1].toUpperCase();
  const accidental = m[2] === "#" || m[2] === "♯" ? 1 : m[2] === "b" || m[2] === "♭" ? -1 : 0;
  const octave = Number(m[3]);
  const midi = (octave + 1) * 12 + LETTER_SEMITONES[letter] + accidental;
  return midi >= 0 && midi <= 127 ? midi : null;
}

/** The note name written the usual way, with ♯ for sharps ("C♯5"). */
export function noteNameOf(midi: number): string {
  const m = Math.round(midi);
  return `${SHARP_NAMES[((m % 12) + 12) % 12]}${Math.floor(m / 12) - 1}`;
}

/** A name in the form the spec stores it: letter, "#" or "b", octave ("C#5", "Bb3"). */
export function normaliseNoteName(name: string): string | null {
  const m = NOTE_NAME_PATTERN.exec(name);
  if (!m || parseNoteName(name) === null) return null;
  const accidental = m[2] === "#" || m[2] === "♯" ? "#" : m[2] === "b" || m[2] === "♭" ? "b" : "";
  return `${m[1].toUpperCase()}${accidental}${m[3]}`;
}

/** For display: "C#5" → "C♯5", "Bb3" → "B♭3". */
export function prettyNoteName(name: string): string {
  return name.replace(/^([A-G])#/, "$1♯").replace(/^([A-G])b/, "$1♭");
}

/** Equal-tempered frequency of a MIDI note, Hz, at the reference pitch `a4Hz` (default ISO 16). */
export function noteHz(midi: number, a4Hz: number = A4_HZ): number {
  return a4Hz * Math.pow(2, (midi - 69) / 12);
}

/** Equal-tempered frequency of a note name, Hz; throws a RangeError naming the bad input. */
export function noteNameHz(name: string, a4Hz: number = A4_HZ): number {
  const midi = parseNoteName(name);
  if (midi === null) throw new RangeError(`"${name}" is not a note name; write a letter A–G, an optional # or b, and an octave, e.g. A4, C#5, Bb3.`);
  return noteHz(midi, a4Hz);
}

/** The equal-tempered note nearest to `fHz` at `a4Hz`, and how far `fHz` is from it in cents. */
export function nearestNote(fHz: number, a4Hz: number = A4_HZ): { midi: number; name: string; cents: number } {
  const exact = 69 + 12 * Math.log2(fHz / a4Hz);
  const midi = Math.round(exact);
  return { midi, name: noteNameOf(midi), cents: (exact - midi) * 100 };
}

// ---------------------------------------------------------------------------------------------
// Tolerance units

export const toleranceUnits = ["cents", "hz", "ppm"] as const;
export type ToleranceUnit = (typeof toleranceUnits)[number];
export const toleranceUnitLabels: Record<ToleranceUnit, string> = { cents: "cents", hz: "Hz", ppm: "ppm" };

/** Relative frequency change of an interval of `c` cents: 2^(c/1200) − 1. */
export function centsToRelative(c: number): number {
  return Math.pow(2, c / 1200) - 1;
}

/** Cents of a relative frequency change r (r = Δf/f): 1200·log2(1 + r). */
export function relativeToCents(r: number): number {
  return 1200 * Math.log2(1 + r);
}

/** ±`c` cents expressed in parts per million of the frequency (upper side: 10⁶·(2^(c/1200) − 1)). */
export function centsToPpm(c: number): number {
  return centsToRelative(c) * 1e6;
}

/** ±`ppm` expressed in cents (1200·log2(1 + ppm·10⁻⁶)). */
export function ppmToCents(ppm: number): number {
  return relativeToCents(ppm * 1e-6);
}

/** ±`c` cents at `atHz`, in Hz (upper side: f·(2^(c/1200) − 1)). */
export function centsToHz(c: number, atHz: number): number {
  return atHz * centsToRelative(c);
}

/** ±`hz` at `atHz`, in cents (1200·log2(1 + Δf/f)). */
export function hzToCents(hz: number, atHz: number): number {
  return relativeToCents(hz / atHz);
}

/**
 * A tolerance given in `unit` as a symmetric tolerance in cents. Hz and ppm are turned into cents
 * on the upper side of the target (f + Δf), which is the narrower of the two sides in cents
 * (log2 grows more slowly above f than below), so the conversion never widens what was asked.
 * `atHz` is needed for Hz only.
 */
export function toleranceToCents(value: number, unit: ToleranceUnit, atHz: number | null): number {
  if (unit === "cents") return value;
  if (unit === "ppm") return ppmToCents(value);
  if (atHz === null || !(atHz > 0)) throw new RangeError("A tolerance in Hz needs the target frequency to convert it to cents.");
  return hzToCents(value, atHz);
}

/** One tolerance in all three units (Hz only when the frequency is known). */
export function toleranceViews(toleranceCents: number, atHz: number | null): { cents: number; hz: number | null; ppm: number } {
  return { cents: toleranceCents, hz: atHz !== null && atHz > 0 ? centsToHz(toleranceCents, atHz) : null, ppm: centsToPpm(toleranceCents) };
}

/** Significant figures that keep a converted tolerance readable (±0.254 Hz, ±578 ppm, ±1.00 cents). */
function sig(x: number, digits = 3): string {
  if (x === 0) return "0";
  const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(Math.abs(x))));
  return String(Number(x.toFixed(Math.min(decimals, 6))));
}

/** "±5 cents (±1.27 Hz, ±2890 ppm)": the unit it was given in first, then the other two. */
export function describeTolerance(toleranceCents: number, atHz: number | null, given: ToleranceUnit = "cents", givenValue?: number | null): string {
  const v = toleranceViews(toleranceCents, atHz);
  const parts: Record<ToleranceUnit, string | null> = {
    cents: `±${given === "cents" && givenValue != null ? String(givenValue) : sig(v.cents)} cents`,
    hz: v.hz === null ? null : `±${given === "hz" && givenValue != null ? String(givenValue) : sig(v.hz)} Hz`,
    ppm: `±${given === "ppm" && givenValue != null ? String(givenValue) : sig(v.ppm)} ppm`,
  };
  const others = toleranceUnits.filter((u) => u !== given).map((u) => parts[u]).filter((p): p is string => p !== null);
  return `${parts[given] ?? parts.cents} (${others.join(", ")})`;
}
