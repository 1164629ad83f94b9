/**
 * The batch list's filters, read from and written to the page address (state, specification,
 * created between two dates), so a filtered view can be bookmarked and shared.
 */
import { batchStates, type BatchState, type BatchSummary } from "@shared/schemas/batch";

export type BatchFilters = { state: BatchState | null; spec: string | null; from: string | null; to: string | null };

const isoDay = /^\d{4}-\d{2}-\d{2}$/;

export function filtersFromParams(params: URLSearchParams): BatchFilters {
  const state = params.get("state");
  const from = params.get("from");
  const to = params.get("to");
  return {
    state: state && (batchStates as readonly string[]).includes(state) ? (state as BatchState) : null,
    spec: params.get("spec") || null,
    from: from && isoDay.test(from) ? from : null,
    to: to && isoDay.test(to) ? to : null,
  };
}

export function paramsFromFilters(f: BatchFilters): URLSearchParams {
  const p = new URLSearchParams();
  if (f.state) p.set("state", f.state);
  if (f.spec) p.set("spec", f.spec);
  if (f.from) p.set("from", f.from);
  if (f.to) p.set("to", f.to);
  return p;
}

/** "Created between" counts whole days in UTC, both ends included. */
export function applyFilters(batches: BatchSummary[], f: BatchFilters): BatchSummary[] {
  return batches.filter((b) => {
    const day = b.createdAt.slice(0, 10);
    return (!f.state || b.state === f.state) && (!f.spec || b.spec.id === f.spec) && (!f.from || day >= f.from) && (!f.to || day <= f.to);
  });
}

export const hasFilters = (f: BatchFilters) => Boolean(f.state || f.spec || f.from || f.to);
