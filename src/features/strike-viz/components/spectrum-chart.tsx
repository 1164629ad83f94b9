/**
 * The spectrum of the analysed segment: magnitude (dBFS) against frequency on a linear or
 * logarithmic axis, the local noise floor, each reported partial marked and labelled with its
 * role in the spec, and mains hum lines marked as ignored. Marker labels are HTML laid over the
 * canvas so they can be read by people, screen readers and tests alike.
 *
 * The chart never holds more points than it has pixel columns: the server's series is bucketed
 * to the plot width (keeping each bucket's peak), and again for the visible band after a zoom.
 *
 * Labels never overlap: they are placed in up to three rows above the plot, the spec's partials
 * first and then the strongest; a partial whose label finds no room keeps its red line, is named
 * when the pointer is near it, and stays in the Partials table. Axis ticks are thinned to the width.
 */
import { useMemo, useRef, useState } from "react";
import type uPlot from "uplot";
import type { StrikePlot } from "@shared/schemas/analysis";
import { Button } from "@/components/ui/button";
import { decimateIndices } from "@/lib/decimate";
import { frequencyTickLabel, frequencyTicks } from "@/lib/ticks";
import { useWidth } from "@/lib/use-width";
import { UplotChart, type ChartOptions, type KeyItem } from "@/components/charts/uplot-chart";
import { chartColours } from "../lib/colours";
import { formatHz } from "../lib/format";
import type { PartialRow } from "../lib/partial-rows";

type Scale = "linear" | "log";

const ZOOM_CENTS = 200;

/** Width taken by the y axis and padding of the spectrum plot, CSS px (axis size 56 + label). */
const Y_AXIS_PX = 80;

/** Label rows above the plot, and the height of one, CSS px. */
const LABEL_ROWS = 3;
const LABEL_ROW_PX = 18;
/** Least gap between two labels in a row, CSS px. */
const LABEL_GAP_PX = 4;

type Full = { f: number[]; mag: number[]; floor: (number | null)[] };

/** The series for uPlot, bucketed to `columns` pixel columns over [lo, hi]. */
function plotData(full: Full, columns: number, lo: number, hi: number, log: boolean): uPlot.AlignedData {
  const keep = decimateIndices(full.f, full.mag, Math.max(1, Math.floor(columns)), { range: [lo, hi], log, mode: "max" });
  // One neighbour outside the band on each side, so the line runs to the plot's edges.
  const before = full.f.findLastIndex((f) => f < lo);
  const after = full.f.findIndex((f) => f > hi);
  if (before >= 0) keep.unshift(before);
  if (after >= 0) keep.push(after);
  return [keep.map((i) => full.f[i]), keep.map((i) => full.mag[i]), keep.map((i) => full.floor[i])];
}

