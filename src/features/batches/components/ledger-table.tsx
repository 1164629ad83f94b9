/**
 * The batch ledger: one row per unit with its latest evaluation (TanStack Table for sorting and
 * filtering). The filter is the QA view: units out of tolerance, or every unit still open. QA may
 * select units awaiting a decision (a checkbox each, shift-click for a range in the order shown)
 * and record one disposition for all of them.
 * From a tablet up it is a table that scrolls inside its panel with the serial column kept in
 * view; on a phone each unit is a card (serial, verdict, deviation, T60, disposition). Never the
 * page scrolls sideways.
 */
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import clsx from "clsx";
import { useEffect, useMemo, useRef, useState, type MouseEvent, type ReactNode } from "react";
import { flushSync } from "react-dom";
import { Link } from "react-router";
import type { LedgerRow } from "@shared/schemas/batch";
import { t60ExtrapolatedFrom } from "@shared/physics";
import { EmptyState } from "@/components/ui/panel";
import { DispositionBadge, VerdictBadge } from "@/components/ui/status-badges";
import { formatCents, formatNumber } from "@/lib/format";
import { useMediaQuery } from "@/lib/use-media-query";
import { BulkDispositionForm } from "./bulk-disposition-form";

export type LedgerFilter = "all" | "out_of_tolerance" | "open";
const filterLabels: Record<LedgerFilter, string> = { all: "All units", out_of_tolerance: "Out of tolerance", open: "Open" };

const column = createColumnHelper<LedgerRow>();

/**
 * Rows drawn at first. A batch may hold thousands of units; drawing them all makes every sort and
 * every one-second poll redraw thousands of rows, so the rest come on request (and all of them
 * for printing).
 */
const FIRST_ROWS = 250;
const verdictOrder = { out_of_tolerance: 0, inconclusive: 1, within_tolerance: 2 } as const;

type Props = {
  rows: LedgerRow[];
  unitHref: (id: string) => string;
  toleranceCents: number | null;
  /** The spec's reference temperature, named in the header when the frequencies were corrected to it. */
  referenceTemperatureC?: number;
  /** Given when the signed-in member may record dispositions on this (unreleased) batch. */
  bulk?: { workshopId: string; batchId: string };
};

/** Cards below this width (Tailwind's sm, 40rem): a phone held upright. */
const CARDS_QUERY = "(max-width: 39.99rem)";

/** A unit can take a first disposition: measured, analysed, not within tolerance, no standing decision. */
const awaitsDecision = (row: LedgerRow) => row.open && row.pendingStrikes === 0 && row.disposition === null && (row.verdict === "out_of_tolerance" || row.verdict === "inconclusive");

