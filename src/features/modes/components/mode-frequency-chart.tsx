/**
 * Predicted against measured on a log-frequency axis: one lane per model (free above, held below)
 * and the measured partials between them, a line from each model mode to the partial it matched,
 * a faint tick where the mode lands after calibration (× k), and the residual in cents beside the
 * model's marker. uPlot gives the scales, axes and grid; the marks are drawn in its draw hook.
 */
import { useMemo } from "react";
import type uPlot from "uplot";
import type { ModeMap } from "@shared/schemas/modes";
import { UplotChart, type ChartOptions } from "@/components/charts/uplot-chart";
import { formatCents } from "@/lib/format";
import { useWidth } from "@/lib/use-width";
import { hzLabel, logAxis } from "../lib/axes";
import { modeColours, residualColour } from "../lib/colours";
import { drawShape, KeyItem } from "./marker-shapes";

type Lane = { key: "free" | "measured" | "held"; y: number; label: string };

function lanesOf(map: ModeMap, narrow: boolean): Lane[] {
  const hasFree = map.modes.some((r) => r.condition === "free");
  const hasHeld = map.modes.some((r) => r.condition === "held");
  const keys: Lane["key"][] = [...(hasFree ? ["free" as const] : []), "measured", ...(hasHeld ? ["held" as const] : [])];
  const label = narrow ? { free: "Free", measured: "Meas.", held: "Held" } : { free: "Free model", measured: "Measured", held: "Held model" };
  return keys.map((key, i) => ({ key, y: keys.length - i, label: label[key] }));
}


