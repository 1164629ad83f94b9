/** The ledger's headline numbers: progress, verdict counts, and the batch's deviation and decay. */
import type { BatchDetail } from "@shared/schemas/batch";
import { formatCents, formatNumber, formatSeconds } from "@/lib/format";

export function LedgerSummary({ batch }: { batch: BatchDetail }) {
  const s = batch.statistics;
  const items: { label: string; value: string; tone?: string }[] = [
    { label: "Measured", value: `${batch.measured} / ${batch.units}` },
    { label: "Within tolerance", value: String(batch.withinTolerance), tone: "text-moss-600" },
    { label: "Out of tolerance", value: String(batch.outOfTolerance), tone: batch.outOfTolerance > 0 ? "text-rust-700" : undefined },
    { label: "Inconclusive", value: String(batch.inconclusive), tone: batch.inconclusive > 0 ? "text-ochre-600" : undefined },
    {
      label: "Deviation, mean ± s",
      value: s?.meanDeviationCents != null ? `${formatCents(s.meanDeviationCents)} ± ${formatNumber(s.sdDeviationCents, 1)}` : "—",
    },
    { label: "Median T60", value: formatSeconds(s?.medianT60S) },
  ];
  return (
    <div className="flex flex-col gap-2">
      <dl className="grid grid-cols-2 gap-4 sm:grid-cols-3 xl:grid-cols-6">
        {items.map((item) => (
          <div key={item.label}>
            <dt className="text-caption text-ink-soft">{item.label}</dt>
            <dd className={`whitespace-nowrap text-title font-semibold tabular-nums ${item.tone ?? ""}`}>{item.value}</dd>
          </div>
        ))}
      </dl>
      <p className="text-caption text-ink-faint">
        Fundamental tolerance {batch.fundamentalToleranceCents != null ? `± ${batch.fundamentalToleranceCents} cents` : "not set"}
        {batch.minT60S != null ? ` · minimum T60 ${batch.minT60S} s` : ""}. Deviations are of the fundamental from its target, in cents; s is the sample standard deviation.
      </p>
    </div>
  );
}
