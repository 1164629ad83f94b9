import { describe, expect, it } from "vitest";
import type { BatchSummary } from "@shared/schemas/batch";
import { applyFilters, filtersFromParams, paramsFromFilters } from "./batch-filters";

const batch = (code: string, state: BatchSummary["state"], specId: string, createdAt: string) => ({ code, state, createdAt, spec: { id: specId } }) as unknown as BatchSummary;
const list = [batch("A", "open", "s1", "2026-11-01T10:00:00Z"), batch("B", "released", "s1", "2026-11-15T23:59:00Z"), batch("C", "released", "s2", "2026-12-01T00:00:00Z")];

describe("batch filters in the address", () => {
  it("round-trips through the query string and ignores values it does not know", () => {
    const f = filtersFromParams(new URLSearchParams("state=released&spec=s1&from=2026-11-01&to=2026-11-30"));
    expect(f).toEqual({ state: "released", spec: "s1", from: "2026-11-01", to: "2026-11-30" });
    expect(paramsFromFilters(f).toString()).toBe("state=released&spec=s1&from=2026-11-01&to=2026-11-30");
    expect(filtersFromParams(new URLSearchParams("state=lost&from=yesterday"))).toEqual({ state: null, spec: null, from: null, to: null });
  });

  it("filters by state, specification and creation day, both ends included", () => {
    const codes = (q: string) => applyFilters(list, filtersFromParams(new URLSearchParams(q))).map((b) => b.code);
    expect(codes("state=released")).toEqual(["B", "C"]);
    expect(codes("spec=s1")).toEqual(["A", "B"]);
    expect(codes("from=2026-11-15&to=2026-12-01")).toEqual(["B", "C"]);
    expect(codes("to=2026-11-14")).toEqual(["A"]);
  });
});
