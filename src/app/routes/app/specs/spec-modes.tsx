/**
 * The Modes page of a specification (under the specification): the mode map over the batches made
 * under it. The batch list comes from the batches feature and is handed to the modes feature here,
 * so the two features stay apart.
 */
import type { QueryClient } from "@tanstack/react-query";
import { Link, useParams, useSearchParams, type LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { familyLabels } from "@shared/schemas/spec";
import { PageHeader } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { getBatchesQueryOptions, useBatches } from "@/features/batches/api/get-batches";
import { getModeMapQueryOptions, type ModeMapParams } from "@/features/modes/api/get-mode-map";
import { ModesView } from "@/features/modes/components/modes-view";
import { getSpecQueryOptions, useSpec } from "@/features/specs/api/get-spec";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

const PARAMS = ["batch", "units", "template", "section", "lengthMm", "thicknessMm", "densityKgM3", "lengthUncertaintyMm", "thicknessUncertaintyMm", "densityUncertaintyKgM3"] as const;

function paramsOf(search: URLSearchParams): ModeMapParams {
  const out: ModeMapParams = {};
  for (const k of PARAMS) {
    const v = search.get(k);
    if (v) out[k] = v;
  }
  return out;
}

export const specModesLoader = (queryClient: QueryClient) => async ({ request, params }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "spec", "read", "reading specifications");
  const workshopId = me.activeWorkshop.id;
  const specId = params.specId ?? "";
  await Promise.all([
    queryClient.ensureQueryData(getSpecQueryOptions(workshopId, specId)),
    queryClient.ensureQueryData(getBatchesQueryOptions(workshopId)),
    queryClient.ensureQueryData(getModeMapQueryOptions(workshopId, specId, paramsOf(new URL(request.url).searchParams))),
  ]);
  return null;
};

export function SpecModesRoute() {
  const me = useSignedInMe();
  const { specId = "" } = useParams();
  const [search, setSearch] = useSearchParams();
  const workshopId = me.activeWorkshop.id;
  const spec = useSpec(workshopId, specId);
  const batches = useBatches(workshopId);
  if (spec.isPending || batches.isPending) return <Spinner label="Loading the specification…" />;
  if (spec.isError) throw spec.error;
  if (batches.isError) throw batches.error;
  const current = spec.data.versions.find((v) => v.version === spec.data.currentVersion) ?? spec.data.versions[0];
  const ours = batches.data.filter((b) => b.spec.id === spec.data.id).map((b) => ({ id: b.id, code: b.code, units: b.units, measured: b.measured }));
  const params = paramsOf(search);

  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-4">
        <Link to={paths.app.specification.getHref(spec.data.id)} className="font-medium text-steel-700 underline underline-offset-2">
          ← {spec.data.name}
        </Link>
      </nav>
      <PageHeader
        title="Modes of the design"
        description={`${spec.data.name} · ${familyLabels[spec.data.family]} · version ${spec.data.currentVersion}. Which measured partial is which mode of the model, what stiffness the parts really have, and which modes survive being held.`}
      />
      <ModesView
        workshopId={workshopId}
        spec={{ id: spec.data.id, name: spec.data.name, family: spec.data.family, currentVersion: spec.data.currentVersion, currentVersionId: spec.data.currentVersionId, lengthMm: current?.lengthMm ?? null }}
        params={params}
        onParams={(next) => {
          const s = new URLSearchParams();
          for (const k of PARAMS) if (next[k]) s.set(k, next[k]!);
          setSearch(s, { replace: true });
        }}
        batches={ours}
        canWrite={can(me.activeWorkshop.role, "spec", "write")}
      />
    </>
  );
}
