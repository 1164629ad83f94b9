/**
 * Physics helpers shared by the analysis engine, the spec templates and the client.
 * Pure functions, SI units (Hz, s, °C). Each constant names its source beside it.
 */

/** Concert pitch A4 = 440 Hz (ISO 16:1975, "Acoustics — Standard tuning frequency"). */
export const A4_HZ = 440;

/** ln(1000): a decay of 60 dB in level is a factor 1000 in amplitude, so T60 = τ·ln(1000). */
export const LN_1000 = Math.log(1000);

/** Interval from `referenceHz` to `frequencyHz` in cents: 1200·log2(f/fref). */
export function cents(frequencyHz: number, referenceHz: number): number {
  if (!(frequencyHz > 0) || !(referenceHz > 0)) {
    throw new RangeError(`cents() needs two positive frequencies in Hz, got ${frequencyHz} and ${referenceHz}`);
  }
  return 1200 * Math.log2(frequencyHz / referenceHz);
}

/** The frequency `centsOffset` cents above `referenceHz`, Hz. */
export function frequencyFromCents(referenceHz: number, centsOffset: number): number {
  return referenceHz * Math.pow(2, centsOffset / 1200);
}

/** Equal-tempered frequency of a MIDI note number (69 = A4), Hz, tuned to `a4Hz` (default ISO 16). */
export function midiNoteHz(note: number, a4Hz: number = A4_HZ): number {
  return a4Hz * Math.pow(2, (note - 69) / 12);
}

/** T60 (time for the level to fall 60 dB), s, from the amplitude time constant τ (s). */
export function t60FromTau(tauS: number): number {
  return tauS * LN_1000;
}

/**
 * T60 is a decay of 60 dB; a recording that saw less of it gives an extrapolated T60. The words
 * every screen and the certificate put beside such a T60 ("from 28 dB"), or null when the whole
 * 60 dB was seen or the amount is not known (results analysed before it was recorded).
 */
export function t60ExtrapolatedFrom(observedDecayDb: number | null | undefined): string | null {
  if (typeof observedDecayDb !== "number" || !Number.isFinite(observedDecayDb) || observedDecayDb >= 60) return null;
  return `from ${Math.max(0, Math.round(observedDecayDb))} dB`;
}

/** Amplitude time constant τ, s, from T60, s. */
export function tauFromT60(t60S: number): number {
  return t60S / LN_1000;
}

/** Quality factor Q = π·f·τ (f in Hz, τ the amplitude time constant in s). */
export function qFromTau(frequencyHz: number, tauS: number): number {
  return Math.PI * frequencyHz * tauS;
}

/** Amplitude time constant τ, s, from Q and f (Hz). */
export function tauFromQ(frequencyHz: number, q: number): number {
  return q / (Math.PI * frequencyHz);
}

/** Loss factor η = 1/Q. */
export function lossFactor(q: number): number {
  return 1 / q;
}

/**
 * Euler–Bernoulli beam eigenvalues βₙL. Natural frequencies scale with (βₙL)², so ratios of
 * partials are ratios of the squared roots. Values as tabulated in R. D. Blevins, "Formulas for
 * Natural Frequency and Mode Shape" (Van Nostrand Reinhold, 1979), ch. 8 (straight beams), and W. T. Thomson,
 * "Theory of Vibration with Applications", Appendix D (normal modes of uniform beams).
 */
export const CANTILEVER_BETA_L = [1.87510407, 4.69409113, 7.85475744, 10.99554073] as const;
/** Free–free beam roots (same sources as above). */
export const FREE_FREE_BETA_L = [4.73004074, 7.85320462, 10.9956078, 14.13716549] as const;

/** Ratios fₙ/f₁ = (βₙL/β₁L)² for a list of beam roots. */
export function beamFrequencyRatios(roots: readonly number[]): number[] {
  const first = roots[0];
  return roots.map((r) => (r / first) ** 2);
}

/** Cantilever (a tuning-fork tine, clamped at the stem): f₂/f₁ ≈ 6.267 (Blevins; Thomson App. D). */
export const CANTILEVER_SECOND_TO_FIRST = 6.267;
/** Free–free bar or tube: 1 : 2.757 : 5.404 : 8.933 (Blevins; Thomson App. D). */
export const FREE_FREE_RATIOS = [1, 2.757, 5.404, 8.933] as const;

/**
 * Relative change of a steel part's natural frequencies per °C, 1/°C. Frequency goes as √E, and the
 * elastic modulus of carbon steel falls by roughly 2–2.5×10⁻⁴ per °C near room temperature, so
 * about −1×10⁻⁴ per °C. FROM MEMORY — confirm against a materials source (or measure the workshop's
 * own parts) before relying on it for acceptance decisions.
 */
export const STEEL_FREQUENCY_TEMPERATURE_COEFFICIENT_PER_C = -1e-4;

/**
 * Frequency corrected to a reference temperature, Hz, for a linear temperature coefficient:
 * f(T) = f(Tref)·(1 + c·(T − Tref)).
 */
export function correctToReferenceTemperature(
  frequencyHz: number,
  temperatureC: number,
  referenceTemperatureC: number,
  coefficientPerC: number = STEEL_FREQUENCY_TEMPERATURE_COEFFICIENT_PER_C,
): number {
  return frequencyHz / (1 + coefficientPerC * (temperatureC - referenceTemperatureC));
}
