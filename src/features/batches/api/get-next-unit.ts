import { api } from "@/lib/api-client";

export type NextUnit = { id: string; serial: string } | null;

/** The first unit of the batch with no strike yet. Asked at the moment of the click, never cached. */
export async function getNextUnit(batchId: string): Promise<NextUnit> {
  return (await api.get<{ unit: NextUnit }>(`/api/batches/${encodeURIComponent(batchId)}/next-unit`)).unit;
}
