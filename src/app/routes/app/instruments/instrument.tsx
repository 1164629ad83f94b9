/** One instrument: its status, the offset over time (recorders), its calibration history, and a new calibration. */
import type { QueryClient } from "@tanstack/react-query";
import { Link, useParams, type LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { instrumentKindLabels } from "@shared/schemas/instrument";
import { PageHeader, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { getInstrumentQueryOptions, useInstrument } from "@/features/instruments/api/get-instrument";
import { CalibrationHistory } from "@/features/instruments/components/calibration-history";
import { CalibrationStatusBadge } from "@/features/instruments/components/calibration-status-badge";
import { OffsetChart } from "@/features/instruments/components/offset-chart";
import { RecorderCalibrationForm } from "@/features/instruments/components/recorder-calibration-form";
import { ThermometerCalibrationForm } from "@/features/instruments/components/thermometer-calibration-form";
import { calibrationResult, dueWords } from "@/features/instruments/lib/format";
import { assertCan } from "@/lib/authorization";
import { formatDate } from "@/lib/format";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const instrumentLoader = (queryClient: QueryClient) => async ({ request, params }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "instrument", "read", "reading instruments");
  await queryClient.ensureQueryData(getInstrumentQueryOptions(me.activeWorkshop.id, params.instrumentId ?? ""));
  return null;
};

export function InstrumentRoute() {
  const me = useSignedInMe();
  const { instrumentId = "" } = useParams();
  const workshopId = me.activeWorkshop.id;
  const query = useInstrument(workshopId, instrumentId);
  if (query.isPending) return <Spinner label="Loading the instrument…" />;
  if (query.isError) throw query.error;
  const i = query.data;
  const canWrite = can(me.activeWorkshop.role, "instrument", "write");
  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-4">
        <Link to={paths.app.instruments.getHref()} className="font-medium text-steel-700 underline underline-offset-2">
          ← Instruments
        </Link>
      </nav>
      <PageHeader
        title={i.name}
        description={
          <>
            <CalibrationStatusBadge status={i.status} />{" "}
            <span className="ml-1">
              {instrumentKindLabels[i.kind]}
              {i.model ? ` · ${i.model}` : ""}
              {i.serial ? ` · serial ${i.serial}` : ""} · calibrations valid {i.validityMonths} months
            </span>
          </>
        }
      />
      <div className="flex flex-col gap-6">
        <Panel aria-labelledby="current-heading">
          <h2 id="current-heading" className="mb-2 text-title font-semibold">
            Current calibration
          </h2>
          {i.latest ? (
            <p className="text-lead" data-testid="current-calibration">
              <span className="font-semibold tabular-nums">{calibrationResult(i.latest)}</span>
              <span className="block text-body text-ink-soft">
                {i.latest.number} of {formatDate(i.latest.calibratedAt)}, valid until {formatDate(i.latest.validUntil)} ({dueWords(i.status, i.dueInDays)})
              </span>
            </p>
          ) : (
            <p className="text-ink-soft">Never calibrated: measurements with it carry the workshop's assumed tolerance, and certificates cannot state traceability for them.</p>
          )}
          {i.kind === "recorder" && i.history.length > 0 ? (
            <div className="mt-4">
              <h3 className="mb-2 font-semibold">Offset over time</h3>
              <OffsetChart calibrations={i.history} />
            </div>
          ) : null}
        </Panel>
        {canWrite ? (
          <Panel aria-labelledby="calibrate-heading">
            <h2 id="calibrate-heading" className="mb-3 text-title font-semibold">
              {i.kind === "recorder" ? "Calibrate against a reference tone" : "Enter a calibration certificate"}
            </h2>
            {i.kind === "recorder" ? <RecorderCalibrationForm workshopId={workshopId} instrumentId={i.id} /> : <ThermometerCalibrationForm workshopId={workshopId} instrumentId={i.id} />}
          </Panel>
        ) : null}
        <Panel aria-labelledby="history-heading">
          <h2 id="history-heading" className="mb-3 text-title font-semibold">
            History
          </h2>
          <CalibrationHistory history={i.history} />
        </Panel>
      </div>
    </>
  );
}
