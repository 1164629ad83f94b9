/**
 * Reading predicted-mode tables. The inputs are written the way spreadsheet and modal-analysis
 * exports commonly look (header names in words and units, semicolons and decimal commas in
 * European locales, a UTF-8 byte-order mark from spreadsheet "CSV UTF-8" exports, UTF-16 text
 * exports): common practice, no published source. RFC 4180 (Common Format and MIME Type for CSV
 * Files) is the reference for quoting: a quoted field may hold the separator and line breaks.
 */
import { describe, expect, it } from "vitest";
import { decodeTableBytes, guessMapping, importModeText, ModeTableError, parseNumber, readModeTable } from "./mode-import";

describe("our own format (README)", () => {
  it("reads mode, frequencyHz, label, kind and condition", () => {
    const r = importModeText("mode,frequencyHz,label,kind,condition\n7,452.9,First balanced,balanced,free\n8,706.2,,unbalanced,\n");
    expect(r.errors).toEqual([]);
    expect(r.modes).toEqual([
      { line: 2, mode: 7, frequencyHz: 452.9, label: "First balanced", kind: "balanced", condition: "free" },
      { line: 3, mode: 8, frequencyHz: 706.2, label: "", kind: "unbalanced", condition: null },
    ]);
  });
  it("reads the JSON form with the list settings", () => {
    const json = `{
  "name": "Free model",
  "condition": "free",
  "youngsModulusGPa": 210,
  "densityKgM3": 7850,
  "modes": [
    { "mode": 1, "frequencyHz": 0.0004, "kind": "rigid_body" },
    { "mode": 7, "frequencyHz": 452.9, "label": "First balanced", "kind": "balanced" }
  ]
}`;
    const r = importModeText(json);
    expect(r.errors).toEqual([]);
    expect(r.table.meta).toEqual({ name: "Free model", condition: "free", youngsModulusGPa: 210, densityKgM3: 7850 });
    expect(r.modes.map((m) => [m.line, m.mode, m.kind])).toEqual([
      [7, 1, "rigid_body"],
      [8, 7, "balanced"],
    ]);
  });
  it("names the JSON line of a bad item and of a syntax error", () => {
    const r = importModeText('[\n  {"mode": 7, "frequencyHz": 452.9},\n  {"mode": 8, "frequencyHz": "fast"}\n]');
    expect(r.errors).toEqual([{ line: 3, message: 'the frequency "fast" is not a number.' }]);
    expect(() => readModeTable('{"modes": [\n {"mode": 7 "frequencyHz": 1}\n]}')).toThrow(/line 2/);
  });
});

describe("another program's export", () => {
  it("maps worded headers with units, and converts kHz", () => {
    const text = "Modal analysis results\nProject: demo fork\n\nMode No.,Frequency [kHz],Description\n1,0.0000012,\n7,0.4529,Tines in opposition\n";
    const r = importModeText(text);
    expect(r.mapping).toMatchObject({ mode: "Mode No.", frequencyHz: "Frequency [kHz]", label: "Description", frequencyUnit: "kHz" });
    expect(r.errors).toEqual([]);
    expect(r.modes[1]).toMatchObject({ mode: 7, label: "Tines in opposition" });
    expect(r.modes[1].frequencyHz).toBeCloseTo(452.9, 9);
    expect(r.modes[0].kind).toBe("rigid_body");
    expect(r.notes.join(" ")).toMatch(/Lines 1–2 above the header skipped/);
  });
  it("converts angular frequency (rad/s) to Hz: f = ω/2π", () => {
    const r = importModeText("Mode;Omega (rad/s)\n7;2845.7\n");
    expect(r.mapping.frequencyUnit).toBe("rad/s");
    expect(r.modes[0].frequencyHz).toBeCloseTo(2845.7 / (2 * Math.PI), 9);
  });
  it("reads semicolons with decimal commas, a BOM and blank lines", () => {
    const r = importModeText("\uFEFFMode;Eigenfrequency (Hz)\r\n\r\n7;452,9\r\n\r\n8;1.163,5\r\n");
    expect(r.table.delimiter).toBe(";");
    expect(r.errors).toEqual([]);
    expect(r.modes.map((m) => [m.line, m.frequencyHz])).toEqual([
      [3, 452.9],
      [5, 1163.5],
    ]);
  });
  it("reads a UTF-16 text export and a Windows-1252 one", () => {
    const text = "mode\tfrequency\n7\t452.9\n";
    const utf16 = new Uint8Array(2 + text.length * 2);
    utf16.set([0xff, 0xfe]);
    for (let i = 0; i < text.length; i++) utf16[2 + 2 * i] = text.charCodeAt(i);
    expect(importModeText(decodeTableBytes(utf16)).modes[0].frequencyHz).toBe(452.9);
    // "Fréquence" in Windows-1252: é is 0xE9, invalid as UTF-8.
    const latin = Uint8Array.from([...Buffer.from("mode;Fr"), 0xe9, ...Buffer.from("quence\n7;452,9\n")]);
    expect(decodeTableBytes(latin)).toContain("Fréquence");
  });
  it("reads columns lined up with spaces, and a headerless two-column file", () => {
    expect(importModeText("  MODE   FREQ(HZ)\n     7     452.90\n     8     706.20\n").modes.map((m) => m.mode)).toEqual([7, 8]);
    const r = importModeText("7,452.9\n8,706.2\n");
    expect(r.mapping).toMatchObject({ mode: "column 1", frequencyHz: "column 2" });
    expect(r.modes.map((m) => m.frequencyHz)).toEqual([452.9, 706.2]);
  });
  it("numbers modes in order when there is no mode column", () => {
    const r = importModeText("frequencyHz\n0.001\n452.9\n");
    expect(r.modes.map((m) => m.mode)).toEqual([1, 2]);
    expect(r.notes.join(" ")).toMatch(/numbered in file order/);
  });
  it("keeps a quoted label holding the separator and a line break (RFC 4180)", () => {
    const r = importModeText('mode,frequencyHz,label\n7,452.9,"tines, in\nopposition"\n8,706.2,next\n');
    expect(r.modes.map((m) => [m.line, m.label])).toEqual([
      [2, "tines, in\nopposition"],
      [4, "next"],
    ]);
  });
});

