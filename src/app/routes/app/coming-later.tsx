import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { PageHeader, Panel } from "@/components/ui/panel";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";

/** Same guard as the finished pages will have, so a role that may not read them is told so now. */
export const batchesLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  assertCan(await requireWorkshop(queryClient, request), "batch", "read", "reading batches");
  return null;
};

export const specificationsLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  assertCan(await requireWorkshop(queryClient, request), "spec", "read", "reading specifications");
  return null;
};

/** A screen that is listed in the navigation but not built yet: it says so, and shows no made-up data. */
function ComingLater({ title, what, arrives }: { title: string; what: string; arrives: string }) {
  return (
    <>
      <PageHeader title={title} description={what} />
      <Panel>
        <p className="text-lead font-semibold">{arrives}</p>
        <p className="mt-2 text-ink-soft">Nothing is stored here yet, so there is nothing to show. This page fills in when that part of Tinelog is released.</p>
      </Panel>
    </>
  );
}

export function BatchesRoute() {
  return (
    <ComingLater
      title="Batches"
      what="Production lots, each made under one specification version, with every unit's measurements."
      arrives="Batches arrive with the ledger."
    />
  );
}

export function SpecificationsRoute() {
  return (
    <ComingLater
      title="Specifications"
      what="Target pitch, overtone ratios, tolerances and decay limits for each product, in versions."
      arrives="Specifications arrive with the ledger."
    />
  );
}
