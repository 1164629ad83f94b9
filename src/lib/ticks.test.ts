import { describe, expect, it } from "vitest";
import { frequencyTickLabel, frequencyTicks, tickLabelPx } from "./ticks";

/** True when no two neighbouring labels overlap at `widthPx` (the same estimate of label size the code uses). */
function fits(ticks: number[], lo: number, hi: number, log: boolean, widthPx: number) {
  const x = (v: number) => (log ? Math.log(v / lo) / Math.log(hi / lo) : (v - lo) / (hi - lo)) * widthPx;
  return ticks.every((v, i) => i === 0 || x(v) - x(ticks[i - 1]) >= (tickLabelPx(frequencyTickLabel(v)) + tickLabelPx(frequencyTickLabel(ticks[i - 1]))) / 2);
}

describe("frequencyTicks", () => {
  it("puts 1-2-5 ticks on a wide log axis", () => {
    expect(frequencyTicks(10, 24_000, true)).toEqual([10, 20, 50, 100, 200, 500, 1000, 2000, 5000, 10_000, 20_000]);
    expect(frequencyTicks(10, 24_000, true, 1000)).toEqual([10, 20, 50, 100, 200, 500, 1000, 2000, 5000, 10_000, 20_000]);
  });
  it("steps evenly on a zoomed log axis and on a linear one", () => {
    expect(frequencyTicks(392.3, 494.2, true)).toEqual([400, 420, 440, 460, 480]);
    expect(frequencyTicks(0, 24_000, false)).toEqual([0, 5000, 10_000, 15_000, 20_000]);
  });
  it("thins the ticks to the width, so labels never run together on a phone", () => {
    for (const width of [200, 260, 300, 400, 600]) {
      const log = frequencyTicks(10, 24_000, true, width);
      expect(fits(log, 10, 24_000, true, width), `log at ${width} px: ${log}`).toBe(true);
      expect(log.length).toBeGreaterThanOrEqual(2);
      const linear = frequencyTicks(0, 24_000, false, width);
      expect(fits(linear, 0, 24_000, false, width), `linear at ${width} px: ${linear}`).toBe(true);
      expect(linear.length).toBeGreaterThanOrEqual(2);
    }
    expect(frequencyTicks(10, 24_000, true, 300)).toEqual([10, 100, 1000, 10_000]);
  });
  it("labels ticks in Hz and kHz", () => {
    expect([50, 2500, 12_000, 2.5].map(frequencyTickLabel)).toEqual(["50", "2.5k", "12k", "2.5"]);
  });
});