describe("rigid-body rows (common practice, no published source: a free part's first six modes sit near 0 Hz)", () => {
  it("takes |f| below 1 Hz as rigid-body motion, also the small negative values solvers print", () => {
    const rows = ["mode,frequencyHz,kind", "1,-0.0003,", "2,0.0001,", "3,0.0002,", "4,0.0004,balanced", "5,0.0007,", "6,0.0011,", "7,452.9,balanced"];
    const r = importModeText(rows.join("\n"));
    expect(r.errors).toEqual([]);
    expect(r.modes.slice(0, 6).every((m) => m.kind === "rigid_body" && m.frequencyHz >= 0)).toBe(true);
    expect(r.modes[6].kind).toBe("balanced");
    expect(r.notes.join(" ")).toMatch(/6 rigid-body modes/);
  });
});

describe("garbage and mistakes", () => {
  it("refuses binary and empty files with a sentence", () => {
    expect(() => decodeTableBytes(Uint8Array.from([0x52, 0x49, 0x46, 0x46, 0, 0, 0, 0, 0x57, 0x41]))).toThrow(ModeTableError);
    expect(() => readModeTable("  \n\n")).toThrow(/empty/);
  });
  it("refuses prose", () => {
    expect(() => readModeTable("Dear colleague,\nplease find the modes attached.\nRegards\n")).toThrow(/No table found/);
  });
  it("lists every bad line by number, and imports nothing of a file with one", () => {
    const text = ["mode,frequencyHz,kind", "7,452.9,balanced", "8,abc,", "9,-40,", "x,1200,", "7,1300,", "10,1400,wobbly", "11,1500,,extra"].join("\n");
    const r = importModeText(text);
    expect(r.errors.map((e) => e.line)).toEqual([3, 4, 5, 6, 7, 8]);
    expect(r.errors.map((e) => e.message).join(" | ")).toMatch(/"abc" is not a number.*negative.*"x" is not a whole number.*listed twice \(also on line 2\).*"wobbly" is not one of.*4 cells where the header has 3/);
  });
  it("says which column is missing when the frequency cannot be found", () => {
    const r = importModeText("mode,shape\n7,bending\n");
    expect(r.errors[0].message).toMatch(/Choose the column that holds the frequency/);
  });
  it("does not guess a decimal comma in a comma-separated file", () => {
    expect(parseNumber("452,9", ",")).toBeNull();
    expect(parseNumber("452,9", ";")).toBe(452.9);
    expect(parseNumber("1,234.5", ",")).toBe(1234.5);
    expect(parseNumber("4.529E+02", ",")).toBe(452.9);
    expect(parseNumber("1 163,5", ";")).toBe(1163.5);
  });
  it("flags a frequency that must be in the wrong unit", () => {
    expect(importModeText("mode,frequencyHz\n7,452900000\n").errors[0].message).toMatch(/above 200 kHz/);
  });
});

describe("mapping guesses", () => {
  it("picks the frequency column before a mode column named like it", () => {
    expect(guessMapping(["Mode", "Mode frequency (Hz)", "Mode shape"])).toMatchObject({ mode: "Mode", frequencyHz: "Mode frequency (Hz)", label: "Mode shape" });
  });
});