export function SpectrumChart({
  spectrum,
  bands,
  humHz,
  rows: rowsIn,
  strikeNoteHz = null,
}: {
  spectrum: StrikePlot["spectrum"];
  bands?: StrikePlot["bands"];
  humHz: number[];
  rows: PartialRow[];
  /** The heard pitch of a tube, drawn as a dashed line where no partial need sound. */
  strikeNoteHz?: number | null;
}) {
  const [scale, setScale] = useState<Scale>("log");
  const [focus, setFocus] = useState<string>("all");
  // Partials drawn without a label because there was no room (their names are in the table).
  const [hidden, setHidden] = useState<string[]>([]);
  const [wrapRef, width] = useWidth<HTMLDivElement>();
  const chartRef = useRef<uPlot | null>(null);
  const resetRef = useRef<() => void>(() => undefined);
  // Rebuild the chart only when what it draws changes (labels, frequencies), not when the table's
  // targets arrive with the unit's evaluation.
  const markerKey = rowsIn.map((r) => `${r.index}:${r.label}:${r.partial.frequencyHz}`).join("|");
  // eslint-disable-next-line react-hooks/exhaustive-deps
  const rows = useMemo(() => rowsIn, [markerKey]);

  // A log axis cannot show 0 Hz; drop non-positive frequencies for both views to keep one dataset.
  const full = useMemo<Full>(() => {
    // The overview series plus the full-resolution bands around each partial (when the server sent
    // them): the pixel bucketing keeps the overview as it was, and a zoom shows every bin near a partial.
    const points = spectrum.frequencyHz.map((f, i) => ({ f, mag: spectrum.magnitudeDb[i], floor: spectrum.noiseFloorDb[i] ?? null }));
    const floorNear = (f: number) => {
      let j = 0;
      while (j < points.length - 1 && points[j + 1].f <= f) j++;
      return points[j]?.floor ?? null;
    };
    for (const b of bands ?? []) b.frequencyHz.forEach((f, i) => points.push({ f, mag: b.magnitudeDb[i], floor: floorNear(f) }));
    points.sort((a, b) => a.f - b.f);
    const kept = points.filter((p, i) => p.f > 0 && (i === 0 || p.f !== points[i - 1].f));
    return { f: kept.map((p) => p.f), mag: kept.map((p) => p.mag), floor: kept.map((p) => p.floor) };
  }, [spectrum, bands]);

  const fMax = full.f.length ? full.f[full.f.length - 1] : 1;
  // On the log axis, start at a power of ten (at least 10 Hz) so the ticks fall on 10, 100, 1k, 10k.
  const fLo = scale === "log" ? Math.max(10, Math.pow(10, Math.floor(Math.log10(full.f[0] ?? 10)))) : 0;
  const columns = Math.max(100, width - Y_AXIS_PX);

  const data = useMemo(() => plotData(full, columns, fLo, fMax, scale === "log"), [full, columns, fLo, fMax, scale]);

  const options = useMemo<ChartOptions>(() => {
    const markers = (u: uPlot) => {
      const ctx = u.ctx;
      const { top, height } = u.bbox;
      const dpr = devicePixelRatio || 1;
      const [lo, hi] = [u.scales.x.min ?? fLo, u.scales.x.max ?? fMax];
      ctx.save();
      ctx.lineWidth = 1.5 * dpr;
      ctx.strokeStyle = chartColours.hum;
      ctx.setLineDash([3 * dpr, 4 * dpr]);
      for (const hum of humHz) {
        if (hum < lo || hum > hi) continue;
        const x = u.valToPos(hum, "x", true);
        ctx.beginPath();
        ctx.moveTo(x, top);
        ctx.lineTo(x, top + height);
        ctx.stroke();
      }
      ctx.setLineDash([]);
      ctx.strokeStyle = chartColours.partial;
      for (const row of rows) {
        const f = row.partial.frequencyHz;
        if (f < lo || f > hi) continue;
        const x = u.valToPos(f, "x", true);
        ctx.beginPath();
        ctx.moveTo(x, top);
        ctx.lineTo(x, top + height);
        ctx.stroke();
      }
      if (strikeNoteHz !== null && strikeNoteHz >= lo && strikeNoteHz <= hi) {
        const x = u.valToPos(strikeNoteHz, "x", true);
        ctx.strokeStyle = chartColours.strikeNote;
        ctx.lineWidth = 2 * dpr;
        ctx.setLineDash([6 * dpr, 3 * dpr]);
        ctx.beginPath();
        ctx.moveTo(x, top);
        ctx.lineTo(x, top + height);
        ctx.stroke();
      }
      const { hidden: unlabelled, leaders } = placeLabels(u, rows, humHz, lo, hi, strikeNoteHz);
      // A label moved aside to find room is tied to its line by a thin leader.
      ctx.setLineDash([]);
      ctx.lineWidth = 1 * dpr;
      ctx.strokeStyle = chartColours.partial;
      for (const l of leaders) {
        ctx.beginPath();
        ctx.moveTo((u.bbox.left / dpr + l.fromX) * dpr, top - l.fromAbovePx * dpr);
        ctx.lineTo((u.bbox.left / dpr + l.toX) * dpr, top);
        ctx.stroke();
      }
      ctx.restore();
      setHidden((before) => (before.join("\u0000") === unlabelled.join("\u0000") ? before : unlabelled));
    };
    let rebucketing = false;
    // After a zoom, bucket the server's series again for the visible band (more detail, same point budget).
    const rebucket = (u: uPlot, key: string) => {
      if (key !== "x" || rebucketing) return;
      const lo = u.scales.x.min;
      const hi = u.scales.x.max;
      if (lo == null || hi == null) return;
      rebucketing = true;
      // Resetting the scales makes uPlot recompute which points are in view (its window indices
      // belong to the previous data); the x range then follows the new data, which reaches just
      // past the band on each side.
      u.setData(plotData(full, u.bbox.width / (devicePixelRatio || 1), Math.max(lo, full.f[0] ?? lo), hi, scale === "log"), true);
      rebucketing = false;
    };
    return {
      scales: {
        // uPlot's x axis is a time axis unless told otherwise; frequencies need time: false.
        x: { time: false, distr: scale === "log" ? 3 : 1, log: 10, range: (_u, min, max) => (min === max ? [fLo, fMax] : [Math.max(fLo, min), max]) },
        y: { auto: true },
      },
      axes: [
        {
          label: "Frequency (Hz)",
          // As many ticks as the width can label without the labels running together.
          splits: (u, _i, min, max) => frequencyTicks(min, max, scale === "log", u.bbox.width / (devicePixelRatio || 1)),
          // uPlot's log axis would label only powers of ten; every chosen split gets its label.
          filter: (_u, splits) => splits,
          stroke: chartColours.axis,
          grid: { stroke: chartColours.grid },
          ticks: { stroke: chartColours.grid },
          values: (_u, vals) => vals.map((v) => (v == null ? "" : frequencyTickLabel(v))),
        },
        { label: "Magnitude (dBFS)", stroke: chartColours.axis, grid: { stroke: chartColours.grid }, ticks: { stroke: chartColours.grid }, size: 56 },
      ],
      series: [
        { label: "Frequency", value: (_u, v) => (v == null ? "–" : `${v.toFixed(1)} Hz`) },
        { label: "Spectrum", stroke: chartColours.spectrum, width: 1.25, value: (_u, v) => (v == null ? "–" : `${v.toFixed(1)} dBFS`) },
        { label: "Noise floor", stroke: chartColours.noise, width: 1.25, dash: [6, 4], value: (_u, v) => (v == null ? "–" : `${v.toFixed(1)} dBFS`) },
      ],
      cursor: {
        drag: { x: true, y: false, setScale: true },
        // Double-click shows the whole spectrum again. uPlot's own reset would fit the x scale to
        // the data in hand, which after a zoom is only the visible band's buckets.
        bind: {
          dblclick: () => () => {
            resetRef.current();
            return null;
          },
        },
      },
      // Room above the plot for the label rows.
      padding: [LABEL_ROWS * LABEL_ROW_PX + 6, 12, 0, 0],
      hooks: { draw: [markers], setScale: [rebucket] },
    };
  }, [full, rows, humHz, scale, fLo, fMax, strikeNoteHz]);

  // Zoom to one partial from the keyboard: ±200 cents around it (the band the server sends at full
  // resolution), or back to the whole spectrum.
  const zoomTo = (value: string) => {
    setFocus(value);
    const u = chartRef.current;
    if (!u) return;
    const row = rows.find((r) => String(r.index) === value);
    if (!row) u.setScale("x", { min: fLo, max: fMax });
    else {
      const k = Math.pow(2, ZOOM_CENTS / 1200);
      u.setScale("x", { min: row.partial.frequencyHz / k, max: row.partial.frequencyHz * k });
    }
  };

  resetRef.current = () => zoomTo("all");

  const keyItems: KeyItem[] = [
    { label: "Reported partial", colour: chartColours.partial, width: 1.5 },
    ...(strikeNoteHz !== null ? [{ label: "Strike note (heard pitch)", colour: chartColours.strikeNote, dash: [6, 3], width: 2 }] : []),
    ...(humHz.length ? [{ label: "Mains hum (ignored)", colour: chartColours.hum, dash: [3, 4], width: 1.5 }] : []),
  ];

  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center gap-3">
        <fieldset className="flex items-center gap-1 rounded-control border border-line-strong p-1">
          <legend className="sr-only">Frequency axis</legend>
          {(["linear", "log"] as const).map((s) => (
            <label key={s} className={`cursor-pointer rounded-[0.35rem] px-3 py-1.5 text-caption font-medium focus-within:outline focus-within:outline-3 focus-within:outline-steel-400 ${scale === s ? "bg-steel-600 text-white" : "text-ink-soft hover:bg-sunken"}`}>
              <input
                type="radio"
                name="spectrum-scale"
                value={s}
                checked={scale === s}
                onChange={() => {
                  setScale(s);
                  setFocus("all");
                }}
                className="sr-only"
              />
              {s === "linear" ? "Linear Hz" : "Logarithmic Hz"}
            </label>
          ))}
        </fieldset>
        <label className="flex items-center gap-2 text-caption font-medium text-ink-soft">
          Show
          <select value={focus} onChange={(e) => zoomTo(e.target.value)} className="min-h-9 rounded-control border border-line-strong bg-surface px-2 text-caption text-ink">
            <option value="all">the whole spectrum</option>
            {rows.map((r) => (
              <option key={r.index} value={String(r.index)}>
                {r.label} ± {ZOOM_CENTS} cents
              </option>
            ))}
          </select>
        </label>
        {focus !== "all" ? (
          <Button size="sm" variant="quiet" onClick={() => zoomTo("all")}>
            Whole spectrum
          </Button>
        ) : null}
        <p className="text-caption text-ink-faint">Or drag across the chart to zoom into a band; double-click to see it all again.</p>
      </div>
      <div ref={wrapRef} className="w-full">
        {width > 0 ? (
          <UplotChart
            options={options}
            data={data}
            height={360}
            onCreate={(u) => (chartRef.current = u)}
            label={`Spectrum with ${rows.length} partials marked: ${rows.map((r) => `${r.label} at ${formatHz(r.partial.frequencyHz)}`).join("; ")}`}
            className="tl-chart tl-spectrum w-full"
            extraKey={keyItems}
            idleReadout="Point at the chart to read a frequency and level; drag across it to zoom."
            readoutSuffix={(u, idx) => nearestPartial(rows, u.data[0][idx] as number, scale === "log")}
          />
        ) : null}
      </div>
      {hidden.length ? (
        <p className="text-caption text-ink-faint" data-testid="unlabelled-partials">
          No room for {hidden.length === 1 ? "the label of" : "the labels of"} {hidden.join(", ")} at this width: {hidden.length === 1 ? "its line is" : "their lines are"} marked without a name.
          Point at a line or zoom in to name it, or read it in the Partials table.
        </p>
      ) : null}
      {humHz.length ? (
        <p className="text-caption text-ink-faint">
          Dashed grey lines: mains hum at {humHz.map((h) => formatHz(h, 0)).join(", ")} — recognised and ignored, not a partial of the unit.
        </p>
      ) : null}
    </div>
  );
}

