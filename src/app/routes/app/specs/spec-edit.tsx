import type { QueryClient } from "@tanstack/react-query";
import { Link, useNavigate, useParams, type LoaderFunctionArgs } from "react-router";
import type { SpecFormValues } from "@shared/schemas/spec";
import { PageHeader, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { useCreateSpecVersion } from "@/features/specs/api/create-spec-version";
import { getSpecQueryOptions, useSpec } from "@/features/specs/api/get-spec";
import { SpecForm } from "@/features/specs/components/spec-form";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const specEditLoader = (queryClient: QueryClient) => async ({ request, params }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "spec", "write", "writing specifications");
  await queryClient.ensureQueryData(getSpecQueryOptions(me.activeWorkshop.id, params.specId ?? ""));
  return null;
};

export function SpecEditRoute() {
  const me = useSignedInMe();
  const navigate = useNavigate();
  const { specId = "" } = useParams();
  const spec = useSpec(me.activeWorkshop.id, specId);
  const save = useCreateSpecVersion(me.activeWorkshop.id, specId);
  if (spec.isPending) return <Spinner label="Loading the specification…" />;
  if (spec.isError) throw spec.error;
  const current = spec.data.versions.find((v) => v.version === spec.data.currentVersion) ?? spec.data.versions[0];
  const defaults: SpecFormValues = {
    name: current.name,
    family: current.family,
    description: current.description,
    referenceTemperatureC: current.referenceTemperatureC,
    tempCoefficientPerC: current.tempCoefficientPerC,
    decisionRule: current.decisionRule,
    strikesRequired: current.strikesRequired,
    lengthMm: current.lengthMm,
    referencePitchHz: current.referencePitchHz,
    partials: current.partials.map((p) => ({ ...p })),
    changeNote: "",
  };

  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-4">
        <Link to={paths.app.specification.getHref(specId)} className="font-medium text-steel-700 underline underline-offset-2">
          ← {spec.data.name}
        </Link>
      </nav>
      <PageHeader
        title={`Edit ${spec.data.name}`}
        description={`Saving makes version ${spec.data.currentVersion + 1}. Version ${spec.data.currentVersion} stays as it is, and batches made under it keep it.`}
      />
      <Panel>
        <SpecForm
          mode="version"
          familyLocked
          defaultValues={defaults}
          submitLabel={`Save as version ${spec.data.currentVersion + 1}`}
          onSubmit={async (values) => {
            await save.mutateAsync(values);
            navigate(paths.app.specification.getHref(specId));
          }}
        />
      </Panel>
    </>
  );
}
