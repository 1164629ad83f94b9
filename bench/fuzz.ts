/**
 * `npm run fuzz`: 20 000 seeded mutation cases (fixtures/fuzz-mutations.ts) through the decoder
 * and the engine. Every case must end in a contract-valid result or an AnalysisInputError; the
 * figures printed are the outcome counts, the crash count and the time per case.
 */
import { analysisFailureCodes, analysisResultSchema } from "../shared/schemas/analysis";
import { fuzzCase, fuzzCorpus, MUTATION_NAMES } from "../fixtures/fuzz-mutations";
import { AnalysisInputError, analyzeWav } from "../server/analysis/index";

const CASES = Number(process.env.FUZZ_CASES ?? 20000);
const corpus = fuzzCorpus();
const outcomes: Record<string, number> = {};
const byMutation: Record<string, { cases: number; results: number }> = Object.fromEntries(MUTATION_NAMES.map((m) => [m, { cases: 0, results: 0 }]));
const crashes: string[] = [];
const times: number[] = [];
let slowest = { ms: 0, seed: -1, mutations: "" };
const t0 = performance.now();
for (let seed = 0; seed < CASES; seed++) {
  const c = fuzzCase(corpus, seed);
  const t = performance.now();
  let isResult = false;
  try {
    const r = analyzeWav(c.bytes, { plot: seed % 5 === 0 });
    const parsed = analysisResultSchema.safeParse(r);
    if (!parsed.success) crashes.push(`seed ${seed} (${c.mutations.join("+")}): result breaks the contract`);
    outcomes.result = (outcomes.result ?? 0) + 1;
    isResult = true;
  } catch (e) {
    if (e instanceof AnalysisInputError && (analysisFailureCodes as readonly string[]).includes(e.code)) outcomes[e.code] = (outcomes[e.code] ?? 0) + 1;
    else crashes.push(`seed ${seed} (${c.mutations.join("+")}): ${(e as Error)?.name}: ${(e as Error)?.message}`);
  }
  const ms = performance.now() - t;
  times.push(ms);
  if (ms > slowest.ms) slowest = { ms, seed, mutations: c.mutations.join("+") };
  for (const m of new Set(c.mutations)) {
    byMutation[m].cases++;
    if (isResult) byMutation[m].results++;
  }
  if ((seed + 1) % 5000 === 0) console.log(`… ${seed + 1} cases`);
}
const total = performance.now() - t0;
times.sort((a, b) => a - b);
const q = (p: number) => times[Math.min(times.length - 1, Math.floor(p * times.length))];
console.log(`\nFuzz: ${CASES} cases in ${(total / 1000).toFixed(1)} s`);
console.log("outcomes:", Object.entries(outcomes).sort((a, b) => b[1] - a[1]).map(([k, v]) => `${k} ${v}`).join(", "));
console.log("per mutation (cases / still analysable):", Object.entries(byMutation).map(([k, v]) => `${k} ${v.cases}/${v.results}`).join(", "));
console.log(`time per case: median ${q(0.5).toFixed(2)} ms, p99 ${q(0.99).toFixed(2)} ms, max ${slowest.ms.toFixed(1)} ms (seed ${slowest.seed}: ${slowest.mutations}); bound 2000 ms: ${slowest.ms < 2000 ? "MET" : "NOT MET"}`);
console.log(`crashes (anything other than a result or an AnalysisInputError): ${crashes.length}`);
for (const c of crashes.slice(0, 20)) console.log("  " + c);
process.exitCode = crashes.length ? 1 : 0;
