import type { ReactNode } from "react";
import { Link } from "react-router";
import type { BatchSummary } from "@shared/schemas/batch";
import { Alert } from "@/components/ui/alert";
import { EmptyState } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { BatchStateBadge } from "@/components/ui/status-badges";
import { formatDate } from "@/lib/format";
import { useBatches } from "../api/get-batches";

type Props = { workshopId: string; batchHref: (id: string) => string; emptyAction?: ReactNode };

export function BatchesList({ workshopId, batchHref, emptyAction }: Props) {
  const batches = useBatches(workshopId);
  if (batches.isPending) return <Spinner label="Loading batches…" />;
  if (batches.isError) return <Alert tone="error">{batches.error.message}</Alert>;
  if (batches.data.length === 0) {
    return (
      <EmptyState title="No batches yet" action={emptyAction}>
        A batch is a production lot made under one specification version. Create one with its serial range, then strike and upload each unit.
      </EmptyState>
    );
  }
  return <BatchesTable batches={batches.data} batchHref={batchHref} />;
}

export function BatchesTable({ batches, batchHref }: { batches: BatchSummary[]; batchHref: (id: string) => string }) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left">
        <caption className="sr-only">Batches</caption>
        <thead className="border-b border-line text-caption text-ink-soft">
          <tr>
            <th scope="col" className="py-2 pr-4 font-semibold">Batch</th>
            <th scope="col" className="py-2 pr-4 font-semibold">Specification</th>
            <th scope="col" className="py-2 pr-4 font-semibold">State</th>
            <th scope="col" className="py-2 pr-4 font-semibold">Measured</th>
            <th scope="col" className="py-2 pr-4 font-semibold">Out of tolerance</th>
            <th scope="col" className="py-2 font-semibold">Created</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-line">
          {batches.map((batch) => (
            <tr key={batch.id}>
              <td className="py-3 pr-4">
                <Link to={batchHref(batch.id)} className="font-semibold text-steel-700 underline underline-offset-2">
                  {batch.code}
                </Link>
              </td>
              <td className="py-3 pr-4">
                {batch.spec.name} <span className="text-caption text-ink-faint">v{batch.spec.version}</span>
              </td>
              <td className="py-3 pr-4">
                <BatchStateBadge state={batch.state} />
              </td>
              <td className="py-3 pr-4">
                <Progress measured={batch.measured} units={batch.units} />
              </td>
              <td className="py-3 pr-4 tabular-nums">
                {batch.outOfTolerance > 0 ? <span className="font-semibold text-rust-700">{batch.outOfTolerance}</span> : "0"}
                {batch.inconclusive > 0 ? <span className="ml-2 text-caption text-ochre-600">+{batch.inconclusive} inconclusive</span> : null}
              </td>
              <td className="py-3 text-ink-soft">{formatDate(batch.createdAt)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** Measured / total as words and a bar; the words carry the meaning, the bar is a glance. */
export function Progress({ measured, units }: { measured: number; units: number }) {
  const share = units > 0 ? Math.min(1, measured / units) : 0;
  return (
    <div className="flex min-w-32 items-center gap-2">
      <span className="tabular-nums">
        {measured} / {units}
      </span>
      <span aria-hidden="true" className="h-2 w-20 overflow-hidden rounded-full bg-sunken">
        <span className="block h-full rounded-full bg-steel-500" style={{ width: `${share * 100}%` }} />
      </span>
    </div>
  );
}
