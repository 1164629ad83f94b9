import { describe, expect, it } from "vitest";
import { frequencyTicks } from "./ticks";

describe("frequencyTicks", () => {
  it("puts 1-2-5 ticks on a wide log axis", () => {
    expect(frequencyTicks(10, 24_000, true)).toEqual([10, 20, 50, 100, 200, 500, 1000, 2000, 5000, 10_000, 20_000]);
  });
  it("steps evenly on a zoomed log axis and on a linear one", () => {
    expect(frequencyTicks(392.3, 494.2, true)).toEqual([400, 420, 440, 460, 480]);
    expect(frequencyTicks(0, 24_000, false)).toEqual([0, 5000, 10_000, 15_000, 20_000]);
  });
});
