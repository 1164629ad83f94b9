import { queryOptions, useQuery } from "@tanstack/react-query";
import type { InstrumentSummary } from "@shared/schemas/instrument";
import { api } from "@/lib/api-client";

export async function getInstruments(): Promise<InstrumentSummary[]> {
  return (await api.get<{ instruments: InstrumentSummary[] }>("/api/instruments")).instruments;
}

/** Every instrument query sits under this key, so a new calibration refreshes the list and the detail. */
export const instrumentsKey = (workshopId: string) => ["workshops", workshopId, "instruments"] as const;

export const getInstrumentsQueryOptions = (workshopId: string) => queryOptions({ queryKey: [...instrumentsKey(workshopId), "list"], queryFn: getInstruments });

export function useInstruments(workshopId: string, enabled = true) {
  return useQuery({ ...getInstrumentsQueryOptions(workshopId), enabled });
}
