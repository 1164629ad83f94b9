/** The log axes of the Modes charts: ticks at 1, 2 and 5 × 10ⁿ, each labelled (uPlot would label only powers of ten). */
import type uPlot from "uplot";
import { frequencyTicks } from "@/lib/ticks";
import { modeColours } from "./colours";

export const hzLabel = (v: number) => (v >= 1000 ? `${+(v / 1000).toFixed(2)}k` : `${+v.toFixed(v < 10 ? 1 : 0)}`);
export const secondsLabel = (v: number) => (v >= 1 ? `${+v.toFixed(1)}` : `${+v.toPrecision(1)}`);

export function logAxis(label: string, format: (v: number) => string, extra: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    label,
    splits: (_u, _i, min, max) => frequencyTicks(min, max, true),
    filter: (_u, splits) => splits,
    values: (_u, vals) => vals.map((v) => (v == null ? "" : format(v))),
    stroke: modeColours.axis,
    grid: { stroke: modeColours.grid },
    ticks: { stroke: modeColours.grid },
    ...extra,
  };
}
