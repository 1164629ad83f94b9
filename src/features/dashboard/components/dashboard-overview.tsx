/** The workshop at a glance: open batches with their progress, and how many units wait for QA. */
import type { ReactNode } from "react";
import { Link } from "react-router";
import { Alert } from "@/components/ui/alert";
import { EmptyState, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { BatchStateBadge } from "@/components/ui/status-badges";
import { VerdictBadge } from "@/components/ui/status-badges";
import { formatCents, formatDate } from "@/lib/format";
import { useDashboard } from "../api/get-dashboard";
import { useReviewQueue } from "../api/get-review-queue";

type Props = {
  workshopId: string;
  batchHref: (id: string) => string;
  unitHref: (id: string) => string;
  instrumentHref: (id: string) => string;
  /** What to do when there is no open batch (create one, or ask for one), chosen by role. */
  noBatchesAction: ReactNode;
  reviewNote: string;
};

export function DashboardOverview({ workshopId, batchHref, unitHref, instrumentHref, noBatchesAction, reviewNote }: Props) {
  const dashboard = useDashboard(workshopId);
  const queue = useReviewQueue(workshopId, dashboard.data?.openBatches ?? []);
  if (dashboard.isPending) return <Spinner label="Loading the workshop's batches…" />;
  if (dashboard.isError) return <Alert tone="error">{dashboard.error.message}</Alert>;
  const { openBatches, awaitingReview, released, instrumentsDue } = dashboard.data;

  return (
    <div className="grid items-start gap-6 lg:grid-cols-[1fr_22rem]">
      <Panel aria-labelledby="open-heading">
        <h2 id="open-heading" className="text-title font-semibold">
          Open batches
        </h2>
        {openBatches.length === 0 ? (
          <div className="mt-4">
            <EmptyState title="No open batches" action={noBatchesAction}>
              {released > 0 ? `All ${released} batch${released === 1 ? " is" : "es are"} released. ` : ""}Start a batch for the next production run, then strike and upload each unit.
            </EmptyState>
          </div>
        ) : (
          <ul className="mt-3 divide-y divide-line" aria-label="Open batches">
            {openBatches.map((b) => {
              const share = b.units > 0 ? b.measured / b.units : 0;
              return (
                <li key={b.id} className="flex flex-wrap items-center justify-between gap-3 py-3">
                  <div className="min-w-0">
                    <Link to={batchHref(b.id)} className="font-semibold text-steel-700 underline underline-offset-2">
                      {b.code}
                    </Link>{" "}
                    <BatchStateBadge state={b.state} />
                    <p className="text-caption text-ink-soft">
                      {b.spec.name} · version {b.spec.version}
                    </p>
                  </div>
                  <div className="flex items-center gap-3 text-caption">
                    <span className="tabular-nums">
                      {b.measured} / {b.units} measured
                    </span>
                    <span aria-hidden="true" className="h-2 w-24 overflow-hidden rounded-full bg-sunken">
                      <span className="block h-full rounded-full bg-steel-500" style={{ width: `${share * 100}%` }} />
                    </span>
                    {b.outOfTolerance > 0 ? <span className="font-semibold text-rust-700">{b.outOfTolerance} out of tolerance</span> : null}
                    {b.inconclusive > 0 ? <span className="text-ochre-600">{b.inconclusive} inconclusive</span> : null}
                  </div>
                </li>
              );
            })}
          </ul>
        )}
      </Panel>
      <Panel aria-labelledby="review-heading">
        <h2 id="review-heading" className="text-title font-semibold">
          Awaiting review
        </h2>
        <p className="mt-2 text-display font-semibold tabular-nums">{awaitingReview}</p>
        <p className="text-ink-soft">
          {awaitingReview === 0
            ? "No unit in an open batch is out of tolerance or inconclusive."
            : `unit${awaitingReview === 1 ? "" : "s"} out of tolerance or inconclusive in open batches. ${reviewNote}`}
        </p>
        {awaitingReview > 0 ? (
          queue.pending ? (
            <Spinner size="sm" label="Listing them…" />
          ) : queue.error ? (
            <Alert tone="error">{queue.error.message}</Alert>
          ) : queue.items.length > 0 ? (
            <ul aria-label="Units awaiting review" className="mt-3 divide-y divide-line">
              {queue.items.map(({ batch, row }) => (
                <li key={row.id} className="flex flex-col gap-0.5 py-2 text-caption">
                  <span className="flex flex-wrap items-center justify-between gap-x-3 gap-y-1">
                    <span className="whitespace-nowrap">
                      <Link to={unitHref(row.id)} className="font-semibold text-steel-700 underline underline-offset-2">
                        {row.serial}
                      </Link>{" "}
                      <span className="text-ink-faint">in {batch.code}</span>
                    </span>
                    <VerdictBadge verdict={row.verdict} />
                  </span>
                  {/* Why, in the spec's own terms: "Fundamental −9.4 ¢ outside ±5 ¢", "T60 17.3 s < 20 s minimum". */}
                  <span className="text-ink-soft">{row.why.length ? row.why.join("; ") : formatCents(row.deviationCents)}</span>
                </li>
              ))}
            </ul>
          ) : (
            <p className="mt-2 text-caption text-ink-soft">Each of them already has a disposition.</p>
          )
        ) : null}
        <p className="mt-3 text-caption text-ink-faint">{released} batch{released === 1 ? "" : "es"} released so far.</p>
      </Panel>
      {instrumentsDue?.length ? (
        <Panel aria-labelledby="due-heading" className="lg:col-start-2">
          <h2 id="due-heading" className="text-title font-semibold">
            Calibrations due
          </h2>
          <p className="text-caption text-ink-soft">Within 30 days, or overdue. Strikes measured with an expired instrument carry the assumed tolerance and cannot be certified as traceable.</p>
          <ul aria-label="Instruments due for calibration" className="mt-3 divide-y divide-line">
            {instrumentsDue.map((i) => (
              <li key={i.id} className="flex flex-wrap items-center justify-between gap-x-3 gap-y-1 py-2 text-caption">
                <Link to={instrumentHref(i.id)} className="font-semibold text-steel-700 underline underline-offset-2">
                  {i.name}
                </Link>
                <span className={i.status === "expired" ? "font-semibold text-rust-700" : "text-ochre-600"}>
                  {i.dueInDays !== null && i.dueInDays < 0 ? `overdue since ${formatDate(i.validUntil!)}` : `due ${formatDate(i.validUntil!)} (${i.dueInDays} day${i.dueInDays === 1 ? "" : "s"})`}
                </span>
              </li>
            ))}
          </ul>
        </Panel>
      ) : null}
    </div>
  );
}
