import type { QueryClient } from "@tanstack/react-query";
import { useSearchParams, type LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader, Panel } from "@/components/ui/panel";
import { paths } from "@/config/paths";
import { getBatchesQueryOptions } from "@/features/batches/api/get-batches";
import { BatchesList } from "@/features/batches/components/batches-list";
import { filtersFromParams, paramsFromFilters } from "@/features/batches/lib/batch-filters";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const batchesListLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "batch", "read", "reading batches");
  await queryClient.ensureQueryData(getBatchesQueryOptions(me.activeWorkshop.id));
  return null;
};

export function BatchesListRoute() {
  const me = useSignedInMe();
  // The filters live in the address: a filtered view can be bookmarked and shared.
  const [params, setParams] = useSearchParams();
  const newButton = can(me.activeWorkshop.role, "batch", "create") ? (
    <ButtonLink to={paths.app.newBatch.getHref()} variant="primary">
      New batch
    </ButtonLink>
  ) : undefined;
  return (
    <>
      <PageHeader title="Batches" description="Production lots, each made under one specification version, with every unit's measurements." actions={newButton} />
      <Panel>
        <BatchesList
          workshopId={me.activeWorkshop.id}
          batchHref={paths.app.batch.getHref}
          emptyAction={newButton}
          filters={filtersFromParams(params)}
          onFiltersChange={(f) => setParams(paramsFromFilters(f), { replace: true })}
        />
      </Panel>
    </>
  );
}
