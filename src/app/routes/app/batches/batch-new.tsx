import type { QueryClient } from "@tanstack/react-query";
import { useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { ButtonLink } from "@/components/ui/button";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { CreateBatchForm } from "@/features/batches/components/create-batch-form";
import { getSpecsQueryOptions, useSpecs } from "@/features/specs/api/get-specs";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const batchNewLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "batch", "create", "creating batches");
  await queryClient.ensureQueryData(getSpecsQueryOptions(me.activeWorkshop.id));
  return null;
};

export function BatchNewRoute() {
  const me = useSignedInMe();
  const navigate = useNavigate();
  const [search] = useSearchParams();
  const specs = useSpecs(me.activeWorkshop.id);
  if (specs.isPending) return <Spinner label="Loading specifications…" />;
  if (specs.isError) throw specs.error;

  return (
    <>
      <PageHeader title="New batch" description="A production lot under one specification version. Its units get serials now or later." />
      <Panel className="max-w-3xl">
        {specs.data.length === 0 ? (
          <EmptyState
            title="No specification to make a batch under"
            action={
              can(me.activeWorkshop.role, "spec", "write") ? (
                <ButtonLink to={paths.app.newSpecification.getHref()} variant="primary">
                  Write a specification
                </ButtonLink>
              ) : undefined
            }
          >
            Every batch is checked against a specification. {can(me.activeWorkshop.role, "spec", "write") ? "Write one first." : "Ask a quality member to write one."}
          </EmptyState>
        ) : (
          <CreateBatchForm
            workshopId={me.activeWorkshop.id}
            specs={specs.data}
            defaultSpecId={search.get("spec") ?? undefined}
            onCreated={(batch) => navigate(paths.app.batch.getHref(batch.id))}
          />
        )}
      </Panel>
    </>
  );
}
