import type { IndividualsChart as Chart, NelsonResult } from "@shared/spc";
import { NELSON_RULES } from "@shared/spc";
import type { MeasuredUnit } from "./batch-charts";

/** The rule breaks as text: what hovering a point shows, readable without a pointer and in print. */
export function SignalList({ units, chart }: { units: MeasuredUnit[]; chart: Chart & NelsonResult }) {
  const above = chart.mrAboveLimit.map((a, i) => (a ? i : -1)).filter((i) => i > 0);
  if (!chart.signals.length && !above.length) {
    return (
      <p className="text-caption text-ink-soft" role="status">
        No point breaks Nelson rules 1–4 and no moving range is above its limit: the batch shows no sign of a special cause.
      </p>
    );
  }
  return (
    <div className="rounded-control border border-rust-300 bg-rust-50 px-4 py-3 text-rust-700">
      <h3 className="font-semibold">Signs of a special cause</h3>
      <ul className="mt-1 list-disc pl-5 text-caption">
        {chart.signals.map((s) => {
          const rule = NELSON_RULES[s.rule];
          const who = s.start === s.end ? units[s.start].serial : `${units[s.start].serial} to ${units[s.end].serial}`;
          return (
            <li key={`${s.rule}-${s.start}`}>
              <span className="font-semibold">Rule {rule.rule} — {rule.name}</span> ({who}): {rule.description}
            </li>
          );
        })}
        {above.map((i) => (
          <li key={`mr-${i}`}>
            <span className="font-semibold">Moving range above its limit</span> ({units[i - 1].serial} → {units[i].serial}): the step between these two units is larger than the process usually makes.
          </li>
        ))}
      </ul>
      <p className="mt-2 text-caption">Rules after Nelson (1984), Journal of Quality Technology 16(4). Look for what changed at those units before adjusting the process.</p>
    </div>
  );
}
