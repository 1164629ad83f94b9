/** The strike page belongs to the visual analysis feature; the app layer only guards and mounts it. */
import type { QueryClient } from "@tanstack/react-query";
import { lazy, Suspense } from "react";
import type { LoaderFunctionArgs } from "react-router";
import { Spinner } from "@/components/ui/spinner";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";

// Lazily: its charts (uPlot, the waveform player) are only needed on this page.
const StrikePage = lazy(() => import("@/features/strike-viz/routes/strike-page"));

export const strikeLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  assertCan(await requireWorkshop(queryClient, request), "strike", "read", "reading strikes");
  return null;
};

export function StrikeRoute() {
  return (
    <Suspense fallback={<Spinner label="Loading the strike…" />}>
      <StrikePage />
    </Suspense>
  );
}
