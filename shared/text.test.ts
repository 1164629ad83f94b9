/**
 * Control characters are removed on input. The character classes are those of Unicode's general
 * category Cc (The Unicode Standard, chapter 23.1 "Control Codes"): U+0000–U+001F, U+007F–U+009F.
 */
import { describe, expect, it } from "vitest";
import { cleanStrings, stripControlCharacters } from "./text.ts";

describe("stripControlCharacters", () => {
  it("removes NUL and the other C0 and C1 controls", () => {
    expect(stripControlCharacters("Ada\u0000 Lovelace")).toBe("Ada Lovelace");
    expect(stripControlCharacters("\u0007bell\u001b[31mred\u007f\u0085\u009f")).toBe("bell[31mred");
  });

  it("keeps tab and line feed, turns CR LF and CR into LF, and leaves other text alone", () => {
    expect(stripControlCharacters("line 1\r\nline 2\rline 3\tend")).toBe("line 1\nline 2\nline 3\tend");
    expect(stripControlCharacters("漢字 · כהן · Ωμέγα · \u00A0")).toBe("漢字 · כהן · Ωμέγα · \u00A0");
  });

  it("cleans every string of a nested body and leaves numbers, booleans and null as they are", () => {
    const body = { name: "A\u0000B", partials: [{ label: "f\u00001", toleranceCents: 5, required: true }], notes: null };
    expect(cleanStrings(body)).toEqual({ name: "AB", partials: [{ label: "f1", toleranceCents: 5, required: true }], notes: null });
  });
});