/** "nearest partial: Tierce, 528.00 Hz" when the cursor is within 3 % (log) or 2 % of the axis of one. */
function nearestPartial(rows: PartialRow[], f: number, log: boolean): string | null {
  if (!(f > 0) || rows.length === 0) return null;
  const distance = (r: PartialRow) => (log ? Math.abs(Math.log(r.partial.frequencyHz / f)) : Math.abs(r.partial.frequencyHz - f) / f);
  const best = rows.reduce((a, b) => (distance(b) < distance(a) ? b : a));
  return distance(best) < 0.03 ? `nearest partial: ${best.label}, ${formatHz(best.partial.frequencyHz)}` : null;
}

type Placed = { left: number; right: number };
/** Farthest a label may move aside from its line, CSS px, and the step it moves in. */
const LABEL_SHIFT_MAX_PX = 72;
const LABEL_SHIFT_STEP_PX = 6;

/**
 * Labels in rows above the plot, HTML over the canvas (readable by people, screen readers and
 * tests). The strike note and the spec's partials first, then by level; each goes where it
 * overlaps nothing — above its line if it can, else moved aside by the least amount (tied to its
 * line by a leader). Returns the partials that found no room, and the leaders to draw.
 */
function placeLabels(u: uPlot, rows: PartialRow[], humHz: number[], lo: number, hi: number, strikeNoteHz: number | null): { hidden: string[]; leaders: { fromX: number; fromAbovePx: number; toX: number }[] } {
  let layer = u.over.querySelector<HTMLDivElement>(".tl-marker-layer");
  if (!layer) {
    layer = document.createElement("div");
    layer.className = "tl-marker-layer";
    layer.setAttribute("aria-hidden", "true");
    u.over.appendChild(layer);
  }
  layer.replaceChildren();
  const plotWidth = u.over.clientWidth;
  const taken: Placed[][] = Array.from({ length: LABEL_ROWS }, () => []);
  const hidden: string[] = [];
  const leaders: { fromX: number; fromAbovePx: number; toX: number }[] = [];
  type Item = { x: number; text: string; className: string; dataset: Record<string, string>; rank: number };
  const items: Item[] = [];
  for (const row of rows) {
    const f = row.partial.frequencyHz;
    if (f < lo || f > hi) continue;
    items.push({ x: u.valToPos(f, "x"), text: row.label, className: "tl-marker tl-marker-partial", dataset: { partialIndex: String(row.index), label: row.label }, rank: (row.labelled ? 0 : 1000) - row.partial.amplitudeDb });
  }
  if (strikeNoteHz !== null && strikeNoteHz >= lo && strikeNoteHz <= hi) {
    items.push({ x: u.valToPos(strikeNoteHz, "x"), text: "strike note", className: "tl-marker tl-marker-note", dataset: { strikeNoteHz: String(strikeNoteHz), label: "strike note" }, rank: -1 });
  }
  for (const hum of humHz) {
    if (hum < lo || hum > hi) continue;
    items.push({ x: u.valToPos(hum, "x"), text: "hum (ignored)", className: "tl-marker tl-marker-hum", dataset: { humHz: String(hum) }, rank: 2000 });
  }
  items.sort((a, b) => a.rank - b.rank);
  for (const item of items) {
    const el = document.createElement("span");
    el.className = item.className;
    el.textContent = item.text;
    for (const [k, v] of Object.entries(item.dataset)) el.dataset[k] = v;
    layer.appendChild(el);
    const width = el.offsetWidth || item.text.length * 7 + 10;
    const free = (row: number, left: number) => taken[row].every((p) => left + width + LABEL_GAP_PX <= p.left || left >= p.right + LABEL_GAP_PX);
    const centred = Math.min(Math.max(0, item.x - width / 2), Math.max(0, plotWidth - width));
    let spot: { row: number; left: number } | null = null;
    for (let shift = 0; shift <= LABEL_SHIFT_MAX_PX && !spot; shift += LABEL_SHIFT_STEP_PX) {
      for (const left of shift === 0 ? [centred] : [centred - shift, centred + shift]) {
        if (left < 0 || left + width > plotWidth) continue;
        const row = taken.findIndex((_, r) => free(r, left));
        if (row >= 0) {
          spot = { row, left };
          break;
        }
      }
    }
    if (!spot) {
      el.remove();
      if (item.dataset.label) hidden.push(item.text);
      continue;
    }
    taken[spot.row].push({ left: spot.left, right: spot.left + width });
    el.style.left = `${spot.left}px`;
    // Row 0 sits just above the plot, the others above it.
    const above = (spot.row + 1) * LABEL_ROW_PX + 2;
    el.style.top = `${-above}px`;
    const centre = spot.left + width / 2;
    // A label in an upper row or moved aside gets a leader down to its line (drawn under the labels).
    if (spot.row > 0 || Math.abs(centre - item.x) > 1) leaders.push({ fromX: Math.min(Math.max(item.x, spot.left + 3), spot.left + width - 3), fromAbovePx: above - LABEL_ROW_PX, toX: item.x });
  }
  return { hidden, leaders };
}
