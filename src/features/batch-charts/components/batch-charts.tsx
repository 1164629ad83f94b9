/**
 * Batch charts for the ledger: an individuals chart of the fundamental's deviation
 * (cents) in measuring order with x̄ ± 2.66·MR̄, the moving-range chart below it (3.267·MR̄),
 * Nelson rules 1–4 marked; a histogram of deviations with the spec limits (kept off the control
 * chart: control limits describe the process, spec limits the customer's need); capability.
 * All statistics come from shared/spc.ts. Drawn as SVG: a batch has at most a few thousand units,
 * SVG prints sharply, and each point can carry its own accessible text.
 */
import type { BatchDetail } from "@shared/schemas/batch";
import { individualsChartWithRules, type NelsonRuleId } from "@shared/spc";
import { EmptyState, Panel } from "@/components/ui/panel";
import { CapabilitySummary } from "./capability-summary";
import { DeviationHistogram } from "./deviation-histogram";
import { IndividualsChart } from "./individuals-chart";
import { MovingRangeChart } from "./moving-range-chart";
import { SignalList } from "./signal-list";
import "../batch-charts.css";

/** Nelson (1984) tests 1–4, as the issue asks: beyond a limit, runs, trends, alternation. */
export const BATCH_RULES: readonly NelsonRuleId[] = [1, 2, 3, 4];

export type MeasuredUnit = { id: string; serial: string; deviationCents: number };

export function BatchCharts({ batch }: { batch: BatchDetail }) {
  // Measuring order is ledger row order; units without a deviation (not yet measured, fundamental
  // not found) are left out rather than plotted as zero.
  const measured: MeasuredUnit[] = batch.rows
    .filter((r) => r.deviationCents !== null && Number.isFinite(r.deviationCents))
    .map((r) => ({ id: r.id, serial: r.serial, deviationCents: r.deviationCents as number }));

  if (measured.length < 2) {
    return (
      <Panel aria-labelledby="batch-charts-heading" className="tl-batch-charts">
        <h2 id="batch-charts-heading" className="mb-3 text-title font-semibold">Control chart and capability</h2>
        <EmptyState title="The charts wait for at least two measured units">
          {measured.length === 0
            ? "No unit of this batch has a measured fundamental yet."
            : `Only ${measured[0].serial} has a measured fundamental so far.`}{" "}
          A control chart needs two units to form a moving range; upload strikes for more units and the charts appear here.
        </EmptyState>
      </Panel>
    );
  }

  const values = measured.map((m) => m.deviationCents);
  const chart = individualsChartWithRules(values, BATCH_RULES);

  return (
    <Panel aria-labelledby="batch-charts-heading" className="tl-batch-charts flex flex-col gap-6">
      <div>
        <h2 id="batch-charts-heading" className="text-title font-semibold">Control chart of the fundamental</h2>
        <p className="mt-1 text-caption text-ink-soft">
          Deviation from target in cents, {measured.length} measured units in measuring order. Control limits x̄ ± 2.66·MR̄ (individuals) and 3.267·MR̄ (moving range),
          NIST/SEMATECH e-Handbook §6.3.2. These show what the process does; the tolerance is on the histogram.
        </p>
      </div>
      {chart.degenerate ? (
        <p className="rounded-control border border-ochre-300 bg-ochre-50 px-4 py-3 text-ochre-600" role="status">
          Every unit has the same deviation ({values[0].toFixed(1)} cents), so the moving ranges are zero and the limits collapse onto the centre line. Check the values are really measured.
        </p>
      ) : null}
      <IndividualsChart units={measured} chart={chart} />
      <MovingRangeChart units={measured} chart={chart} />
      <SignalList units={measured} chart={chart} />
      <div className="grid gap-6 lg:grid-cols-[3fr_2fr]">
        <DeviationHistogram values={values} toleranceCents={batch.fundamentalToleranceCents} />
        <CapabilitySummary batch={batch} deviations={values} />
      </div>
    </Panel>
  );
}
