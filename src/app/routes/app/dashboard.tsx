import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { can, roleLabels } from "@shared/permissions";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/panel";
import { paths } from "@/config/paths";
import { getDashboardQueryOptions } from "@/features/dashboard/api/get-dashboard";
import { DashboardOverview } from "@/features/dashboard/components/dashboard-overview";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const dashboardLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  if (can(me.activeWorkshop.role, "batch", "read")) await queryClient.ensureQueryData(getDashboardQueryOptions(me.activeWorkshop.id));
  return null;
};

export function DashboardRoute() {
  const me = useSignedInMe();
  const { role, name, id } = me.activeWorkshop;

  return (
    <>
      <PageHeader
        title="Dashboard"
        description={`${name} · you work here as ${roleLabels[role] ?? role}.`}
        actions={
          can(role, "batch", "create") ? (
            <ButtonLink to={paths.app.batches.getHref()} variant="secondary">
              All batches
            </ButtonLink>
          ) : undefined
        }
      />
      <DashboardOverview
        workshopId={id}
        batchHref={paths.app.batch.getHref}
        unitHref={paths.app.unit.getHref}
        instrumentHref={paths.app.instrument.getHref}
        noBatchesAction={
          can(role, "batch", "create") ? (
            <ButtonLink to={paths.app.newBatch.getHref()} variant="primary">
              New batch
            </ButtonLink>
          ) : null
        }
        reviewNote={
          can(role, "disposition", "create")
            ? "Open a batch, filter its ledger to “Out of tolerance” and decide a disposition for each."
            : "A quality member decides what happens to each."
        }
      />
    </>
  );
}
