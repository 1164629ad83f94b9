import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import type { ModeMap } from "@shared/schemas/modes";
import { api } from "@/lib/api-client";

/** What the mode map is asked for: a batch (or all), a set of units, and the beam geometry. Strings as in the URL. */
export type ModeMapParams = Partial<Record<"batch" | "units" | "template" | "section" | "lengthMm" | "thicknessMm" | "densityKgM3" | "lengthUncertaintyMm" | "thicknessUncertaintyMm" | "densityUncertaintyKgM3", string>>;

export function modeMapSearch(params: ModeMapParams): string {
  const search = new URLSearchParams();
  for (const [k, v] of Object.entries(params).sort(([a], [b]) => a.localeCompare(b))) if (v) search.set(k, v);
  const s = search.toString();
  return s ? `?${s}` : "";
}

export function getModeMap(specId: string, params: ModeMapParams): Promise<ModeMap> {
  return api.get<ModeMap>(`/api/specs/${encodeURIComponent(specId)}/mode-map${modeMapSearch(params)}`);
}

/** Every mode-map query of a spec sits under this key, so an import refreshes them all. */
export const modeMapKey = (workshopId: string, specId: string) => ["workshops", workshopId, "specs", specId, "mode-map"] as const;

export const getModeMapQueryOptions = (workshopId: string, specId: string, params: ModeMapParams) =>
  queryOptions({ queryKey: [...modeMapKey(workshopId, specId), modeMapSearch(params)], queryFn: () => getModeMap(specId, params), placeholderData: keepPreviousData });

export function useModeMap(workshopId: string, specId: string, params: ModeMapParams) {
  return useQuery(getModeMapQueryOptions(workshopId, specId, params));
}
