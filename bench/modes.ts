/**
 * Speed of the mode matching (shared/mode-matching.ts) for lists from a demo-sized model up to far
 * more modes than a microphone records: `npx tsx bench/modes.ts`. Synthetic sets (invented): the
 * measured partials are the predicted modes × 0.97 with ±0.5 % scatter, plus partials no model has.
 */
import { mulberry32 } from "../fixtures/synth.ts";
import { matchModes } from "../shared/mode-matching.ts";

const rand = mulberry32(3);
console.log("predicted × measured (two lists)   time     k       modes in fit");
for (const [P, M] of [[14, 12], [30, 40], [60, 80], [150, 200]]) {
  const predicted = Array.from({ length: P }, (_, i) => ({ key: `p${i}`, frequencyHz: 200 * Math.exp(rand() * 4) }));
  const measured = [
    ...predicted.slice(0, Math.min(P, M)).map((p, i) => ({ key: `m${i}`, frequencyHz: p.frequencyHz * 0.97 * (1 + (rand() - 0.5) * 0.01) })),
    ...Array.from({ length: Math.max(0, M - P) }, (_, i) => ({ key: `x${i}`, frequencyHz: 200 * Math.exp(rand() * 4) })),
  ];
  const runs = P > 100 ? 2 : 10;
  const t = performance.now();
  let fit = null;
  for (let i = 0; i < runs; i++) fit = matchModes([{ predicted, measured }, { predicted, measured }]).fit;
  const ms = (performance.now() - t) / runs;
  console.log(`${String(P).padStart(9)} × ${String(M).padEnd(22)} ${ms.toFixed(0).padStart(5)} ms  ${fit?.k.toFixed(4)}  ${fit?.n}`);
}
