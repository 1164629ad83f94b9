import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader, Panel } from "@/components/ui/panel";
import { paths } from "@/config/paths";
import { getSpecsQueryOptions } from "@/features/specs/api/get-specs";
import { SpecsList } from "@/features/specs/components/specs-list";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const specsListLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "spec", "read", "reading specifications");
  await queryClient.ensureQueryData(getSpecsQueryOptions(me.activeWorkshop.id));
  return null;
};

export function SpecsListRoute() {
  const me = useSignedInMe();
  const canWrite = can(me.activeWorkshop.role, "spec", "write");
  const newButton = canWrite ? (
    <ButtonLink to={paths.app.newSpecification.getHref()} variant="primary">
      New specification
    </ButtonLink>
  ) : undefined;
  return (
    <>
      <PageHeader title="Specifications" description="Target pitch, overtone ratios, tolerances and decay limits for each product, in versions." actions={newButton} />
      <Panel>
        <SpecsList workshopId={me.activeWorkshop.id} specHref={paths.app.specification.getHref} emptyAction={newButton ?? <p>Ask a quality member to write the first one.</p>} />
      </Panel>
    </>
  );
}
