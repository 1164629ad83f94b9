import { queryOptions, useQuery } from "@tanstack/react-query";
import type { BatchSummary } from "@shared/schemas/batch";
import type { InstrumentDue } from "@shared/schemas/instrument";
import { api } from "@/lib/api-client";

export type Dashboard = { openBatches: BatchSummary[]; awaitingReview: number; released: number; instrumentsDue: InstrumentDue[] };

export function getDashboard(): Promise<Dashboard> {
  return api.get<Dashboard>("/api/dashboard");
}

export const getDashboardQueryOptions = (workshopId: string) => queryOptions({ queryKey: ["workshops", workshopId, "dashboard"], queryFn: getDashboard });

/** Refreshed every 10 s while open: analyses finish and colleagues dispose in the background. */
export function useDashboard(workshopId: string) {
  return useQuery({ ...getDashboardQueryOptions(workshopId), refetchInterval: 10_000 });
}
