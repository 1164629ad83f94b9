/** Dates and sizes as a workshop reads them; the browser's locale decides the order of day and month. */
const dateTime = new Intl.DateTimeFormat(undefined, { dateStyle: "medium", timeStyle: "short" });

export function formatDateTime(value: string | Date): string {
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? String(value) : dateTime.format(date);
}

/** Bytes in binary units (KiB = 1024 B, IEC 80000-13). */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KiB`;
  return `${(bytes / (1024 * 1024)).toFixed(1)} MiB`;
}

const dateOnly = new Intl.DateTimeFormat(undefined, { dateStyle: "medium" });

export function formatDate(value: string | Date): string {
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? String(value) : dateOnly.format(date);
}

const dash = "—";

/** A number with fixed decimals, or a dash when there is none (not measured, not found). */
export function formatNumber(value: number | null | undefined, decimals = 2): string {
  return value == null || !Number.isFinite(value) ? dash : value.toFixed(decimals);
}

/** Frequency in Hz: three decimals below 1 kHz, two above (enough to see a cent at 440 Hz: 0.25 Hz). */
export function formatHz(value: number | null | undefined): string {
  if (value == null || !Number.isFinite(value)) return dash;
  return `${value.toFixed(value < 1000 ? 3 : 2)} Hz`;
}

/** Cents carry their sign, with a true minus sign (U+2212), so "+3.1" and "−9.4" read at a glance; zero has none. */
export function formatCents(value: number | null | undefined, decimals = 1): string {
  if (value == null || !Number.isFinite(value)) return dash;
  const rounded = Number(value.toFixed(decimals));
  const sign = rounded > 0 ? "+" : rounded < 0 ? "\u2212" : "";
  return `${sign}${Math.abs(rounded).toFixed(decimals)} ¢`;
}

export function formatSeconds(value: number | null | undefined, decimals = 1): string {
  return value == null || !Number.isFinite(value) ? dash : `${value.toFixed(decimals)} s`;
}

export function formatPercent(part: number, whole: number): string {
  return whole > 0 ? `${Math.round((part / whole) * 100)} %` : "0 %";
}

/**
 * An uncertainty to two significant figures (GUM 7.2.6: state uncertainties to at most two
 * significant digits), so a small U is not rounded away to "0.000".
 */
export function formatUncertainty(value: number | null | undefined, floor?: number): string {
  if (value == null || !Number.isFinite(value)) return dash;
  if (value === 0) return "0";
  // Below the last digit worth reading (e.g. 0.01 cent), say so rather than print noise digits.
  if (floor !== undefined && value < floor) return `< ${floor}`;
  // Two significant digits, written out in full (toPrecision would switch to 8.8e-7 for small values).
  const rounded = Number(Math.abs(value).toPrecision(2));
  const decimals = Math.max(0, 1 - Math.floor(Math.log10(rounded)));
  return rounded.toFixed(decimals);
}
