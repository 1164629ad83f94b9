/**
 * The batch ledger page. Screen: summary, QA actions, the maker's quick path, the ledger table,
 * the batch charts and adding units. Print (QA files the printed ledger): the controls drop out
 * and a header with the batch, specification and print time appears (index.css, @media print).
 */
import type { QueryClient } from "@tanstack/react-query";
import { Link, useParams, type LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { familyLabels } from "@shared/schemas/spec";
import { Button } from "@/components/ui/button";
import { PageHeader, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { BatchStateBadge } from "@/components/ui/status-badges";
import { paths } from "@/config/paths";
import { BatchCharts } from "@/features/batch-charts/components/batch-charts";
import { BatchCertificatesPanel } from "@/features/certificates/components/batch-certificates-panel";
import { getInstrumentsQueryOptions, useInstruments } from "@/features/instruments/api/get-instruments";
import { getBatchQueryOptions, useBatch } from "@/features/batches/api/get-batch";
import { AddUnitsForm } from "@/features/batches/components/add-units-form";
import { BatchActions } from "@/features/batches/components/batch-actions";
import { BatchDropZone, MeasureNextUnitButton } from "@/features/batches/components/batch-drop-zone";
import { LedgerSummary } from "@/features/batches/components/ledger-summary";
import { LedgerTable } from "@/features/batches/components/ledger-table";
import { assertCan } from "@/lib/authorization";
import { formatDateTime } from "@/lib/format";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const batchLedgerLoader = (queryClient: QueryClient) => async ({ request, params }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "batch", "read", "reading batches");
  await queryClient.ensureQueryData(getBatchQueryOptions(me.activeWorkshop.id, params.batchId ?? ""));
  // The upload's instrument choice needs the list at once (a remembered recorder is shown as chosen).
  if (can(me.activeWorkshop.role, "instrument", "read")) await queryClient.ensureQueryData(getInstrumentsQueryOptions(me.activeWorkshop.id));
  return null;
};

export function BatchLedgerRoute() {
  const me = useSignedInMe();
  const { batchId = "" } = useParams();
  const { id: workshopId, role } = me.activeWorkshop;
  const batch = useBatch(workshopId, batchId);
  const instruments = useInstruments(workshopId, can(role, "instrument", "read"));
  if (batch.isPending) return <Spinner label="Loading the ledger…" />;
  if (batch.isError) throw batch.error;
  const b = batch.data;
  const released = b.state === "released";

  return (
    <>
      <nav aria-label="Breadcrumb" className="no-print mb-4">
        <Link to={paths.app.batches.getHref()} className="font-medium text-steel-700 underline underline-offset-2">
          ← Batches
        </Link>
      </nav>
      <div className="print-only mb-4 border-b border-ink pb-2 text-caption">
        {me.activeWorkshop.name} · batch ledger printed {formatDateTime(new Date())} by {me.user.name}
      </div>
      <PageHeader
        title={`Batch ${b.code}`}
        description={
          <>
            <BatchStateBadge state={b.state} /> <span className="ml-1">{b.spec.name}, version {b.spec.version} ({familyLabels[b.spec.family]})</span>
            {b.notes ? <span className="mt-1 block text-body">{b.notes}</span> : null}
          </>
        }
        actions={
          <span className="no-print flex flex-wrap gap-2">
            <a href={`/api/batches/${encodeURIComponent(b.id)}/ledger.csv`} download className="inline-flex min-h-touch items-center rounded-control border border-line-strong bg-surface px-4 font-medium text-ink hover:bg-sunken">
              Export CSV
            </a>
            <Button variant="secondary" onClick={() => window.print()}>
              Print ledger
            </Button>
          </span>
        }
      />

      <div className="flex flex-col gap-6">
        <Panel aria-labelledby="summary-heading">
          <h2 id="summary-heading" className="sr-only">
            Summary
          </h2>
          <LedgerSummary batch={b} />
          <div className="no-print mt-5 border-t border-line pt-4">
            <BatchActions workshopId={workshopId} batch={b} role={role} />
          </div>
        </Panel>

        {!released && can(role, "strike", "create") ? (
          <Panel aria-labelledby="measure-heading" className="no-print">
            <div className="mb-4 flex flex-wrap items-start justify-between gap-3">
              <div>
                <h2 id="measure-heading" className="text-title font-semibold">
                  Measure the batch
                </h2>
                <p className="text-ink-soft">Open the next unit still to be measured, or drop a whole set of recordings at once.</p>
              </div>
              <MeasureNextUnitButton batchId={b.id} unitHref={paths.app.unit.getHref} />
            </div>
            <BatchDropZone workshopId={workshopId} batchId={b.id} unitHref={paths.app.unit.getHref} userId={me.user.id} instruments={instruments.data ?? []} />
          </Panel>
        ) : null}

        <Panel aria-labelledby="ledger-heading" className="print-flat">
          <h2 id="ledger-heading" className="mb-3 text-title font-semibold">
            Ledger
          </h2>
          <LedgerTable
            rows={b.rows}
            unitHref={paths.app.unit.getHref}
            toleranceCents={b.fundamentalToleranceCents}
            referenceTemperatureC={b.referenceTemperatureC}
            bulk={!released && can(role, "disposition", "create") ? { workshopId, batchId: b.id } : undefined}
          />
        </Panel>

        {released && can(role, "certificate", "read") ? (
          <Panel aria-labelledby="certificates-heading" className="no-print">
            <h2 id="certificates-heading" className="mb-3 text-title font-semibold">
              Certificates
            </h2>
            <BatchCertificatesPanel
              workshopId={workshopId}
              batchId={b.id}
              batchCode={b.code}
              canIssue={can(role, "certificate", "issue")}
              canWithdraw={can(role, "certificate", "withdraw")}
              unitHref={paths.app.unit.getHref}
            />
          </Panel>
        ) : null}

        {/* ── Batch charts slot: control chart, histogram and capability (src/features/batch-charts) ── */}
        <section aria-label="Batch charts" className="print-break-before">
          <BatchCharts batch={b} />
        </section>
        {/* ── end of batch charts slot ── */}

        {!released && can(role, "unit", "create") ? (
          <Panel aria-labelledby="add-heading" className="no-print">
            <h2 id="add-heading" className="mb-3 text-title font-semibold">
              Add units
            </h2>
            <AddUnitsForm workshopId={workshopId} batchId={b.id} lastSerial={b.rows.at(-1)?.serial ?? null} remaining={b.quantity - b.units} />
          </Panel>
        ) : null}
      </div>
    </>
  );
}
