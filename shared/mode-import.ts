/**
 * Reading a predicted-mode table: CSV (any of ; , tab | or whitespace as separator, decimal commas,
 * a byte-order mark, blank and comment lines, title lines above the header) or JSON (our own format,
 * or an array of rows), with the columns mapped to mode, frequency, label, kind and condition.
 * The browser runs it for the preview; the server runs the same code on the upload, so what the
 * preview shows is what gets imported. Every problem names its line; one problem and nothing is
 * imported.
 */
import Papa from "papaparse";
import {
  MAX_MODES_PER_LIST,
  MAX_PREDICTED_HZ,
  RIGID_BODY_BELOW_HZ,
  modeKinds,
  modelConditions,
  type ModeKind,
  type ModelCondition,
} from "./schemas/modes.ts";

export const modeFields = ["mode", "frequencyHz", "label", "kind", "condition"] as const;
export type ModeField = (typeof modeFields)[number];
export const modeFieldLabels: Record<ModeField, string> = {
  mode: "Mode number",
  frequencyHz: "Frequency",
  label: "Label",
  kind: "Kind",
  condition: "Condition",
};

export const frequencyUnits = ["Hz", "kHz", "rad/s"] as const;
export type FrequencyUnit = (typeof frequencyUnits)[number];

/** Which source column feeds each field (null: not in the file). */
export type ColumnMapping = Record<ModeField, string | null> & { frequencyUnit: FrequencyUnit };

/** One row of the table; `problem` says why a row cannot be a mode at all (the import lists it). */
export type TableRow = { line: number; cells: Record<string, string>; problem?: string };
export type ModeTable = {
  format: "csv" | "json";
  /** The separator found ("whitespace" for columns lined up with spaces). */
  delimiter: string | null;
  /** Line of the header row (0 when the file has none). */
  headerLine: number;
  columns: string[];
  rows: TableRow[];
  /** What was skipped or assumed, in words, for the preview. */
  notes: string[];
  /** List settings a JSON file of our own format carries (name, condition, material). */
  meta: { name?: string; condition?: string; youngsModulusGPa?: number; densityKgM3?: number };
};

export type ImportedMode = { line: number; mode: number; frequencyHz: number; label: string; kind: ModeKind | null; condition: ModelCondition | null };
export type LineError = { line: number; message: string };
export type ModeImport = { table: ModeTable; mapping: ColumnMapping; modes: ImportedMode[]; errors: LineError[]; notes: string[] };

/** A file that is not a table at all (binary, empty, broken JSON); `line` where known. */
export class ModeTableError extends Error {
  override name = "ModeTableError";
  constructor(
    message: string,
    public readonly line: number | null = null,
  ) {
    super(message);
  }
}

const MAX_ERRORS = 50;

// ---------------------------------------------------------------------------------------------
// Bytes to text

/** Decodes an uploaded file: UTF-8 (with or without BOM), UTF-16 with BOM, else Windows-1252. */
export function decodeTableBytes(bytes: Uint8Array): string {
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) return new TextDecoder("utf-16le").decode(bytes.subarray(2));
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) return new TextDecoder("utf-16be").decode(bytes.subarray(2));
  const head = bytes.subarray(0, 4096);
  if (head.includes(0)) throw new ModeTableError("This file is binary, not a table. Export the mode list from the modal analysis as CSV (or text) or JSON and upload that.");
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return new TextDecoder("windows-1252").decode(bytes);
  }
}

// ---------------------------------------------------------------------------------------------
// Text to table

