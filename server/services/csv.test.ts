/**
 * CSV cells against RFC 4180 (quoting) and the OWASP "CSV Injection" guidance (the payloads below
 * are the guidance's own kinds: =, +, -, @, tab and carriage return at the start of a cell).
 */
import { describe, expect, it } from "vitest";
import { csvCell, csvDocument, num } from "./csv.ts";

describe("csvCell", () => {
  it("prefixes a single quote to text that a spreadsheet would run as a formula", () => {
    expect(csvCell('=HYPERLINK("http://attacker.example","Click")')).toBe(`"'=HYPERLINK(""http://attacker.example"",""Click"")"`);
    expect(csvCell("+1+2")).toBe("'+1+2");
    expect(csvCell("-2+3")).toBe("'-2+3");
    expect(csvCell("@SUM(A1:A9)")).toBe("'@SUM(A1:A9)");
    expect(csvCell("\tcmd")).toBe("'\tcmd");
    expect(csvCell("\r=1")).toBe(`"'\r=1"`);
  });

  it("leaves ordinary text alone and quotes commas, quotes and line breaks (RFC 4180 §2.6–2.7)", () => {
    expect(csvCell("F-0004")).toBe("F-0004");
    expect(csvCell("Customer accepts, in writing")).toBe('"Customer accepts, in writing"');
    expect(csvCell('the "practice" fork')).toBe('"the ""practice"" fork"');
    expect(csvCell("two\nlines")).toBe('"two\nlines"');
  });

  it("keeps numbers numeric, a negative one included", () => {
    expect(csvCell(num(-3.2, 2))).toBe("-3.20");
    expect(csvCell(num(440.12346, 4))).toBe("440.1235");
    expect(csvCell(num(null, 2))).toBe("");
    expect(csvCell(num(Number.NaN, 2))).toBe("");
  });

  it("joins rows with CRLF and ends with one", () => {
    expect(csvDocument([["a", num(1, 0)], [null, "=x"]])).toBe("a,1\r\n,'=x\r\n");
  });
});
