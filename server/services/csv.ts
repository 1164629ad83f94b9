/**
 * CSV cells for files a person opens in a spreadsheet. Quoting per RFC 4180 (a cell holding a comma,
 * a quote or a line break is quoted, quotes doubled). Text that a spreadsheet would run as a formula
 * (a first character of = + - @, tab or carriage return) gets a leading single quote, as the OWASP
 * "CSV Injection" guidance advises. Numbers are written as numbers: a negative deviation stays -3.20.
 */

/** A number already formatted to its decimals; never neutralised. */
export type NumericCell = { readonly numeric: string };
export type CsvCell = string | NumericCell | null | undefined;

/** A number cell with fixed decimals, or an empty cell when there is no value. */
export function num(value: number | null | undefined, decimals: number): NumericCell | null {
  return value === null || value === undefined || !Number.isFinite(value) ? null : { numeric: value.toFixed(decimals) };
}

/** Characters that make a spreadsheet read a text cell as a formula (OWASP, "CSV Injection"). */
const FORMULA_START = /^[=+\-@\t\r]/;

export function csvCell(cell: CsvCell): string {
  if (cell === null || cell === undefined) return "";
  if (typeof cell !== "string") return cell.numeric;
  const text = FORMULA_START.test(cell) ? `'${cell}` : cell;
  return /[",\r\n]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

/** Lines joined with CRLF (RFC 4180 §2), a CRLF after the last. */
export function csvDocument(rows: CsvCell[][]): string {
  return rows.map((row) => row.map(csvCell).join(",")).join("\r\n") + "\r\n";
}
