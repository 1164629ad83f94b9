import type { QueryClient } from "@tanstack/react-query";
import clsx from "clsx";
import { useState } from "react";
import { useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router";
import type { MasterDraftResponse } from "@shared/schemas/master";
import { families, familyLabels, type Family, type SpecFormValues } from "@shared/schemas/spec";
import { specTemplate } from "@shared/spec-templates";
import { Alert } from "@/components/ui/alert";
import { PageHeader, Panel } from "@/components/ui/panel";
import { paths } from "@/config/paths";
import { useCreateSpec } from "@/features/specs/api/create-spec";
import { MasterSummary, MasterUnitForm } from "@/features/specs/components/master-unit-form";
import { SpecFileImport } from "@/features/specs/components/spec-file-import";
import { SpecForm } from "@/features/specs/components/spec-form";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const specNewLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  assertCan(await requireWorkshop(queryClient, request), "spec", "write", "writing specifications");
  return null;
};

const isFamily = (value: string | null): value is Family => !!value && (families as readonly string[]).includes(value);

type Start = "template" | "master" | "file";
const startLabels: Record<Start, string> = { template: "A family template", master: "A master unit", file: "A file" };
/** A draft that replaced the template: from the master's recording or from a file. */
type Draft = { values: SpecFormValues; origin: string; master?: MasterDraftResponse; serial: number };

export function SpecNewRoute() {
  const me = useSignedInMe();
  const navigate = useNavigate();
  const [search, setSearch] = useSearchParams();
  const raw = search.get("family");
  const family: Family = isFamily(raw) ? raw : "tuning_fork";
  const [start, setStart] = useState<Start>(search.get("from") === "master" ? "master" : "template");
  const [draft, setDraft] = useState<Draft | null>(null);
  const template = specTemplate(family);
  const create = useCreateSpec(me.activeWorkshop.id);
  const values = draft?.values ?? template;

  return (
    <>
      <PageHeader title="New specification" description="Start from a family template, from a master unit your workshop keeps, or from a file exported at another site; then set your own pitch and tolerances." />
      <div className="flex flex-col gap-6">
        <Panel aria-labelledby="start-heading">
          <h2 id="start-heading" className="text-title font-semibold">
            Start from
          </h2>
          <div role="group" aria-label="Start from" className="mt-3 inline-flex flex-wrap rounded-control border border-line-strong p-0.5">
            {(Object.keys(startLabels) as Start[]).map((option) => (
              <button
                key={option}
                type="button"
                aria-pressed={start === option}
                onClick={() => setStart(option)}
                className={clsx("min-h-9 rounded-[0.4rem] px-3 text-caption font-medium", start === option ? "bg-steel-600 text-white" : "text-ink-soft hover:bg-sunken")}
              >
                {startLabels[option]}
              </button>
            ))}
          </div>
          <div className="mt-4">
            {start === "template" ? (
              <>
                <h3 className="text-lead font-semibold">Template: {familyLabels[family]}</h3>
                <p className="mt-2 max-w-prose whitespace-pre-line text-ink-soft">{template.description}</p>
                <p className="mt-2 text-caption text-ink-faint">Choose another product family in the editor below to load its template.</p>
              </>
            ) : start === "master" ? (
              <MasterUnitForm family={family} onDraft={(result) => setDraft((d) => ({ values: result.draft, origin: `the master recording ${result.master.fileName}`, master: result, serial: (d?.serial ?? 0) + 1 }))} />
            ) : (
              <SpecFileImport onLoaded={(v, from) => setDraft((d) => ({ values: v, origin: from, serial: (d?.serial ?? 0) + 1 }))} />
            )}
          </div>
        </Panel>
        {draft ? (
          <Panel aria-labelledby="draft-heading">
            <h2 id="draft-heading" className="text-title font-semibold">
              Draft from {draft.origin}
            </h2>
            <div className="mt-3">{draft.master ? <MasterSummary result={draft.master} /> : <Alert tone="success">The file was read and checked; its specification is in the editor below.</Alert>}</div>
          </Panel>
        ) : null}
        <Panel>
          {/* A new family or a new draft loads fresh values, so the form starts over under its key. */}
          <SpecForm
            key={draft ? `draft-${draft.serial}` : family}
            mode="create"
            defaultValues={values}
            onFamilyChange={(next) => {
              setDraft(null);
              setSearch({ family: next }, { replace: true });
            }}
            submitLabel="Create specification"
            onSubmit={async (v) => {
              const spec = await create.mutateAsync(v);
              navigate(paths.app.specification.getHref(spec.id));
            }}
          />
        </Panel>
      </div>
    </>
  );
}
