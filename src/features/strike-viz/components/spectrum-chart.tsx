/**
 * The spectrum of the analysed segment: magnitude (dBFS) against frequency on a linear or
 * logarithmic axis, the local noise floor, each reported partial marked and labelled with its
 * role in the spec, and mains hum lines marked as ignored. Marker labels are HTML laid over the
 * canvas so they can be read by people, screen readers and tests alike.
 */
import { useMemo, useState } from "react";
import type uPlot from "uplot";
import type { StrikePlot } from "@shared/schemas/analysis";
import { chartColours } from "../lib/colours";
import type { PartialRow } from "../lib/partial-rows";
import { UplotChart, type ChartOptions } from "./uplot-chart";
import { formatHz } from "../lib/format";

type Scale = "linear" | "log";

export function SpectrumChart({ spectrum, humHz, rows: rowsIn }: { spectrum: StrikePlot["spectrum"]; humHz: number[]; rows: PartialRow[] }) {
  const [scale, setScale] = useState<Scale>("log");
  // Rebuild the chart only when what it draws changes (labels, frequencies), not when the table's
  // targets arrive with the unit's evaluation.
  const markerKey = rowsIn.map((r) => `${r.index}:${r.label}:${r.partial.frequencyHz}`).join("|");
  // eslint-disable-next-line react-hooks/exhaustive-deps
  const rows = useMemo(() => rowsIn, [markerKey]);

  const data = useMemo<uPlot.AlignedData>(() => {
    // A log axis cannot show 0 Hz; drop non-positive frequencies for both views to keep one dataset.
    const keep: number[] = [];
    spectrum.frequencyHz.forEach((f, i) => {
      if (f > 0) keep.push(i);
    });
    return [keep.map((i) => spectrum.frequencyHz[i]), keep.map((i) => spectrum.magnitudeDb[i]), keep.map((i) => spectrum.noiseFloorDb[i] ?? null)];
  }, [spectrum]);

  const options = useMemo<ChartOptions>(() => {
    const xs = data[0] as number[];
    const fMin = xs.length ? xs[0] : 1;
    const fMax = xs.length ? xs[xs.length - 1] : 1;
    const markers = (u: uPlot) => {
      const ctx = u.ctx;
      const { top, height } = u.bbox;
      const dpr = devicePixelRatio || 1;
      ctx.save();
      ctx.lineWidth = 1.5 * dpr;
      for (const hum of humHz) {
        if (hum < fMin || hum > fMax) continue;
        const x = u.valToPos(hum, "x", true);
        ctx.strokeStyle = chartColours.hum;
        ctx.setLineDash([3 * dpr, 4 * dpr]);
        ctx.beginPath();
        ctx.moveTo(x, top);
        ctx.lineTo(x, top + height);
        ctx.stroke();
      }
      ctx.setLineDash([]);
      for (const row of rows) {
        const x = u.valToPos(row.partial.frequencyHz, "x", true);
        ctx.strokeStyle = chartColours.partial;
        ctx.beginPath();
        ctx.moveTo(x, top + 22 * dpr);
        ctx.lineTo(x, top + height);
        ctx.stroke();
      }
      ctx.restore();
      placeLabels(u, rows, humHz, fMin, fMax);
    };
    return {
      scales: {
        // STACK.md trap 10: uPlot's x axis is a time axis unless told otherwise.
        // On the log axis, start at a power of ten so the ticks fall on 10, 100, 1k, 10k.
        x: { time: false, distr: scale === "log" ? 3 : 1, log: 10, range: [scale === "log" ? Math.max(10, Math.pow(10, Math.floor(Math.log10(fMin)))) : 0, fMax] },
        y: { auto: true },
      },
      axes: [
        { label: "Frequency (Hz)", stroke: chartColours.axis, grid: { stroke: chartColours.grid }, ticks: { stroke: chartColours.grid }, values: (_u, vals) => vals.map((v) => (v == null ? "" : v >= 1000 ? `${+(v / 1000).toFixed(2)}k` : `${+v.toFixed(0)}`)) },
        { label: "Magnitude (dBFS)", stroke: chartColours.axis, grid: { stroke: chartColours.grid }, ticks: { stroke: chartColours.grid }, size: 56 },
      ],
      series: [
        { label: "Frequency", value: (_u, v) => (v == null ? "–" : `${v.toFixed(1)} Hz`) },
        { label: "Spectrum", stroke: chartColours.spectrum, width: 1.25, value: (_u, v) => (v == null ? "–" : `${v.toFixed(1)} dBFS`) },
        { label: "Noise floor", stroke: chartColours.noise, width: 1.25, dash: [6, 4], value: (_u, v) => (v == null ? "–" : `${v.toFixed(1)} dBFS`) },
      ],
      cursor: { drag: { x: true, y: false, setScale: true } },
      legend: { live: true },
      hooks: { draw: [markers] },
    };
  }, [data, rows, humHz, scale]);

  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center gap-3">
        <fieldset className="flex items-center gap-1 rounded-control border border-line-strong p-1">
          <legend className="sr-only">Frequency axis</legend>
          {(["linear", "log"] as const).map((s) => (
            <label key={s} className={`cursor-pointer rounded-[0.35rem] px-3 py-1.5 text-caption font-medium ${scale === s ? "bg-steel-600 text-white" : "text-ink-soft hover:bg-sunken"}`}>
              <input type="radio" name="spectrum-scale" value={s} checked={scale === s} onChange={() => setScale(s)} className="sr-only" />
              {s === "linear" ? "Linear Hz" : "Logarithmic Hz"}
            </label>
          ))}
        </fieldset>
        <p className="text-caption text-ink-faint">Drag across the chart to zoom into a band; double-click to see it all again.</p>
      </div>
      <UplotChart options={options} data={data} height={320} label={`Spectrum with ${rows.length} partials marked: ${rows.map((r) => `${r.label} at ${formatHz(r.partial.frequencyHz)}`).join("; ")}`} className="tl-chart tl-spectrum w-full" />
      {humHz.length ? (
        <p className="text-caption text-ink-faint">
          Dashed grey lines: mains hum at {humHz.map((h) => formatHz(h, 0)).join(", ")} — recognised and ignored, not a partial of the unit.
        </p>
      ) : null}
    </div>
  );
}

