/** A measured partial for evaluation tests, with T60 and Q consistent with its τ (T60 = τ·ln 1000, Q = π·f·τ). */
import type { Partial as MeasuredPartial } from "../../shared/schemas/analysis.ts";

export function measuredPartial(frequencyHz: number, o: Partial<MeasuredPartial> = {}): MeasuredPartial {
  const tauS = o.tauS ?? 2;
  return {
    frequencyHz,
    frequencyUncertaintyHz: 0.001,
    amplitudeDb: -20,
    tauS,
    tauUncertaintyS: 0.001,
    t60S: tauS * Math.log(1000),
    q: Math.PI * frequencyHz * tauS,
    fitR2: 0.99,
    beatHz: null,
    fitStartS: 0.1,
    fitEndS: 4,
    tauUnreliable: false,
    ...o,
  };
}