export function ModeFrequencyChart({ map }: { map: ModeMap }) {
  const [ref, width] = useWidth<HTMLElement>({ initial: 720 });
  const narrow = width < 520;
  const lanes = useMemo(() => lanesOf(map, narrow), [map, narrow]);
  const visibleRows = useMemo(() => map.modes.filter((r) => r.kind !== "rigid_body" && r.predictedHz >= 1), [map]);
  const measured = map.measuredModes;

  const [lo, hi] = useMemo(() => {
    const all = [...visibleRows.flatMap((r) => [r.predictedHz, r.calibratedHz ?? r.predictedHz]), ...measured.map((m) => m.measuredHz)].filter((f) => f > 0);
    if (!all.length) return [100, 10000];
    return [Math.min(...all) / 1.25, Math.max(...all) * 1.25];
  }, [visibleRows, measured]);

  const options = useMemo<ChartOptions>(() => {
    const laneY = Object.fromEntries(lanes.map((l) => [l.key, l.y])) as Record<Lane["key"], number>;
    const matchedIds = new Set(map.modes.map((r) => r.measuredModeId).filter((id): id is number => id !== null));
    const draw = (u: uPlot) => {
      const ctx = u.ctx;
      const dpr = devicePixelRatio || 1;
      const X = (f: number) => u.valToPos(f, "x", true);
      const Y = (lane: Lane["key"]) => u.valToPos(laneY[lane], "y", true);
      const r = 5.5 * dpr;
      ctx.save();
      ctx.lineWidth = 1.5 * dpr;
      // Match lines first, so the markers sit on top of them.
      for (const row of visibleRows) {
        if (row.measuredHz === null || row.residualCents === null) continue;
        ctx.strokeStyle = residualColour(row.residualCents);
        ctx.setLineDash(row.inFit === false ? [4 * dpr, 3 * dpr] : []);
        ctx.beginPath();
        ctx.moveTo(X(row.predictedHz), Y(row.condition));
        ctx.lineTo(X(row.measuredHz), Y("measured"));
        ctx.stroke();
      }
      ctx.setLineDash([]);
      // Where each model mode lands after calibration.
      ctx.strokeStyle = modeColours.calibrated;
      for (const row of visibleRows) {
        if (row.calibratedHz === null) continue;
        const x = X(row.calibratedHz);
        const y = Y(row.condition);
        ctx.beginPath();
        ctx.moveTo(x, y - 11 * dpr);
        ctx.lineTo(x, y + 11 * dpr);
        ctx.stroke();
      }
      for (const row of visibleRows) {
        const colour = row.kind === "support" ? modeColours.support : row.condition === "free" ? modeColours.free : modeColours.held;
        drawShape(ctx, row.condition === "free" ? "diamond" : "square", X(row.predictedHz), Y(row.condition), r, colour, modeColours.paper);
      }
      for (const m of measured) {
        const shape = m.supportMode ? "triangle" : matchedIds.has(m.id) ? "circle" : "ring";
        const colour = m.supportMode ? modeColours.support : matchedIds.has(m.id) ? modeColours.measured : modeColours.unmatched;
        drawShape(ctx, shape, X(m.measuredHz), Y("measured"), r, colour, modeColours.paper);
      }
      // Residuals beside the model markers (above the free lane, below the held one), skipped where they would overlap.
      ctx.font = `${600} ${11 * dpr}px "Inter Variable", ui-sans-serif, sans-serif`;
      ctx.textAlign = "center";
      for (const lane of lanes) {
        if (lane.key === "measured") continue;
        let lastRight = -Infinity;
        const rows = visibleRows.filter((row) => row.condition === lane.key && row.residualCents !== null).sort((a, b) => a.predictedHz - b.predictedHz);
        for (const row of rows) {
          const text = formatCents(row.residualCents, 0).replace(" ¢", "¢");
          const x = X(row.predictedHz);
          const w = ctx.measureText(text).width;
          if (x - w / 2 < lastRight + 4 * dpr) continue;
          lastRight = x + w / 2;
          ctx.fillStyle = residualColour(row.residualCents!);
          ctx.fillText(text, x, Y(lane.key) + (lane.key === "free" ? -14 : 22) * dpr);
        }
      }
      ctx.restore();
    };
    return {
      scales: {
        // uPlot's x axis is a time axis unless told otherwise.
        x: { time: false, distr: 3, log: 10, range: () => [lo, hi] },
        y: { range: () => [0.35, lanes.length + 0.65] },
      },
      axes: [
        logAxis(narrow ? "Frequency (Hz, log)" : "Frequency (Hz, logarithmic)", hzLabel),
        {
          splits: () => lanes.map((l) => l.y),
          values: (_u, vals) => vals.map((v) => lanes.find((l) => l.y === v)?.label ?? ""),
          stroke: modeColours.ink,
          size: narrow ? 52 : 88,
          grid: { stroke: modeColours.lane },
          ticks: { show: false },
        },
      ],
      series: [{}, { label: "lanes", stroke: "transparent", points: { show: false } }],
      legend: { show: false },
      cursor: { show: false },
      hooks: { draw: [draw] },
    };
  }, [lanes, visibleRows, measured, map.modes, lo, hi, narrow]);

  const data = useMemo<uPlot.AlignedData>(() => [[lo, hi], [null, null]], [lo, hi]);
  const matched = visibleRows.filter((r) => r.measuredHz !== null).length;
  const label = `Predicted against measured frequencies on a logarithmic axis: ${visibleRows.length} predicted modes, ${measured.length} measured partials, ${matched} matches. The table below lists every value.`;

  return (
    <figure ref={ref} className="flex flex-col gap-2" data-testid="mode-frequency-chart">
      <UplotChart options={options} data={data} height={70 + 62 * lanes.length} label={label} className="tl-chart w-full" />
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-caption text-ink-soft">
        {lanes.some((l) => l.key === "free") ? <KeyItem shape="diamond" colour={modeColours.free}>free model</KeyItem> : null}
        {lanes.some((l) => l.key === "held") ? <KeyItem shape="square" colour={modeColours.held}>held model</KeyItem> : null}
        {visibleRows.some((r) => r.kind === "support") ? <KeyItem shape="square" colour={modeColours.support}>model's support mode</KeyItem> : null}
        <KeyItem shape="circle" colour={modeColours.measured}>measured, matched</KeyItem>
        {measured.some((m) => m.supportMode) ? <KeyItem shape="triangle" colour={modeColours.support}>found only when held</KeyItem> : null}
        {map.unmatchedPartials.some((m) => !m.supportMode) ? <KeyItem shape="ring" colour={modeColours.unmatched}>measured, no model mode</KeyItem> : null}
        {map.stiffnessFactor !== null ? <span>Pale ticks: each model mode × k. Numbers: residual after calibration (solid within 10 ¢, ochre within 25 ¢, rust beyond; dashed: left out of the fit).</span> : null}
      </figcaption>
    </figure>
  );
}

