import { describe, expect, it } from "vitest";
import { MAX_RANGE_SIZE, SerialListError, SerialRangeError, expandSerialRange, offsetSerial, parseSerialList, serialFromFileName, splitSerialList } from "./serials.ts";

function rangeError(from: string, to: string): SerialRangeError {
  try {
    expandSerialRange(from, to);
  } catch (e) {
    if (e instanceof SerialRangeError) return e;
    throw e;
  }
  throw new Error(`expected "${from}"…"${to}" to be refused`);
}

describe("expandSerialRange", () => {
  it("expands F-0001…F-0120 into 120 zero-padded serials, in order", () => {
    const serials = expandSerialRange("F-0001", "F-0120");
    expect(serials).toHaveLength(120);
    expect(serials[0]).toBe("F-0001");
    expect(serials[9]).toBe("F-0010");
    expect(serials[99]).toBe("F-0100");
    expect(serials[119]).toBe("F-0120");
    expect(new Set(serials).size).toBe(120);
    expect(serials.every((s) => /^F-\d{4}$/.test(s))).toBe(true);
  });

  it("keeps a suffix and the numbers that do not change", () => {
    expect(expandSerialRange("B7-098-A", "B7-101-A")).toEqual(["B7-098-A", "B7-099-A", "B7-100-A", "B7-101-A"]);
    expect(expandSerialRange("2026/07", "2026/09")).toEqual(["2026/07", "2026/08", "2026/09"]);
  });

  it("counts an unpadded number across a change of width", () => {
    expect(expandSerialRange("T8", "T11")).toEqual(["T8", "T9", "T10", "T11"]);
  });

  it("gives one serial when both ends are the same, and trims blanks", () => {
    expect(expandSerialRange(" F-0007 ", "F-0007")).toEqual(["F-0007"]);
  });

  it("accepts exactly the maximum and refuses one more", () => {
    expect(expandSerialRange("U-00001", "U-05000")).toHaveLength(MAX_RANGE_SIZE);
    const e = rangeError("U-00001", "U-05001");
    expect(e.problem).toBe("too_many");
    expect(e.message).toContain("5001 serials");
    expect(e.message).toContain("at most 5000");
  });

  it("refuses ends with different prefixes or suffixes, naming the difference", () => {
    const e = rangeError("F-0001", "G-0120");
    expect(e.problem).toBe("prefix_mismatch");
    expect(e.message).toContain('"F-" against "G-"');
    expect(rangeError("F-0001-A", "F-0009-B").problem).toBe("prefix_mismatch");
    expect(rangeError("F-0001", "F-0009x").message).toContain('"x" appears in only one of them');
    // Letter case is part of a stored serial, so it must match too.
    expect(rangeError("f-0001", "F-0009").problem).toBe("prefix_mismatch");
  });

  it("refuses a backwards range", () => {
    const e = rangeError("F-0120", "F-0001");
    expect(e.problem).toBe("reversed");
    expect(e.message).toBe('The range runs backwards: "F-0120" comes after "F-0001". Put the lower serial first.');
  });

  it("refuses zero-padded ends of different widths", () => {
    const e = rangeError("F-001", "F-1200");
    expect(e.problem).toBe("width_mismatch");
    expect(e.message).toContain("3 and 4 digits");
    expect(rangeError("F-5", "F-010").problem).toBe("width_mismatch");
  });

  it("refuses more than one changing number, serials without a number, empty ends and absurd widths", () => {
    expect(rangeError("B1-0001", "B2-0009").problem).toBe("several_numbers_change");
    expect(rangeError("B1-0001", "B2-0009").message).toContain("1→2, 0001→0009");
    expect(rangeError("FORK-A", "FORK-B").problem).toBe("no_number");
    expect(rangeError("", "F-0001").problem).toBe("empty");
    expect(rangeError("F-0000000000000001", "F-0000000000000009").problem).toBe("too_many_digits");
  });
});

describe("parseSerialList", () => {
  it("splits on newlines, commas, semicolons and blanks, keeps order and drops empties", () => {
    expect(parseSerialList("F-0003\nF-0001, F-0002;\r\n\n  F-0010\tF-0004 ,,")).toEqual(["F-0003", "F-0001", "F-0002", "F-0010", "F-0004"]);
    expect(parseSerialList("  \n , ")).toEqual([]);
  });

  it("reports every repeated serial once, letter case ignored", () => {
    expect(splitSerialList("A1 A2 a1 A3 A2 A1")).toEqual({ serials: ["A1", "A2", "A3"], duplicates: ["a1", "A2"] });
    let caught: unknown;
    try {
      parseSerialList("A1\nA2\na1\nA2");
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(SerialListError);
    expect((caught as SerialListError).duplicates).toEqual(["a1", "A2"]);
    expect((caught as SerialListError).message).toBe("These serials appear more than once (letter case ignored): a1, A2. Remove the repeats and try again.");
  });
});

describe("serialFromFileName", () => {
  const serials = ["F-001", "F-0010", "F-0011", "BELL-7"];

  it("finds a serial in a file name, ignoring letter case and returning it as listed", () => {
    expect(serialFromFileName("f-0010_strike2.wav", serials)).toBe("F-0010");
    expect(serialFromFileName("Recording bell-7 take 3.WAV", serials)).toBe("BELL-7");
    expect(serialFromFileName("C:\\takes\\F-001.wav", serials)).toBe("F-001");
  });

  it("does not find F-001 inside F-0010, nor a serial inside a longer word", () => {
    expect(serialFromFileName("F-0012.wav", serials)).toBeNull();
    expect(serialFromFileName("XBELL-7.wav", serials)).toBeNull();
    expect(serialFromFileName("F-001take2.wav", serials)).toBe("F-001");
  });

  it("prefers the longest match", () => {
    expect(serialFromFileName("unit F-0011.wav", ["F-0011", "F-001", "F-0011-B"])).toBe("F-0011");
    expect(serialFromFileName("unit F-0011-B.wav", ["F-0011", "F-0011-B"])).toBe("F-0011-B");
  });

  it("gives null when nothing matches, or when two different serials of the same length do", () => {
    expect(serialFromFileName("strike.wav", serials)).toBeNull();
    expect(serialFromFileName("F-0010 and F-0011.wav", serials)).toBeNull();
    expect(serialFromFileName("anything.wav", [])).toBeNull();
  });
});

describe("offsetSerial", () => {
  it("advances the trailing counter and keeps its width", () => {
    expect(offsetSerial("F-0001", 119)).toBe("F-0120");
    expect(offsetSerial("CT-0701", 2)).toBe("CT-0703");
    expect(offsetSerial("A9", 1)).toBe("A10");
    expect(offsetSerial("F-0010", -9)).toBe("F-0001");
  });
  it("gives null for a serial without a counter or one that would go below zero", () => {
    expect(offsetSerial("ALPHA", 1)).toBeNull();
    expect(offsetSerial("F-0001", -2)).toBeNull();
  });
});
