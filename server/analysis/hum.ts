/** Mains hum: 50 or 60 Hz and their harmonics. */

/** Mains frequencies in use worldwide, Hz (IEC 60038, "IEC standard voltages"). */
export const MAINS_HZ = [50, 60] as const;
/** Harmonics checked: hum from rectifiers and transformers reaches well into the kHz range. */
const MAX_HARMONIC = 40;

/**
 * The mains frequency whose harmonic lies within tolerance of `frequencyHz`, or null. Grid
 * frequency wanders by up to about ±0.2 Hz (±0.4 %) under normal operation (EN 50160 allows ±1 %),
 * so the tolerance grows with the harmonic number.
 */
export function humFundamental(frequencyHz: number): 50 | 60 | null {
  let best: 50 | 60 | null = null;
  let bestErr = Infinity;
  for (const mains of MAINS_HZ) {
    const h = Math.round(frequencyHz / mains);
    if (h < 1 || h > MAX_HARMONIC) continue;
    const err = Math.abs(frequencyHz - h * mains);
    const tol = Math.max(0.5, 0.005 * h * mains);
    if (err <= tol && err < bestErr) {
      best = mains;
      bestErr = err;
    }
  }
  return best;
}
