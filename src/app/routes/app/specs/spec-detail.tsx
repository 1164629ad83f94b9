import type { QueryClient } from "@tanstack/react-query";
import { Link, useParams, type LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { familyLabels } from "@shared/schemas/spec";
import { ButtonLink, buttonClasses } from "@/components/ui/button";
import { PageHeader, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { getSpecQueryOptions, useSpec } from "@/features/specs/api/get-spec";
import { SpecVersions } from "@/features/specs/components/spec-versions";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const specDetailLoader = (queryClient: QueryClient) => async ({ request, params }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "spec", "read", "reading specifications");
  await queryClient.ensureQueryData(getSpecQueryOptions(me.activeWorkshop.id, params.specId ?? ""));
  return null;
};

export function SpecDetailRoute() {
  const me = useSignedInMe();
  const { specId = "" } = useParams();
  const spec = useSpec(me.activeWorkshop.id, specId);
  if (spec.isPending) return <Spinner label="Loading the specification…" />;
  if (spec.isError) throw spec.error;
  const current = spec.data.versions.find((v) => v.version === spec.data.currentVersion) ?? spec.data.versions[0];

  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-4">
        <Link to={paths.app.specifications.getHref()} className="font-medium text-steel-700 underline underline-offset-2">
          ← Specifications
        </Link>
      </nav>
      <PageHeader
        title={spec.data.name}
        description={`${familyLabels[spec.data.family]} · version ${spec.data.currentVersion} · used by ${spec.data.batches} batch${spec.data.batches === 1 ? "" : "es"}`}
        actions={
          <>
            <ButtonLink to={paths.app.specificationModes.getHref(spec.data.id)} variant="secondary">
              Modes
            </ButtonLink>
            {/* The file of the current version, to copy the design to another site (import it under New specification). */}
            <a href={`/api/specs/${encodeURIComponent(spec.data.id)}/export`} download className={buttonClasses("secondary")}>
              Export file
            </a>
            {can(me.activeWorkshop.role, "spec", "write") ? (
              <ButtonLink to={paths.app.editSpecification.getHref(spec.data.id)} variant="primary">
                Edit (new version)
              </ButtonLink>
            ) : null}
          </>
        }
      />
      {current?.description ? (
        <Panel className="mb-6">
          <h2 className="text-title font-semibold">Description</h2>
          <p className="mt-2 max-w-prose whitespace-pre-line text-ink-soft">{current.description}</p>
        </Panel>
      ) : null}
      <Panel aria-labelledby="versions-heading">
        <h2 id="versions-heading" className="mb-4 text-title font-semibold">
          Version history
        </h2>
        <SpecVersions spec={spec.data} />
      </Panel>
    </>
  );
}
