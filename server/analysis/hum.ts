/**
 * Mains hum (50 or 60 Hz and their harmonics), recognised by evidence rather than by frequency
 * alone: above a kilohertz the windows around the harmonics cover much of the spectrum, so a line
 * there is hum only when it behaves like hum.
 *
 * Evidence, in the order it is weighed:
 * - steady: the line does not decay within the strike (the caller passes only such lines);
 * - present before the strike at the same level (the lead-in), and not starting with the strike:
 *   a line absent from the lead-in started with the strike and is the unit's, whatever its frequency;
 * - consistent as a family: the grid's frequency is off nominal by the same fraction at every
 *   harmonic, so the lines found share one fractional offset;
 * - without a lead-in, a family is required: the fundamental or a low harmonic present too.
 */

/** Mains frequencies in use worldwide, Hz (IEC 60038, "IEC standard voltages"). */
export const MAINS_HZ = [50, 60] as const;
/** Harmonics considered: hum from rectifiers and transformers reaches well into the kHz range. */
const MAX_HARMONIC = 40;
/** Largest fractional offset from nominal: EN 50160 allows the grid ±1 % (interconnected systems,
 *  99.5 % of a year). */
const MAX_OFFSET = 0.01;
/** How far the offsets of one family's lines may differ, as a fraction, beyond their measurement
 *  uncertainty: the grid drifts by a few millihertz within a recording of seconds (our estimate,
 *  common practice, no published source). */
const FAMILY_SPREAD = 2e-4;
/** Shortest lead-in that is read, s: at 0.1 s the Hann main lobe (±20 Hz) still separates the
 *  harmonics of 50 Hz. At most the last second before the strike is read. */
export const MIN_LEAD_IN_S = 0.1;
const MAX_LEAD_IN_S = 1;

export type LeadInEvidence = "present" | "absent" | "unknown";

export interface SteadyLine {
  frequencyHz: number;
  frequencyUncertaintyHz: number;
  /** Peak amplitude during the strike, dBFS. */
  amplitudeDb: number;
  leadIn: LeadInEvidence;
}

/** The mains frequency and harmonic number within ±1 % of `frequencyHz` (both, when 50 and 60 Hz qualify). */
export function mainsHarmonics(frequencyHz: number): Array<{ mainsHz: 50 | 60; harmonic: number; offset: number }> {
  const out: Array<{ mainsHz: 50 | 60; harmonic: number; offset: number }> = [];
  for (const mains of MAINS_HZ) {
    const h = Math.round(frequencyHz / mains);
    if (h < 1 || h > MAX_HARMONIC) continue;
    const offset = frequencyHz / (h * mains) - 1;
    if (Math.abs(offset) <= MAX_OFFSET) out.push({ mainsHz: mains, harmonic: h, offset });
  }
  return out;
}

/**
 * Amplitude of a sinusoid at `frequencyHz` in x[start, end) — the last MAX_LEAD_IN_S of it — by
 * a Hann-windowed projection (exact for a steady sinusoid at that frequency), and the local floor:
 * the median projection at six frequencies 3–5 bins either side. Null when the stretch is shorter
 * than MIN_LEAD_IN_S.
 */
export function leadInAmplitude(x: Float64Array, start: number, end: number, sampleRate: number, frequencyHz: number): { amplitude: number; floor: number } | null {
  const from = Math.max(start, end - Math.round(MAX_LEAD_IN_S * sampleRate));
  const n = end - from;
  if (n < MIN_LEAD_IN_S * sampleRate) return null;
  const project = (f: number) => {
    const w = (2 * Math.PI * f) / sampleRate;
    let re = 0;
    let im = 0;
    let ws = 0;
    const c = (2 * Math.PI) / n;
    for (let i = 0; i < n; i++) {
      const h = 0.5 - 0.5 * Math.cos(c * i);
      const v = x[from + i] * h;
      re += v * Math.cos(w * i);
      im -= v * Math.sin(w * i);
      ws += h;
    }
    return (2 * Math.hypot(re, im)) / ws;
  };
  const bin = sampleRate / n;
  const side = [-5, -4, -3, 3, 4, 5].map((k) => project(frequencyHz + k * bin)).sort((a, b) => a - b);
  return { amplitude: project(frequencyHz), floor: (side[2] + side[3]) / 2 };
}

/**
 * What the lead-in says of a line of `amplitudeDb` (dBFS) during the strike: present at the same
 * level (within 6 dB, and 3× clear of the lead-in's floor), absent (12 dB or more below, where
 * the floor would show it), or unknown.
 */
export function leadInEvidence(reading: { amplitude: number; floor: number } | null, amplitudeDb: number): LeadInEvidence {
  if (!reading) return "unknown";
  const a = 10 ** (amplitudeDb / 20);
  const { amplitude, floor } = reading;
  if (amplitude >= a / 2 && amplitude <= 2 * a && amplitude >= 3 * floor) return "present";
  if (amplitude < a / 4 && 3 * floor < a / 4) return "absent";
  return "unknown";
}

/**
 * Which steady lines are mains hum, and of which family. A line absent from the lead-in is never
 * hum. Of the rest, the lines of the 50 or the 60 Hz family that share one fractional offset are
 * hum when the lead-in shows them, or — without a lead-in — when at least two share the offset
 * and one of them is the fundamental or a low harmonic (2nd or 3rd).
 */
export function judgeHum(lines: SteadyLine[]): { mainsHz: 50 | 60 | null; hum: boolean[] } {
  let best: { mainsHz: 50 | 60 | null; hum: boolean[]; count: number } = { mainsHz: null, hum: lines.map(() => false), count: 0 };
  for (const mains of MAINS_HZ) {
    const members = lines.flatMap((l, i) => {
      if (l.leadIn === "absent") return [];
      const m = mainsHarmonics(l.frequencyHz).find((x) => x.mainsHz === mains);
      if (!m) return [];
      const tol = FAMILY_SPREAD + (3 * (Number.isFinite(l.frequencyUncertaintyHz) ? l.frequencyUncertaintyHz : 0)) / (m.harmonic * mains);
      return [{ i, h: m.harmonic, offset: m.offset, tol, leadIn: l.leadIn }];
    });
    if (!members.length) continue;
    // The family's offset: the member offset that the most members agree with (ties: the lowest harmonic).
    let family: typeof members = [];
    for (const c of [...members].sort((a, b) => a.h - b.h)) {
      const agree = members.filter((m) => Math.abs(m.offset - c.offset) <= m.tol + c.tol);
      if (agree.length > family.length) family = agree;
    }
    const low = family.some((m) => m.h <= 3);
    const hum = lines.map(() => false);
    for (const m of family) hum[m.i] = m.leadIn === "present" || (m.leadIn === "unknown" && family.length >= 2 && low);
    const count = hum.filter(Boolean).length;
    if (count > best.count) best = { mainsHz: mains, hum, count };
  }
  return { mainsHz: best.mainsHz, hum: best.hum };
}
