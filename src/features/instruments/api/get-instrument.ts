import { queryOptions, useQuery } from "@tanstack/react-query";
import type { InstrumentDetail } from "@shared/schemas/instrument";
import { api } from "@/lib/api-client";
import { instrumentsKey } from "./get-instruments";

export function getInstrument(id: string): Promise<InstrumentDetail> {
  return api.get<InstrumentDetail>(`/api/instruments/${encodeURIComponent(id)}`);
}

export const getInstrumentQueryOptions = (workshopId: string, id: string) => queryOptions({ queryKey: [...instrumentsKey(workshopId), "detail", id], queryFn: () => getInstrument(id) });

export function useInstrument(workshopId: string, id: string) {
  return useQuery(getInstrumentQueryOptions(workshopId, id));
}
