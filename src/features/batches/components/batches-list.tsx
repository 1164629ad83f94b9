import type { ReactNode } from "react";
import { Link } from "react-router";
import { batchStateLabels, batchStates, type BatchSummary } from "@shared/schemas/batch";
import { Button } from "@/components/ui/button";
import { InputField, SelectField } from "@/components/ui/field";
import { Alert } from "@/components/ui/alert";
import { EmptyState } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { BatchStateBadge } from "@/components/ui/status-badges";
import { formatDate } from "@/lib/format";
import { useBatches } from "../api/get-batches";
import { applyFilters, hasFilters, type BatchFilters } from "../lib/batch-filters";

type Props = {
  workshopId: string;
  batchHref: (id: string) => string;
  emptyAction?: ReactNode;
  /** The filters in force (kept in the page address by the route) and how to change them. */
  filters: BatchFilters;
  onFiltersChange: (filters: BatchFilters) => void;
};

export function BatchesList({ workshopId, batchHref, emptyAction, filters, onFiltersChange }: Props) {
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
  const shown = applyFilters(batches.data, filters);
  const specs = [...new Map(batches.data.map((b) => [b.spec.id, b.spec.name])).entries()].sort((a, b) => a[1].localeCompare(b[1]));
  return (
    <div className="flex flex-col gap-4">
      <FilterBar filters={filters} specs={specs} onChange={onFiltersChange} />
      <p className="text-caption text-ink-soft" aria-live="polite">
        {hasFilters(filters) ? `${shown.length} of ${batches.data.length} batches match.` : `${batches.data.length} batches.`}
      </p>
      {shown.length ? (
        <BatchesTable batches={shown} batchHref={batchHref} />
      ) : (
        <EmptyState title="No batch matches these filters" action={<Button variant="secondary" onClick={() => onFiltersChange({ state: null, spec: null, from: null, to: null })}>Clear the filters</Button>} />
      )}
    </div>
  );
}

function FilterBar({ filters, specs, onChange }: { filters: BatchFilters; specs: [string, string][]; onChange: (f: BatchFilters) => void }) {
  return (
    <form aria-label="Filter batches" className="grid gap-3 sm:grid-cols-2 lg:grid-cols-[10rem_1fr_10rem_10rem_auto] lg:items-end" onSubmit={(e) => e.preventDefault()}>
      <SelectField label="State" value={filters.state ?? ""} onChange={(e) => onChange({ ...filters, state: (e.target.value || null) as BatchFilters["state"] })}>
        <option value="">Any state</option>
        {batchStates.map((s) => (
          <option key={s} value={s}>
            {batchStateLabels[s]}
          </option>
        ))}
      </SelectField>
      <SelectField label="Specification" value={filters.spec ?? ""} onChange={(e) => onChange({ ...filters, spec: e.target.value || null })}>
        <option value="">Any specification</option>
        {specs.map(([id, name]) => (
          <option key={id} value={id}>
            {name}
          </option>
        ))}
      </SelectField>
      <InputField label="Created from" type="date" value={filters.from ?? ""} onChange={(e) => onChange({ ...filters, from: e.target.value || null })} />
      <InputField label="Created until" type="date" value={filters.to ?? ""} onChange={(e) => onChange({ ...filters, to: e.target.value || null })} />
      {hasFilters(filters) ? (
        <Button variant="quiet" onClick={() => onChange({ state: null, spec: null, from: null, to: null })}>
          Clear
        </Button>
      ) : null}
    </form>
  );
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