/** Labels above the markers, in HTML over the plot, staggered in rows so close partials stay legible. */
function placeLabels(u: uPlot, rows: PartialRow[], humHz: number[], fMin: number, fMax: number) {
  let layer = u.over.querySelector<HTMLDivElement>(".tl-marker-layer");
  if (!layer) {
    layer = document.createElement("div");
    layer.className = "tl-marker-layer";
    layer.setAttribute("aria-hidden", "true");
    u.over.appendChild(layer);
  }
  layer.replaceChildren();
  const lastRight: number[] = [];
  const place = (x: number, text: string, className: string, dataset: Record<string, string>) => {
    const el = document.createElement("span");
    el.className = className;
    el.textContent = text;
    for (const [k, v] of Object.entries(dataset)) el.dataset[k] = v;
    layer!.appendChild(el);
    const width = el.offsetWidth || text.length * 7;
    let left = Math.min(Math.max(0, x - width / 2), u.over.clientWidth - width);
    let row = 0;
    while (row < lastRight.length && lastRight[row] > left - 4) row++;
    if (row > 2) row = 2;
    lastRight[row] = left + width;
    el.style.left = `${left}px`;
    el.style.top = `${2 + row * 18}px`;
  };
  for (const row of rows) {
    const f = row.partial.frequencyHz;
    if (f < fMin || f > fMax) continue;
    const x = u.valToPos(f, "x");
    if (x < 0 || x > u.over.clientWidth) continue;
    place(x, row.label, "tl-marker tl-marker-partial", { partialIndex: String(row.index), label: row.label });
  }
  for (const hum of humHz) {
    if (hum < fMin || hum > fMax) continue;
    const x = u.valToPos(hum, "x");
    if (x < 0 || x > u.over.clientWidth) continue;
    place(x, "hum (ignored)", "tl-marker tl-marker-hum", { humHz: String(hum) });
  }
}
