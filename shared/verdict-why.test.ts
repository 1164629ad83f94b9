/**
 * The short "why" of a verdict, checked on evaluations made by the real evaluator from measured
 * partials whose deviations follow from the definition of cents (1200·log₂(f/f_ref)) and whose T60
 * follows from T60 = τ·ln 1000 (a 60 dB fall is a factor 1000 in amplitude).
 */
import { describe, expect, it } from "vitest";
import type { Partial as MeasuredPartial } from "./schemas/analysis.ts";
import { specInputSchema, type SpecPartialInput } from "./schemas/spec.ts";
import { evaluateUnit, type EvaluationStrikeInput } from "./evaluation.ts";
import { verdictWhy } from "./verdict-why.ts";

const atCents = (ref: number, c: number) => ref * 2 ** (c / 1200);

function partial(frequencyHz: number, tauS: number, beatHz: number | null = null): MeasuredPartial {
  return { frequencyHz, frequencyUncertaintyHz: 0.001, amplitudeDb: -20, tauS, tauUncertaintyS: 0.001, t60S: tauS * Math.log(1000), q: Math.PI * frequencyHz * tauS, fitR2: 0.99, beatHz, fitStartS: 0.1, fitEndS: 4, tauUnreliable: false };
}
const strike = (partials: MeasuredPartial[], id = "s1"): EvaluationStrikeInput => ({ strikeId: id, segment: 0, temperatureC: null, partials });
const fundamental = (o: Partial<SpecPartialInput> = {}): SpecPartialInput => ({ label: "Fundamental", isFundamental: true, targetKind: "absolute", targetHz: 440, toleranceCents: 5, ...o });
const spec = (partials: SpecPartialInput[], o: Record<string, unknown> = {}) => specInputSchema.parse({ name: "Test fork", family: "tuning_fork", partials, ...o });
const evaluate = (s: ReturnType<typeof spec>, strikes: EvaluationStrikeInput[]) => evaluateUnit(s, strikes, { clockHalfWidthPpm: 0 });

describe("verdictWhy", () => {
  it("says nothing for a unit within tolerance", () => {
    expect(verdictWhy(evaluate(spec([fundamental()]), [strike([partial(440, 5)])]))).toEqual([]);
  });

  it("names the deviation and the tolerance of a pitch outside it", () => {
    // 9.4 cents flat of 440 Hz against ±5 cents.
    const ev = evaluate(spec([fundamental()]), [strike([partial(atCents(440, -9.4), 5)])]);
    expect(ev.verdict).toBe("out_of_tolerance");
    expect(verdictWhy(ev)).toEqual(["Fundamental \u22129.4 ¢ outside ±5 ¢"]);
  });

  it("names the T60 and the minimum when the ring is too short", () => {
    // τ = 2.5 s gives T60 = 2.5·ln 1000 = 17.27 s, under a 20 s minimum.
    const ev = evaluate(spec([fundamental({ minT60S: 20 })]), [strike([partial(440, 2.5)])]);
    expect(ev.verdict).toBe("out_of_tolerance");
    expect(verdictWhy(ev)).toEqual(["Fundamental T60 17.3 s < 20 s minimum"]);
  });

  it("names a beat over its maximum and a partial that was not found", () => {
    const s = spec([fundamental({ maxBeatHz: 0.5 }), { label: "Overtone", targetKind: "ratio", ratio: 6.1, toleranceCents: 15, required: true }]);
    const ev = evaluate(s, [strike([partial(440, 5, 1.2)])]);
    expect(verdictWhy(ev)).toEqual(["Fundamental beat 1.20 Hz > 0.5 Hz maximum", "Overtone not found"]);
  });

  it("says how many strikes are missing", () => {
    const ev = evaluate(spec([fundamental()], { strikesRequired: 3 }), [strike([partial(440, 5)])]);
    expect(ev.verdict).toBe("inconclusive");
    expect(verdictWhy(ev)[0]).toBe("1 of 3 strikes measured");
  });
});