const stripBom = (text: string) => (text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
const isBlank = (cells: string[]) => cells.every((c) => c.trim() === "");
const isComment = (cells: string[]) => /^\s*(#|!|\/\/|%)/.test(cells[0] ?? "");
const lineOf = (text: string, offset: number) => {
  let line = 1;
  for (let i = 0; i < offset && i < text.length; i++) if (text.charCodeAt(i) === 10) line++;
  return line;
};

type RawRow = { line: number; cells: string[] };

function parseDelimited(text: string, delimiter: string): RawRow[] {
  const rows: RawRow[] = [];
  let start = 0;
  // Line numbers from papaparse's cursor, so a quoted field over two lines keeps the count right.
  const starts: number[] = [0];
  for (let i = 0; i < text.length; i++) if (text.charCodeAt(i) === 10) starts.push(i + 1);
  const lineAt = (offset: number) => {
    let lo = 0;
    let hi = starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (starts[mid] <= offset) lo = mid;
      else hi = mid - 1;
    }
    return lo + 1;
  };
  Papa.parse<string[]>(text, {
    delimiter,
    skipEmptyLines: false,
    step: (result) => {
      rows.push({ line: lineAt(start), cells: result.data.map((c) => c.replace(/\r$/, "")) });
      start = result.meta.cursor;
    },
  });
  return rows.filter((r) => !isBlank(r.cells) && !isComment(r.cells));
}

function parseWhitespace(text: string): RawRow[] {
  return text
    .split("\n")
    .map((l, i) => ({ line: i + 1, cells: l.replace(/\r$/, "").trim().split(/\s+/) }))
    .filter((r) => !isBlank(r.cells) && !isComment(r.cells));
}

/** The separator whose rows agree best on a field count above one. */
function chooseDelimiter(text: string): { delimiter: string; rows: RawRow[] } {
  let best: { delimiter: string; rows: RawRow[]; score: number } | null = null;
  for (const delimiter of [";", "\t", ",", "|"]) {
    const rows = parseDelimited(text, delimiter);
    const counts = new Map<number, number>();
    for (const r of rows) counts.set(r.cells.length, (counts.get(r.cells.length) ?? 0) + 1);
    let score = 0;
    for (const [fields, n] of counts) if (fields > 1 && n > score) score = n;
    if (!best || score > best.score) best = { delimiter, rows, score };
  }
  if (best && best.score > 0) return best;
  const ws = parseWhitespace(text);
  if (ws.some((r) => r.cells.length > 1)) return { delimiter: "whitespace", rows: ws };
  return { delimiter: ",", rows: best?.rows ?? [] };
}

const looksNumeric = (cell: string) => parseNumber(cell, ";") !== null;

/**
 * Reads a CSV or JSON mode table into rows of named cells. Title lines above the header are
 * skipped; a file without a header gets columns "column 1", "column 2", ….
 */
export function readModeTable(input: string): ModeTable {
  const text = stripBom(input).replace(/\r\n?/g, "\n");
  if (!text.trim()) throw new ModeTableError("The file is empty. Export the mode list (mode number and frequency) and upload it again.");
  const first = text.trimStart()[0];
  if (first === "[" || first === "{") return readJsonTable(text);

  const { delimiter, rows } = chooseDelimiter(text);
  const notes: string[] = [];
  if (!rows.length) throw new ModeTableError("No rows found in the file.");
  const numericRow = (cells: string[]) => cells.every((c) => c.trim() === "" || looksNumeric(c));
  const singleColumn = rows.every((r) => r.cells.length === 1);
  // The header: the first row with a word in it that is followed by a row with a number. Title
  // lines above it (one cell in a file of several columns) are skipped; so are they above data
  // without a header.
  let headerIndex = -1;
  let dataStart = -1;
  for (let i = 0; i < Math.min(rows.length, 30); i++) {
    const cells = rows[i].cells;
    if (numericRow(cells)) {
      dataStart = i;
      break;
    }
    const next = rows[i + 1];
    if ((cells.length > 1 || singleColumn) && next && next.cells.some(looksNumeric)) {
      headerIndex = i;
      dataStart = i + 1;
      break;
    }
  }
  if (dataStart < 0) {
    throw new ModeTableError(`No table found in the first lines: the file needs a header row (for example "mode,frequencyHz") followed by one row of numbers per mode.`, rows[0].line);
  }
  const skipped = headerIndex >= 0 ? headerIndex : dataStart;
  if (skipped > 0) notes.push(`Line${skipped > 1 ? "s" : ""} ${rows[0].line}${skipped > 1 ? `–${rows[skipped - 1].line}` : ""} above the ${headerIndex >= 0 ? "header" : "data"} skipped.`);
  const width = Math.max(...rows.slice(dataStart).map((r) => r.cells.length), headerIndex >= 0 ? rows[headerIndex].cells.length : 0);
  const names =
    headerIndex >= 0
      ? uniqueNames(rows[headerIndex].cells.map((c, i) => c.trim() || `column ${i + 1}`))
      : Array.from({ length: width }, (_, i) => `column ${i + 1}`);
  if (headerIndex < 0) notes.push("The file has no header row; columns are numbered.");
  const table: TableRow[] = rows.slice(dataStart).map((r) => {
    const cells: Record<string, string> = {};
    names.forEach((name, i) => (cells[name] = (r.cells[i] ?? "").trim()));
    const extra = r.cells.length > names.length && r.cells.slice(names.length).some((c) => c.trim() !== "");
    return extra ? { line: r.line, cells, problem: `${r.cells.length} cells where the header has ${names.length}; check the separator, or quote a label that contains it.` } : { line: r.line, cells };
  });
  return { format: "csv", delimiter, headerLine: headerIndex >= 0 ? rows[headerIndex].line : 0, columns: names, rows: table, notes, meta: {} };
}

function uniqueNames(names: string[]): string[] {
  const seen = new Map<string, number>();
  return names.map((n) => {
    const k = seen.get(n) ?? 0;
    seen.set(n, k + 1);
    return k ? `${n} (${k + 1})` : n;
  });
}

/** Start lines of the elements of the top-level array at `arrayStart` (a bracket), for messages. */
function elementLines(text: string, arrayStart: number): number[] {
  const lines: number[] = [];
  let depth = 0;
  let line = lineOf(text, arrayStart);
  let inString = false;
  let expectElement = false;
  for (let i = arrayStart; i < text.length; i++) {
    const ch = text[i];
    if (ch === "\n") line++;
    if (inString) {
      if (ch === "\\") i++;
      else if (ch === '"') inString = false;
      continue;
    }
    if (/\s/.test(ch)) continue;
    if (depth === 1 && expectElement && ch !== "]") {
      lines.push(line);
      expectElement = false;
    }
    if (ch === '"') inString = true;
    else if (ch === "[" || ch === "{") {
      depth++;
      if (depth === 1) expectElement = true;
    } else if (ch === "]" || ch === "}") {
      depth--;
      if (depth === 0) break;
    } else if (ch === "," && depth === 1) expectElement = true;
  }
  return lines;
}

function readJsonTable(text: string): ModeTable {
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    const pos = /position (\d+)/.exec(message);
    const lineMatch = /line (\d+)/.exec(message);
    const line = lineMatch ? Number(lineMatch[1]) : pos ? lineOf(text, Number(pos[1])) : null;
    throw new ModeTableError(`The JSON cannot be read${line ? ` (line ${line})` : ""}: ${message.replace(/^JSON\.parse: /, "")}. Check for a missing comma or quote.`, line);
  }
  let items: unknown[];
  let arrayStart: number;
  const meta: ModeTable["meta"] = {};
  if (Array.isArray(data)) {
    items = data;
    arrayStart = text.indexOf("[");
  } else if (data && typeof data === "object" && Array.isArray((data as { modes?: unknown }).modes)) {
    const obj = data as Record<string, unknown>;
    items = obj.modes as unknown[];
    const key = /"modes"\s*:\s*\[/.exec(text);
    arrayStart = key ? key.index + key[0].length - 1 : text.indexOf("[");
    if (typeof obj.name === "string") meta.name = obj.name;
    if (typeof obj.condition === "string") meta.condition = obj.condition;
    if (typeof obj.youngsModulusGPa === "number") meta.youngsModulusGPa = obj.youngsModulusGPa;
    if (typeof obj.densityKgM3 === "number") meta.densityKgM3 = obj.densityKgM3;
  } else {
    throw new ModeTableError('The JSON holds no mode list: give an array of modes, or an object with a "modes" array (see the format in the README).', 1);
  }
  const lines = elementLines(text, arrayStart);
  const columns: string[] = [];
  const rows: TableRow[] = items.map((item, i) => {
    const line = lines[i] ?? 0;
    const cells: Record<string, string> = {};
    if (typeof item === "number" || typeof item === "string") cells["frequencyHz"] = String(item);
    else if (item && typeof item === "object" && !Array.isArray(item)) {
      for (const [k, v] of Object.entries(item)) cells[k] = v === null || v === undefined ? "" : typeof v === "object" ? JSON.stringify(v) : String(v);
    } else return { line, cells, problem: `item ${i + 1} is not a mode (${JSON.stringify(item).slice(0, 40)}); give an object with mode and frequencyHz.` };
    for (const k of Object.keys(cells)) if (!columns.includes(k)) columns.push(k);
    return { line, cells };
  });
  return { format: "json", delimiter: null, headerLine: 0, columns, rows, notes: [], meta };
}

// ---------------------------------------------------------------------------------------------
// Column mapping

const norm = (s: string) => s.toLowerCase().replace(/[^a-z0-9#]+/g, "");

/** A guess of which column is which, from the header names other programs commonly use. */
export function guessMapping(columns: string[]): ColumnMapping {
  const taken = new Set<string>();
  const pick = (test: (n: string, raw: string) => boolean) => {
    const found = columns.find((c) => !taken.has(c) && test(norm(c), c));
    if (found) taken.add(found);
    return found ?? null;
  };
  const frequencyHz =
    pick((n) => n === "frequencyhz") ??
    pick((n) => /freq|eigenfreq/.test(n)) ??
    pick((n) => n === "hz" || n === "f" || n === "fhz" || n === "khz" || /\bhz\b/i.test(n) || n.endsWith("hz")) ??
    pick((n) => /omega|angular|rads/.test(n));
  const mode = pick((n) => ["mode", "modeno", "modenumber", "modenr", "mode#", "no", "nr", "number", "n", "#", "index", "set", "eigenmode", "modeindex", "modeid"].includes(n)) ?? pick((n) => n.startsWith("mode") && !/shape|type|kind|label|name|desc/.test(n));
  const label = pick((n) => ["label", "name", "description", "desc", "shape", "modeshape", "comment", "comments", "note"].includes(n)) ?? pick((n) => /desc|label|shape|name/.test(n));
  const kind = pick((n) => ["kind", "type", "class", "category", "modetype", "modekind"].includes(n));
  const condition = pick((n) => ["condition", "boundary", "boundarycondition", "bc", "support", "constraint", "constraints"].includes(n));
  // Headerless files: one column is the frequency, two are mode and frequency.
  const numbered = columns.length > 0 && columns.every((c) => /^column \d+$/.test(c));
  if (numbered && !frequencyHz) {
    if (columns.length === 1) return { mode: null, frequencyHz: columns[0], label: null, kind: null, condition: null, frequencyUnit: "Hz" };
    return { mode: columns[0], frequencyHz: columns[1], label: columns[2] ?? null, kind: null, condition: null, frequencyUnit: "Hz" };
  }
  return { mode, frequencyHz, label, kind, condition, frequencyUnit: frequencyHz ? unitFromHeader(frequencyHz) : "Hz" };
}

/** The frequency unit a header names: kHz, rad/s (angular frequency), else Hz. */
export function unitFromHeader(header: string): FrequencyUnit {
  const h = header.toLowerCase();
  if (/khz/.test(h)) return "kHz";
  if (/rad\s*\/\s*s|rad\/sec|rad s|omega|angular|\brads\b/.test(h)) return "rad/s";
  return "Hz";
}

// ---------------------------------------------------------------------------------------------
// Cells to modes

/**
 * A number written with a decimal point or, in files separated by semicolons, tabs or spaces, a
 * decimal comma; spaces as thousands separators are dropped. With both "." and ",", the last one is
 * the decimal mark. Null when the cell is not a number.
 */
export function parseNumber(cell: string, delimiter: string | null): number | null {
  let s = cell.trim().replace(/[\u00a0\u2009\u202f ]/g, "");
  if (!s) return null;
  const hasDot = s.includes(".");
  const hasComma = s.includes(",");
  if (hasDot && hasComma) {
    s = s.lastIndexOf(",") > s.lastIndexOf(".") ? s.replace(/\./g, "").replace(",", ".") : s.replace(/,/g, "");
  } else if (hasComma) {
    // In a comma-separated file a comma inside a quoted cell could be either mark: refuse to guess.
    if (delimiter === "," || (s.match(/,/g) ?? []).length > 1) return null;
    s = s.replace(",", ".");
  }
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s)) return null;
  const v = Number(s);
  return Number.isFinite(v) ? v : null;
}

const KIND_WORDS: Record<string, ModeKind> = {
  rigidbody: "rigid_body",
  rigid: "rigid_body",
  rbm: "rigid_body",
  rigidbodymode: "rigid_body",
  balanced: "balanced",
  unbalanced: "unbalanced",
  notbalanced: "unbalanced",
  support: "support",
  supportmode: "support",
};
const CONDITION_WORDS: Record<string, ModelCondition> = {
  free: "free",
  freefree: "free",
  unconstrained: "free",
  held: "held",
  constrained: "held",
  clamped: "held",
  fixed: "held",
};

const FACTOR: Record<FrequencyUnit, number> = { Hz: 1, kHz: 1000, "rad/s": 1 / (2 * Math.PI) };

/**
 * Turns a table into modes with the mapping. Rows whose mapped cells are all empty are skipped;
 * a mode below 1 Hz (or |f| < 1 Hz, as solvers print rigid-body modes with round-off) is rigid-body
 * motion whatever its kind says. Without a mode column, rows are numbered in order from 1.
 */
export function modesFromTable(table: ModeTable, mapping: ColumnMapping): ModeImport {
  const errors: LineError[] = [];
  const notes = [...table.notes];
  const modes: ImportedMode[] = [];
  const fail = (line: number, message: string) => {
    if (errors.length < MAX_ERRORS) errors.push({ line, message });
  };
  if (!mapping.frequencyHz || !table.columns.includes(mapping.frequencyHz)) {
    return { table, mapping, modes, errors: [{ line: table.headerLine || 1, message: `Choose the column that holds the frequency (columns: ${table.columns.join(", ") || "none"}).` }], notes };
  }
  const mapped = modeFields.map((f) => mapping[f]).filter((c): c is string => !!c);
  for (const c of mapped) {
    if (!table.columns.includes(c)) return { table, mapping, modes, errors: [{ line: table.headerLine || 1, message: `The file has no column "${c}".` }], notes };
  }
  const delimiter = table.delimiter;
  let overridden = 0;
  let rigid = 0;
  const seen = new Map<string, number>();
  table.rows.forEach((row, index) => {
    const where = row.line || index + 1;
    const cell = (f: ModeField) => (mapping[f] ? row.cells[mapping[f]!] ?? "" : "");
    if (row.problem) return fail(where, row.problem);
    if (mapped.every((c) => (row.cells[c] ?? "") === "")) return;
    const rawF = cell("frequencyHz");
    const f = parseNumber(rawF, delimiter);
    if (rawF === "") return fail(where, "the frequency is empty.");
    if (f === null) return fail(where, `the frequency "${rawF.slice(0, 30)}" is not a number${delimiter === "," && rawF.includes(",") ? " (a decimal comma in a comma-separated file is ambiguous: write 452.9)" : ""}.`);
    const hz = f * FACTOR[mapping.frequencyUnit];
    if (hz <= -RIGID_BODY_BELOW_HZ) return fail(where, `the frequency ${rawF} is negative; natural frequencies are 0 or more.`);
    if (hz > MAX_PREDICTED_HZ) return fail(where, `the frequency ${rawF} ${mapping.frequencyUnit} is above ${MAX_PREDICTED_HZ / 1000} kHz; check the unit of the column.`);
    let mode: number;
    const rawMode = cell("mode");
    if (mapping.mode) {
      const m = parseNumber(rawMode, delimiter);
      if (m === null || !Number.isInteger(m) || m < 0 || m > 100_000) return fail(where, `the mode number "${rawMode.slice(0, 30)}" is not a whole number.`);
      mode = m;
    } else mode = modes.length + 1;
    const rawKind = cell("kind");
    let kind: ModeKind | null = null;
    if (rawKind) {
      kind = (modeKinds as readonly string[]).includes(rawKind) ? (rawKind as ModeKind) : KIND_WORDS[norm(rawKind)] ?? null;
      if (!kind) return fail(where, `the kind "${rawKind.slice(0, 30)}" is not one of ${modeKinds.join(", ")} (or leave it empty).`);
    }
    if (Math.abs(hz) < RIGID_BODY_BELOW_HZ) {
      if (kind && kind !== "rigid_body") overridden++;
      kind = "rigid_body";
      rigid++;
    }
    const rawCondition = cell("condition");
    let condition: ModelCondition | null = null;
    if (rawCondition) {
      condition = (modelConditions as readonly string[]).includes(rawCondition) ? (rawCondition as ModelCondition) : CONDITION_WORDS[norm(rawCondition)] ?? null;
      if (!condition) return fail(where, `the condition "${rawCondition.slice(0, 30)}" is not free or held (or leave it empty).`);
    }
    const label = cell("label").slice(0, 80);
    const key = `${condition ?? ""}#${mode}`;
    const earlier = seen.get(key);
    if (earlier !== undefined) return fail(where, `mode ${mode} is listed twice (also on line ${earlier}).`);
    seen.set(key, where);
    modes.push({ line: where, mode, frequencyHz: Math.max(0, hz), label, kind, condition });
  });
  if (!modes.length && !errors.length) errors.push({ line: table.headerLine || 1, message: "The table has no modes below its header." });
  if (modes.length > MAX_MODES_PER_LIST) errors.push({ line: modes[MAX_MODES_PER_LIST].line, message: `more than ${MAX_MODES_PER_LIST} modes; import the first ${MAX_MODES_PER_LIST} (the partials a microphone records are among the first few dozen).` });
  if (rigid) notes.push(`${rigid} rigid-body mode${rigid === 1 ? "" : "s"} (below ${RIGID_BODY_BELOW_HZ} Hz) kept but never matched to a partial.`);
  if (overridden) notes.push(`${overridden} mode${overridden === 1 ? "" : "s"} below ${RIGID_BODY_BELOW_HZ} Hz had another kind; taken as rigid-body motion.`);
  if (!mapping.mode && modes.length) notes.push("No mode-number column: modes are numbered in file order from 1.");
  if (mapping.frequencyUnit !== "Hz") notes.push(`Frequencies converted from ${mapping.frequencyUnit} to Hz.`);
  return { table, mapping, modes, errors, notes };
}

/** The whole import of one file's text: read, map (the given mapping or the guess), convert. */
export function importModeText(text: string, mapping?: Partial<ColumnMapping>): ModeImport {
  const table = readModeTable(text);
  const guessed = guessMapping(table.columns);
  const chosen: ColumnMapping = { ...guessed, ...(mapping ?? {}) };
  if (mapping?.frequencyHz && !mapping.frequencyUnit) chosen.frequencyUnit = unitFromHeader(mapping.frequencyHz);
  return modesFromTable(table, chosen);
}

/** "Line 7: the frequency is empty." — for messages and the API's error fields. */
export function describeLineError(e: LineError): string {
  return `Line ${e.line}: ${e.message}`;
}
