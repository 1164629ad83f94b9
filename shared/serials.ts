/**
 * Unit serials: expanding a range ("F-0001" … "F-0120"), reading a pasted list, and finding a
 * unit's serial inside an uploaded file's name. Pure functions, no I/O; used by client and server.
 */

/** Most serials one range may expand to; matches the batch limit of 5000 units (shared/schemas/batch.ts). */
export const MAX_RANGE_SIZE = 5000;

/**
 * Longest counter, in digits. 15 digits stay exact in a JavaScript number (2^53 ≈ 9.007×10^15);
 * no workshop numbers units beyond that, so a longer run is almost surely a typing slip.
 */
export const MAX_COUNTER_DIGITS = 15;

export type SerialRangeProblem =
  | "empty"
  | "no_number"
  | "prefix_mismatch"
  | "several_numbers_change"
  | "reversed"
  | "width_mismatch"
  | "too_many_digits"
  | "too_many";

/** A serial range that cannot be expanded; `message` says what is wrong and what to do. */
export class SerialRangeError extends Error {
  override name = "SerialRangeError";
  constructor(
    readonly problem: SerialRangeProblem,
    message: string,
  ) {
    super(message);
  }
}

/** A pasted serial list that repeats a serial; `duplicates` lists each repeated serial once, in order. */
export class SerialListError extends Error {
  override name = "SerialListError";
  constructor(
    readonly duplicates: string[],
    message: string,
  ) {
    super(message);
  }
}

type Token = { digits: boolean; text: string };

/** Splits a serial into alternating runs of digits and non-digits: "F-0001a" → "F-", "0001", "a". */
function tokens(serial: string): Token[] {
  return (serial.match(/\d+|\D+/g) ?? []).map((text) => ({ digits: /^\d/.test(text), text }));
}

/**
 * Every serial from `from` to `to`, inclusive. The counter is the one run of digits that differs
 * between the two (the last run when they are equal); everything around it is kept as written,
 * and a zero-padded counter keeps its width: "F-0001"…"F-0120" gives 120 serials "F-0001"…"F-0120".
 * An unpadded counter grows freely: "B7"…"B12" gives B7, B8, …, B12.
 *
 * @throws SerialRangeError when the two ends differ outside the counter, more than one number
 *   changes, `from` comes after `to`, the widths disagree with a zero-padded `from`, or the range
 *   holds more than {@link MAX_RANGE_SIZE} serials.
 */
export function expandSerialRange(from: string, to: string): string[] {
  const a = from.trim();
  const b = to.trim();
  if (!a || !b) {
    throw new SerialRangeError("empty", `Give both ends of the range: the ${!a ? "first" : "last"} serial is empty.`);
  }
  const ta = tokens(a);
  const tb = tokens(b);
  if (!ta.some((t) => t.digits) || !tb.some((t) => t.digits)) {
    const which = !ta.some((t) => t.digits) ? a : b;
    throw new SerialRangeError("no_number", `"${which}" has no number to count up; a range needs serials like F-0001 and F-0120.`);
  }
  const sameShape = ta.length === tb.length && ta.every((t, i) => t.digits === tb[i].digits && (t.digits || t.text === tb[i].text));
  if (!sameShape) {
    throw new SerialRangeError(
      "prefix_mismatch",
      `"${a}" and "${b}" differ outside their number (${describeDifference(ta, tb)}); both ends must share the same letters and separators, e.g. F-0001 and F-0120.`,
    );
  }
  const changing = ta.map((t, i) => (t.digits && BigInt(t.text) !== BigInt(tb[i].text) ? i : -1)).filter((i) => i >= 0);
  if (changing.length > 1) {
    const parts = changing.map((i) => `${ta[i].text}→${tb[i].text}`).join(", ");
    throw new SerialRangeError(
      "several_numbers_change",
      `More than one number changes between "${a}" and "${b}" (${parts}); a range counts one number only — split it into several ranges.`,
    );
  }
  let counter = changing[0];
  if (counter === undefined) {
    for (let i = ta.length - 1; i >= 0; i--) if (ta[i].digits) { counter = i; break; }
  }
  const fromDigits = ta[counter].text;
  const toDigits = tb[counter].text;
  if (fromDigits.length > MAX_COUNTER_DIGITS || toDigits.length > MAX_COUNTER_DIGITS) {
    throw new SerialRangeError(
      "too_many_digits",
      `The number in the serial has more than ${MAX_COUNTER_DIGITS} digits ("${fromDigits.length > toDigits.length ? fromDigits : toDigits}"); check the serials for a typing slip.`,
    );
  }
  const start = Number(fromDigits);
  const end = Number(toDigits);
  if (start > end) {
    throw new SerialRangeError("reversed", `The range runs backwards: "${a}" comes after "${b}". Put the lower serial first.`);
  }
  const padded = fromDigits.length > 1 && fromDigits.startsWith("0");
  const toPadded = toDigits.length > 1 && toDigits.startsWith("0");
  let width = 0;
  if (padded || toPadded) {
    if (fromDigits.length !== toDigits.length) {
      throw new SerialRangeError(
        "width_mismatch",
        `"${a}" and "${b}" are zero-padded to different widths (${fromDigits.length} and ${toDigits.length} digits); write both with the same number of digits, e.g. F-0001 and F-0120.`,
      );
    }
    width = fromDigits.length;
  } else if (fromDigits.length === toDigits.length && fromDigits.length > 1) {
    // Same width and no leading zero (e.g. 1000…1200): keep the width, which is the same thing.
    width = fromDigits.length;
  }
  const count = end - start + 1;
  if (count > MAX_RANGE_SIZE) {
    throw new SerialRangeError(
      "too_many",
      `The range "${a}"…"${b}" holds ${count} serials; at most ${MAX_RANGE_SIZE} can be added at once. Split it into smaller ranges.`,
    );
  }
  const before = ta.slice(0, counter).map((t) => t.text).join("");
  const after = ta.slice(counter + 1).map((t) => t.text).join("");
  const out: string[] = new Array(count);
  for (let k = 0; k < count; k++) out[k] = before + String(start + k).padStart(width, "0") + after;
  return out;
}

