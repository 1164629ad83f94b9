/**
 * Quoting a value with its standard uncertainty to two significant digits of the uncertainty
 * (GUM, JCGM 100:2008 §7.2.6: "it is usually sufficient to quote … at most two significant digits").
 */
import { describe, expect, it } from "vitest";
import { scientific, signed, splitUncertainty, withUncertainty, unreliableReason } from "./format";

describe("uncertainty formatting", () => {
  it("rounds the value to the uncertainty's second significant digit", () => {
    expect(withUncertainty(440.41078970273696, 0.012713564408203572, "Hz")).toBe("440.411 ± 0.013 Hz");
    expect(withUncertainty(5.719305876, 0.0969, "s")).toBe("5.719 ± 0.097 s");
    expect(withUncertainty(2707.32, 1.234, "Hz")).toBe("2707.3 ± 1.2 Hz");
    expect(withUncertainty(12345.6, 23.4, "Hz")).toBe("12346 ± 23 Hz");
  });
  it("switches the uncertainty to scientific notation past four decimals", () => {
    expect(splitUncertainty(440.3050911132083, 4.7181567587263143e-7)).toEqual({ value: "440.3051", u: "4.7 × 10⁻⁷" });
    expect(scientific(3.608941385576006e-5)).toBe("3.6 × 10⁻⁵");
  });
  it("shows a value without an uncertainty when there is none", () => {
    expect(splitUncertainty(1.23456, 0)).toEqual({ value: "1.235", u: null });
  });
  it("signs with a true minus", () => {
    expect(signed(-33.0, 1)).toBe("−33.0");
    expect(signed(1.2, 1)).toBe("+1.2");
  });
});

describe("unreliableReason", () => {
  const base = { tauUnreliable: true };
  it("names the most telling reason first, and nothing for a reliable τ", () => {
    expect(unreliableReason({ tauUnreliable: false, nonExponential: true })).toBeNull();
    expect(unreliableReason({ ...base, nonExponential: true, roomMasked: true })).toBe("decay not exponential");
    expect(unreliableReason({ ...base, roomMasked: true })).toBe("masked by the room");
    expect(unreliableReason({ ...base, earlyStageOverlap: true })).toBe("early decay overlaps");
    expect(unreliableReason(base)).toBe("record longer");
  });
});