export function LedgerTable({ rows, unitHref, toleranceCents, referenceTemperatureC = 20, bulk }: Props) {
  const [filter, setFilter] = useState<LedgerFilter>("all");
  const [sorting, setSorting] = useState<SortingState>([]);
  const [limit, setLimit] = useState(FIRST_ROWS);
  const [printing, setPrinting] = useState(false);
  const phone = useMediaQuery(CARDS_QUERY) && !printing;
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const lastClicked = useRef<string | null>(null);
  // A row that no longer awaits a decision (decided elsewhere, measured again) leaves the selection.
  const selectable = useMemo(() => new Set(rows.filter(awaitsDecision).map((r) => r.id)), [rows]);
  const chosen = rows.filter((r) => selected.has(r.id) && selectable.has(r.id));

  // The printed ledger is the whole ledger, as a table: draw every row before the browser lays out the print.
  useEffect(() => {
    const showAll = () =>
      flushSync(() => {
        setLimit(Number.POSITIVE_INFINITY);
        setPrinting(true);
      });
    const done = () => setPrinting(false);
    window.addEventListener("beforeprint", showAll);
    window.addEventListener("afterprint", done);
    return () => {
      window.removeEventListener("beforeprint", showAll);
      window.removeEventListener("afterprint", done);
    };
  }, []);
  const corrected = rows.some((r) => r.temperatureCorrected);
  const outside = (value: number | null) => value != null && toleranceCents != null && Math.abs(value) > toleranceCents;

  const columns = useMemo(
    () => [
      ...(bulk
        ? [
            column.display({
              id: "select",
              header: () => <span className="sr-only">Select</span>,
              cell: (info) => {
                const row = info.row.original;
                return (
                  <input
                    type="checkbox"
                    className="no-print size-5 accent-steel-600 disabled:opacity-30"
                    aria-label={`Select ${row.serial}`}
                    disabled={!selectable.has(row.id)}
                    checked={selected.has(row.id) && selectable.has(row.id)}
                    onChange={() => undefined}
                    onClick={(event) => toggle(row.id, event)}
                  />
                );
              },
            }),
          ]
        : []),
      column.accessor("serial", {
        header: "Serial",
        cell: (info) => (
          <Link to={unitHref(info.row.original.id)} className="font-semibold text-steel-700 underline underline-offset-2">
            {info.getValue()}
          </Link>
        ),
      }),
      column.accessor((row) => (row.verdict ? verdictOrder[row.verdict] : 3), {
        id: "verdict",
        header: "Verdict",
        cell: (info) => {
          const why = info.row.original.why;
          return why.length ? (
            <span title={why.join("; ")} className="cursor-help">
              <VerdictBadge verdict={info.row.original.verdict} />
              <span className="sr-only">: {why.join("; ")}</span>
            </span>
          ) : (
            <VerdictBadge verdict={info.row.original.verdict} />
          );
        },
      }),
      column.accessor("fundamentalHz", {
        // Say so when the frequencies shown were corrected to the spec's reference temperature.
        header: corrected ? `Fundamental at ${referenceTemperatureC}\u00a0°C (Hz)` : "Fundamental (Hz)",
        cell: (info) => formatNumber(info.getValue(), 3),
        meta: { numeric: true },
      }),
      column.accessor("deviationCents", {
        header: "Deviation (cents)",
        meta: { numeric: true },
        cell: (info) => <span className={outside(info.getValue()) ? "font-semibold text-rust-700" : undefined}>{formatCents(info.getValue())}</span>,
      }),
      column.accessor("overtoneRatio", { header: "Overtone ratio", cell: (info) => formatNumber(info.getValue(), 3), meta: { numeric: true } }),
      column.accessor("t60S", {
        header: "T60 (s)",
        meta: { numeric: true },
        cell: (info) => {
          const from = info.getValue() != null ? t60ExtrapolatedFrom(info.row.original.t60ObservedDecayDb) : null;
          return (
            <>
              {formatNumber(info.getValue(), 1)}
              {info.getValue() != null && info.row.original.t60Unreliable ? <span className="block text-caption text-ochre-600">unreliable</span> : from ? <span className="block text-caption text-ink-faint">{from}</span> : null}
            </>
          );
        },
      }),
      column.accessor("q", { header: "Q", cell: (info) => formatNumber(info.getValue(), 0), meta: { numeric: true } }),
      column.accessor((row) => row.disposition?.decision ?? "", {
        id: "disposition",
        header: "Disposition",
        cell: (info) => <Disposition row={info.row.original} />,
      }),
      column.accessor("strikes", {
        header: "Strikes",
        meta: { numeric: true },
        cell: (info) => <Strikes row={info.row.original} />,
      }),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [unitHref, toleranceCents, corrected, referenceTemperatureC, bulk, selected, selectable],
  );

  const data = useMemo(
    () => (filter === "all" ? rows : rows.filter((row) => (filter === "open" ? row.open : row.verdict === "out_of_tolerance"))),
    [rows, filter],
  );
  const table = useReactTable({ data, columns, state: { sorting }, onSortingChange: setSorting, getCoreRowModel: getCoreRowModel(), getSortedRowModel: getSortedRowModel(), getRowId: (row) => row.id });
  const shown = useRef<string[]>([]);
  shown.current = table.getRowModel().rows.map((r) => r.id);

  /** A click toggles one unit; a shift-click sets every unit between it and the last one clicked, in the order shown. */
  function toggle(id: string, event: MouseEvent<HTMLInputElement>) {
    const on = !selected.has(id);
    const next = new Set(selected);
    const order = shown.current;
    const from = lastClicked.current ? order.indexOf(lastClicked.current) : -1;
    const to = order.indexOf(id);
    const range = event.shiftKey && from >= 0 && to >= 0 ? order.slice(Math.min(from, to), Math.max(from, to) + 1) : [id];
    for (const r of range) {
      if (!selectable.has(r)) continue;
      if (on) next.add(r);
      else next.delete(r);
    }
    lastClicked.current = id;
    setSelected(next);
  }
  const counts: Record<LedgerFilter, number> = {
    all: rows.length,
    out_of_tolerance: rows.filter((r) => r.verdict === "out_of_tolerance").length,
    open: rows.filter((r) => r.open).length,
  };

  return (
    <div className="flex flex-col gap-3">
      {bulk && chosen.length > 0 ? (
        <BulkDispositionForm workshopId={bulk.workshopId} batchId={bulk.batchId} selected={chosen} onDone={() => setSelected(new Set())} onClear={() => setSelected(new Set())} />
      ) : bulk && selectable.size > 1 ? (
        <p className="no-print text-caption text-ink-soft">
          Tick the units awaiting a decision (shift-click for a range) to record one disposition for all of them.
        </p>
      ) : null}
      <div role="group" aria-label="Show" className="no-print inline-flex flex-wrap self-start rounded-control border border-line-strong p-0.5">
        {(Object.keys(filterLabels) as LedgerFilter[]).map((option) => (
          <button
            key={option}
            type="button"
            aria-pressed={filter === option}
            onClick={() => setFilter(option)}
            className={clsx("min-h-9 rounded-[0.4rem] px-3 text-caption font-medium", filter === option ? "bg-steel-600 text-white" : "text-ink-soft hover:bg-sunken")}
          >
            {filterLabels[option]} ({counts[option]})
          </button>
        ))}
      </div>
      {data.length === 0 ? (
        <EmptyState title={rows.length === 0 ? "No units in this batch yet" : `No units are ${filter === "open" ? "open" : "out of tolerance"}`}>
          {rows.length === 0 ? "Add units by a list of serials or a serial range below." : "Choose “All units” to see the whole batch."}
        </EmptyState>
      ) : phone ? (
        <ul className="flex flex-col gap-2" aria-label="Units of the batch">
          {table.getRowModel().rows.slice(0, limit).map(({ original: row }) => (
            <li key={row.id} className={clsx("rounded-control border border-line px-3 py-2.5", row.verdict === "out_of_tolerance" ? "bg-rust-50/60" : "bg-surface")}>
              <div className="flex flex-wrap items-center justify-between gap-x-3 gap-y-1">
                <span className="flex items-center gap-2">
                  {bulk ? (
                    <input
                      type="checkbox"
                      className="no-print size-5 accent-steel-600 disabled:opacity-30"
                      aria-label={`Select ${row.serial}`}
                      disabled={!selectable.has(row.id)}
                      checked={selected.has(row.id) && selectable.has(row.id)}
                      onChange={() => undefined}
                      onClick={(event) => toggle(row.id, event)}
                    />
                  ) : null}
                  <Link to={unitHref(row.id)} className="text-lead font-semibold text-steel-700 underline underline-offset-2">
                    {row.serial}
                  </Link>
                </span>
                <VerdictBadge verdict={row.verdict} />
              </div>
              {row.why.length ? <p className="mt-1 text-caption text-ink-soft">{row.why.join("; ")}</p> : null}
              <dl className="mt-1 flex flex-wrap gap-x-5 gap-y-1 text-caption">
                <CardFact label="Deviation">
                  <span className={clsx("text-body tabular-nums", outside(row.deviationCents) && "font-semibold text-rust-700")}>{formatCents(row.deviationCents)}</span>
                </CardFact>
                <CardFact label="T60">
                  <span className="text-body tabular-nums">{row.t60S != null ? `${formatNumber(row.t60S, 1)} s` : "—"}</span>
                  {row.t60S != null && row.t60Unreliable ? <span className="ml-1 text-caption text-ochre-600">unreliable</span> : row.t60S != null && t60ExtrapolatedFrom(row.t60ObservedDecayDb) ? <span className="ml-1 text-caption text-ink-faint">{t60ExtrapolatedFrom(row.t60ObservedDecayDb)}</span> : null}
                </CardFact>
                {/* A disposition only where one is made or awaited; a unit within tolerance needs none. */}
                {row.disposition || (row.open && row.verdict && row.verdict !== "within_tolerance") ? (
                  <CardFact label="Disposition">
                    <Disposition row={row} />
                  </CardFact>
                ) : null}
                {row.pendingStrikes > 0 ? (
                  <CardFact label="Strikes">
                    <Strikes row={row} />
                  </CardFact>
                ) : null}
              </dl>
            </li>
          ))}
        </ul>
      ) : (
        <div className="ledger-scroll max-w-full overflow-x-auto">
          <table className="ledger-table w-full text-left">
            <caption className="sr-only">Units of the batch</caption>
            <thead className="border-b border-line-strong text-caption text-ink-soft">
              {table.getHeaderGroups().map((group) => (
                <tr key={group.id}>
                  {group.headers.map((header) => {
                    const numeric = (header.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                    const sorted = header.column.getIsSorted();
                    return (
                      <th
                        key={header.id}
                        scope="col"
                        aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none"}
                        className={clsx("py-2 pr-3 align-bottom font-semibold", numeric && "text-right", header.column.id === "serial" && "sticky left-0 z-10 bg-surface")}
                      >
                        <button type="button" onClick={header.column.getToggleSortingHandler()} className={clsx("inline-flex items-end gap-1 hover:text-ink", numeric && "justify-end text-right")}>
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <span aria-hidden="true" className="no-print text-ink-faint">
                            {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}
                          </span>
                        </button>
                      </th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody className="divide-y divide-line">
              {table.getRowModel().rows.slice(0, limit).map((row) => (
                <tr key={row.id} className={clsx(row.original.verdict === "out_of_tolerance" && "bg-rust-50/60")}>
                  {row.getVisibleCells().map((cell) => {
                    const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                    return (
                      <td
                        key={cell.id}
                        className={clsx(
                          "whitespace-nowrap py-2 pr-3 align-middle",
                          numeric && "text-right tabular-nums",
                          // The serial stays in view while the row scrolls; it keeps the row's own tint.
                          cell.column.id === "serial" && (row.original.verdict === "out_of_tolerance" ? "sticky left-0 z-10 bg-[#fbf0ec]" : "sticky left-0 z-10 bg-surface"),
                        )}
                      >
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {data.length > limit ? (
        <div className="no-print mt-3 flex flex-wrap items-center gap-3 text-caption text-ink-soft">
          <span>
            Showing {limit} of {data.length} units{sorting.length ? " (sorted)" : ""}.
          </span>
          <button type="button" className="font-medium text-steel-700 underline underline-offset-2" onClick={() => setLimit((n) => n + FIRST_ROWS)}>
            Show {Math.min(FIRST_ROWS, data.length - limit)} more
          </button>
          <button type="button" className="font-medium text-steel-700 underline underline-offset-2" onClick={() => setLimit(Number.POSITIVE_INFINITY)}>
            Show all {data.length}
          </button>
        </div>
      ) : null}
    </div>
  );
}

function Disposition({ row }: { row: LedgerRow }) {
  if (row.disposition) return <DispositionBadge decision={row.disposition.decision} />;
  return row.open && row.verdict && row.verdict !== "within_tolerance" ? <span className="text-caption text-ochre-600">Awaiting decision</span> : <span className="text-ink-faint">—</span>;
}

function Strikes({ row }: { row: LedgerRow }) {
  return (
    <span>
      {row.strikes}
      {row.pendingStrikes > 0 ? <span className="ml-1 text-caption text-steel-700">({row.pendingStrikes} analysing)</span> : null}
    </span>
  );
}

function CardFact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="flex min-w-0 items-baseline gap-1.5">
      <dt className="text-ink-faint">{label}</dt>
      <dd className="min-w-0">{children}</dd>
    </div>
  );
}