function describeDifference(ta: Token[], tb: Token[]): string {
  const n = Math.max(ta.length, tb.length);
  for (let i = 0; i < n; i++) {
    const x = ta[i];
    const y = tb[i];
    if (!x || !y) return `"${(x ?? y)!.text}" appears in only one of them`;
    if (x.digits !== y.digits || (!x.digits && x.text !== y.text)) return `"${x.text}" against "${y.text}"`;
  }
  return "their shapes differ";
}

/**
 * Reads a pasted list of serials: split on newlines, commas, semicolons and whitespace, trimmed,
 * empties dropped, order kept. Serials that differ only in letter case count as duplicates,
 * because uploads are matched to serials case-insensitively ({@link serialFromFileName}).
 */
export function splitSerialList(text: string): { serials: string[]; duplicates: string[] } {
  const serials: string[] = [];
  const duplicates: string[] = [];
  const seen = new Set<string>();
  const reported = new Set<string>();
  for (const raw of text.split(/[\s,;]+/)) {
    const s = raw.trim();
    if (!s) continue;
    const key = s.toLowerCase();
    if (seen.has(key)) {
      if (!reported.has(key)) {
        duplicates.push(s);
        reported.add(key);
      }
      continue;
    }
    seen.add(key);
    serials.push(s);
  }
  return { serials, duplicates };
}

/**
 * The serials of a pasted list, in order (see {@link splitSerialList}).
 * @throws SerialListError naming every repeated serial, so the user can fix the list.
 */
export function parseSerialList(text: string): string[] {
  const { serials, duplicates } = splitSerialList(text);
  if (duplicates.length > 0) {
    const shown = duplicates.slice(0, 10).join(", ") + (duplicates.length > 10 ? ` and ${duplicates.length - 10} more` : "");
    throw new SerialListError(
      duplicates,
      `${duplicates.length === 1 ? "This serial appears" : "These serials appear"} more than once (letter case ignored): ${shown}. Remove the repeats and try again.`,
    );
  }
  return serials;
}

const isDigit = (c: string | undefined) => c !== undefined && c >= "0" && c <= "9";
const isLetter = (c: string | undefined) => c !== undefined && c.toLowerCase() !== c.toUpperCase();

/**
 * True when the serial's edge character and its neighbour in the file name would read as one run
 * ("F-001" followed by "0" continues the number; "AB" followed by "C" continues the word).
 */
function continues(edge: string, neighbour: string | undefined): boolean {
  return (isDigit(edge) && isDigit(neighbour)) || (isLetter(edge) && isLetter(neighbour));
}

/**
 * The unit serial contained in an uploaded file's name, or null. Case-insensitive; a serial only
 * counts where it is not part of a longer number or word ("F-001" is not found in "F-0010.wav",
 * but is in "F-001_strike2.wav" and "F-001take2.wav"). When several serials match, the longest
 * wins; when two different serials of that same length match, the name is ambiguous and null is
 * returned, so the maker chooses the unit by hand.
 */
export function serialFromFileName(fileName: string, serials: string[]): string | null {
  const name = fileName.replace(/^.*[\\/]/, "").toLowerCase();
  let best: string | null = null;
  let ambiguous = false;
  for (const serial of serials) {
    const needle = serial.trim().toLowerCase();
    if (!needle) continue;
    if (best !== null && needle.length < best.length) continue;
    if (!containsAtBoundary(name, needle)) continue;
    if (best === null || needle.length > best.length) {
      best = serial;
      ambiguous = false;
    } else if (needle !== best.toLowerCase()) {
      ambiguous = true;
    }
  }
  return ambiguous ? null : best;
}

function containsAtBoundary(name: string, needle: string): boolean {
  for (let at = name.indexOf(needle); at >= 0; at = name.indexOf(needle, at + 1)) {
    const before = at > 0 ? name[at - 1] : undefined;
    const after = name[at + needle.length];
    if (!continues(needle[0], before) && !continues(needle[needle.length - 1], after)) return true;
  }
  return false;
}

/**
 * The serial `n` places after `serial` in its counter, keeping the counter's width ("F-0001", 119 →
 * "F-0120"); null when the serial does not end in digits or the counter would go below zero.
 */
export function offsetSerial(serial: string, n: number): string | null {
  const m = /^(.*?)(\d+)$/.exec(serial.trim());
  if (!m || m[2].length > MAX_COUNTER_DIGITS) return null;
  const next = Number(m[2]) + n;
  if (!Number.isSafeInteger(next) || next < 0) return null;
  return `${m[1]}${String(next).padStart(m[2].length, "0")}`;
}
