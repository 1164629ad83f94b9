/**
 * Fuzzing the decoder and the engine: 500 seeded mutation cases. Each must end
 * in a result that satisfies the contract or in an AnalysisInputError with a message — never
 * another exception. The 2 s bound per case holds by design, not by a timer here: the work is
 * bounded by the file size (these are < 100 kB), MAX_DURATION_S, at most 16 strikes × 24 partials,
 * and fixed iteration caps in every loop (`npm run fuzz` runs 20 000 cases and prints the times).
 */
import { describe, expect, it } from "vitest";
import { analysisResultSchema, analysisFailureCodes } from "../../shared/schemas/analysis";
import { fuzzCase, fuzzCorpus } from "../../fixtures/fuzz-mutations";
import { AnalysisInputError, analyzeWav } from "../../server/analysis/index";

describe("fuzz: 500 mutated WAV files", () => {
  it("every case ends in a valid result or a clear AnalysisInputError", () => {
    const corpus = fuzzCorpus();
    const outcomes: Record<string, number> = {};
    const crashes: string[] = [];
    for (let seed = 0; seed < 500; seed++) {
      const c = fuzzCase(corpus, seed);
      try {
        const r = analyzeWav(c.bytes, { plot: seed % 5 === 0 });
        const parsed = analysisResultSchema.safeParse(r);
        if (!parsed.success) crashes.push(`seed ${seed} (${c.mutations.join("+")}): result breaks the contract: ${parsed.error.issues[0]?.message}`);
        outcomes.result = (outcomes.result ?? 0) + 1;
      } catch (e) {
        if (e instanceof AnalysisInputError && (analysisFailureCodes as readonly string[]).includes(e.code) && e.message.length > 20) {
          outcomes[e.code] = (outcomes[e.code] ?? 0) + 1;
        } else {
          crashes.push(`seed ${seed} (${c.mutations.join("+")}): ${(e as Error)?.name}: ${(e as Error)?.message}`);
        }
      }
    }
    expect(crashes).toEqual([]);
    // The mutations reach both sides: some files still analyse, many are refused with a reason.
    expect(outcomes.result).toBeGreaterThan(20);
    expect(Object.keys(outcomes).length).toBeGreaterThan(4);
  });
});
