/** How instruments' numbers read on screen: offsets with their sign, uncertainties at k = 2. */
import type { CalibrationView } from "@shared/schemas/instrument";
import { formatUncertainty } from "@/lib/format";

/** "+18.40 ppm", "−42.70 ppm" (a true minus sign). */
export function formatPpm(value: number | null | undefined, decimals = 2): string {
  if (value == null || !Number.isFinite(value)) return "—";
  const s = Math.abs(value).toFixed(decimals);
  return `${value < 0 && Number(s) !== 0 ? "\u2212" : "+"}${s} ppm`;
}

/** A calibration's result in one line: a recorder's offset ± U, or a thermometer's offsets at its points ± U (k = 2). */
export function calibrationResult(c: CalibrationView): string {
  if (c.kind === "recorder") return `${formatPpm(c.offsetPpm)} ± ${formatUncertainty(c.expandedOffsetUncertaintyPpm)} ppm (k = 2)`;
  const points = (c.points ?? []).map((p) => `${p.offsetC >= 0 ? "+" : "\u2212"}${Math.abs(p.offsetC).toFixed(2)} °C at ${p.referenceC} °C`).join(", ");
  return `${points} · U = ${formatUncertainty(c.expandedUncertaintyC)} °C (k = 2)`;
}

export function dueWords(status: string, dueInDays: number | null): string {
  if (dueInDays === null) return "never calibrated";
  if (dueInDays < 0) return `overdue by ${-dueInDays} day${dueInDays === -1 ? "" : "s"}`;
  if (dueInDays === 0) return "due today";
  return `${status === "due_soon" ? "due in" : "valid for"} ${dueInDays} more day${dueInDays === 1 ? "" : "s"}`;
}
