/** Bucket decimation: never more points than columns, and no peak lost. */
import { describe, expect, it } from "vitest";
import { decimate, decimateIndices } from "./decimate";

describe("decimate", () => {
  const x = Array.from({ length: 2000 }, (_, i) => 10 + i * 12); // 10 Hz … 23 998 Hz
  const y = x.map((f) => -100 + (Math.abs(f - 442) < 7 ? 90 : 0) + (Math.abs(f - 2698) < 7 ? 70 : 0));

  it("keeps at most one point per column and every narrow peak", () => {
    for (const log of [false, true]) {
      const out = decimate(x, y, 300, { log });
      expect(out.x.length).toBeLessThanOrEqual(300);
      expect(Math.max(...(out.y as number[]))).toBe(-10);
      expect(out.y).toContain(-30);
      // x stays ascending
      for (let i = 1; i < out.x.length; i++) expect(out.x[i]).toBeGreaterThan(out.x[i - 1]);
    }
  });

  it("minmax keeps both extremes of each bucket, at most two per column", () => {
    const t = Array.from({ length: 600 }, (_, i) => i / 150);
    // A beating envelope: 0.8 Hz beats, 20 dB deep.
    const env = t.map((s) => -10 - 3 * s + 10 * Math.cos(2 * Math.PI * 0.8 * s));
    const keep = decimateIndices(t, env, 100, { mode: "minmax" });
    expect(keep.length).toBeLessThanOrEqual(200);
    const kept = keep.map((i) => env[i]);
    expect(Math.max(...kept)).toBe(Math.max(...env));
    expect(Math.min(...kept)).toBe(Math.min(...env));
  });

  it("returns the points in range unchanged when they already fit, and honours a zoom range", () => {
    expect(decimate([1, 2, 3], [5, 6, 7], 10)).toEqual({ x: [1, 2, 3], y: [5, 6, 7] });
    const zoom = decimate(x, y, 1000, { range: [400, 500] });
    expect(zoom.x.every((f) => f >= 400 && f <= 500)).toBe(true);
    expect(zoom.x.length).toBe(x.filter((f) => f >= 400 && f <= 500).length);
  });

  it("says what is wrong with its input", () => {
    expect(() => decimate([1, 2], [1], 5)).toThrow(/same length, got 2 and 1/);
    expect(() => decimate([1, 2], [1, 2], 0)).toThrow(/at least 1, got 0/);
    expect(() => decimate([0, 2], [1, 2], 5, { log: true, range: [0, 2] })).toThrow(/logarithmic axis needs x > 0/);
  });
});
