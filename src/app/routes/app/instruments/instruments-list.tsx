/** The Instruments screen: every recorder and thermometer with its calibration status; owner and QA add new ones. */
import type { QueryClient } from "@tanstack/react-query";
import { useNavigate, type LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { PageHeader, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { Alert } from "@/components/ui/alert";
import { paths } from "@/config/paths";
import { getInstrumentsQueryOptions, useInstruments } from "@/features/instruments/api/get-instruments";
import { CreateInstrumentForm } from "@/features/instruments/components/create-instrument-form";
import { InstrumentsList } from "@/features/instruments/components/instruments-list";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const instrumentsListLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "instrument", "read", "reading instruments");
  await queryClient.ensureQueryData(getInstrumentsQueryOptions(me.activeWorkshop.id));
  return null;
};

export function InstrumentsListRoute() {
  const me = useSignedInMe();
  const navigate = useNavigate();
  const workshopId = me.activeWorkshop.id;
  const canWrite = can(me.activeWorkshop.role, "instrument", "write");
  const instruments = useInstruments(workshopId);
  return (
    <>
      <PageHeader
        title="Instruments"
        description="The recorders whose clock counts every frequency, and the thermometers whose readings correct them. A calibrated instrument's offset is corrected and its own uncertainty used; otherwise the workshop's assumed tolerance applies."
      />
      <div className="flex flex-col gap-6">
        <Panel aria-labelledby="instruments-heading">
          <h2 id="instruments-heading" className="mb-3 text-title font-semibold">
            Recorders and thermometers
          </h2>
          {instruments.isPending ? <Spinner label="Loading the instruments…" /> : instruments.isError ? <Alert tone="error">{instruments.error.message}</Alert> : <InstrumentsList instruments={instruments.data} instrumentHref={paths.app.instrument.getHref} />}
        </Panel>
        {canWrite ? (
          <Panel aria-labelledby="new-instrument-heading">
            <h2 id="new-instrument-heading" className="mb-3 text-title font-semibold">
              Add an instrument
            </h2>
            <CreateInstrumentForm workshopId={workshopId} onCreated={(id) => navigate(paths.app.instrument.getHref(id))} />
          </Panel>
        ) : null}
      </div>
    </>
  );
}
