import type { QueryClient } from "@tanstack/react-query";
import { useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router";
import { families, familyLabels, type Family } from "@shared/schemas/spec";
import { specTemplate } from "@shared/spec-templates";
import { PageHeader, Panel } from "@/components/ui/panel";
import { paths } from "@/config/paths";
import { useCreateSpec } from "@/features/specs/api/create-spec";
import { SpecForm } from "@/features/specs/components/spec-form";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const specNewLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  assertCan(await requireWorkshop(queryClient, request), "spec", "write", "writing specifications");
  return null;
};

const isFamily = (value: string | null): value is Family => !!value && (families as readonly string[]).includes(value);

export function SpecNewRoute() {
  const me = useSignedInMe();
  const navigate = useNavigate();
  const [search, setSearch] = useSearchParams();
  const raw = search.get("family");
  const family: Family = isFamily(raw) ? raw : "tuning_fork";
  const template = specTemplate(family);
  const create = useCreateSpec(me.activeWorkshop.id);

  return (
    <>
      <PageHeader title="New specification" description="Start from a family template: its overtone ratios come from beam theory, with the sources named. Then set your own pitch and tolerances." />
      <div className="flex flex-col gap-6">
        <Panel aria-labelledby="template-heading">
          <h2 id="template-heading" className="text-title font-semibold">
            Template: {familyLabels[family]}
          </h2>
          <p className="mt-2 max-w-prose text-ink-soft">{template.description}</p>
        </Panel>
        <Panel>
          {/* A new family loads a fresh template, so the form starts over under its key. */}
          <SpecForm
            key={family}
            mode="create"
            defaultValues={template}
            onFamilyChange={(next) => setSearch({ family: next }, { replace: true })}
            submitLabel="Create specification"
            onSubmit={async (values) => {
              const spec = await create.mutateAsync(values);
              navigate(paths.app.specification.getHref(spec.id));
            }}
          />
        </Panel>
      </div>
    </>
  );
}
