/**
 * Cleaning of text that people type, applied once on the way in (the API's JSON bodies, the
 * sign-in library's bodies, upload fields and file names) so nothing stored carries control
 * characters: NUL breaks C-string readers and some databases' text functions, and the other C0/C1
 * controls (bell, escape, backspace…) garble terminals, logs, CSV files and PDFs. Tab and line
 * feed stay (notes and addresses are multi-line); a carriage return becomes a line feed.
 */

// C0 controls except tab (U+0009) and line feed (U+000A); DEL; the C1 block (U+0080–U+009F).
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/g;

/** `text` without control characters (tab and line feed kept, CR LF and CR turned into LF). */
export function stripControlCharacters(text: string): string {
  return text.replace(/\r\n?/g, "\n").replace(CONTROL, "");
}

/** Every string inside `value` (objects and arrays, any depth) cleaned with stripControlCharacters. */
export function cleanStrings<T>(value: T): T {
  if (typeof value === "string") return stripControlCharacters(value) as T;
  if (Array.isArray(value)) return value.map((v) => cleanStrings(v)) as T;
  if (value && typeof value === "object" && Object.getPrototypeOf(value) === Object.prototype) {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) out[k] = cleanStrings(v);
    return out as T;
  }
  return value;
}
