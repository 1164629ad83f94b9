/**
 * A small React wrapper around uPlot: builds the chart for the container's width, rebuilds it
 * when the options change, follows the container's width and destroys it on unmount.
 * uPlot is chosen for staying smooth with 10⁵ points; the server already decimates.
 *
 * uPlot's own legend is replaced by a key of our own: each series' colour and dash with its name,
 * always shown, and one line that reads the values under the cursor — or says how to get them
 * while the pointer is elsewhere (uPlot's legend shows "–" for every series until hovered).
 */
import { useEffect, useRef, useState, type ReactNode } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";

export type ChartOptions = Omit<uPlot.Options, "width" | "height">;

/** One entry of the key: a line (with its dash) or a marker the chart draws. */
export type KeyItem = { label: string; colour: string; dash?: number[]; width?: number };

export function ChartKey({ items }: { items: KeyItem[] }) {
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-caption text-ink-soft" aria-label="Key">
      {items.map((item) => (
        <li key={item.label} className="inline-flex min-w-0 items-center gap-1.5">
          <svg width="22" height="8" aria-hidden="true" className="shrink-0">
            <line x1="1" y1="4" x2="21" y2="4" stroke={item.colour} strokeWidth={item.width ?? 2} strokeDasharray={item.dash?.join(" ")} />
          </svg>
          <span className="break-words">{item.label}</span>
        </li>
      ))}
    </ul>
  );
}

type Readout = { x: string; values: { label: string; value: string; colour: string }[] } | null;

export function UplotChart({
  options,
  data,
  height,
  label,
  onCreate,
  className,
  extraKey = [],
  idleReadout = "Point at the chart to read its values.",
  readoutSuffix,
}: {
  options: ChartOptions;
  data: uPlot.AlignedData;
  height: number;
  /** Accessible name of the chart (the canvas itself says nothing to a screen reader). */
  label: string;
  onCreate?: (chart: uPlot) => void;
  className?: string;
  /** Key entries for what the chart draws beside its series (partial markers, hum lines). */
  extraKey?: KeyItem[];
  /** What the readout line says while the pointer is not over the chart. */
  idleReadout?: string;
  /** More words for the readout at a data index (e.g. the nearest partial). */
  readoutSuffix?: (u: uPlot, idx: number) => ReactNode;
}) {
  const ref = useRef<HTMLDivElement>(null);
  const chartRef = useRef<uPlot | null>(null);
  const [readout, setReadout] = useState<Readout>(null);
  const [suffix, setSuffix] = useState<ReactNode>(null);
  const suffixRef = useRef(readoutSuffix);
  suffixRef.current = readoutSuffix;

  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const width = Math.max(240, Math.floor(el.clientWidth));
    let frame = 0;
    const onCursor = (u: uPlot) => {
      cancelAnimationFrame(frame);
      frame = requestAnimationFrame(() => {
        const idx = u.cursor.idx;
        if (idx == null || u.cursor.left == null || u.cursor.left < 0) {
          setReadout(null);
          setSuffix(null);
          return;
        }
        const fmt = (i: number) => {
          const s = u.series[i];
          const v = u.data[i][idx] as number | null;
          return typeof s.value === "function" ? String(s.value(u, v as number, i, idx)) : v == null ? "–" : String(v);
        };
        const values = u.series.slice(1).flatMap((s, k) => (s.show === false ? [] : [{ label: String(s.label ?? ""), value: fmt(k + 1), colour: typeof s.stroke === "string" ? s.stroke : "currentColor" }]));
        setReadout({ x: fmt(0), values });
        setSuffix(suffixRef.current ? suffixRef.current(u, idx) : null);
      });
    };
    const hooks = { ...options.hooks, setCursor: [...(options.hooks?.setCursor ?? []), onCursor] };
    const chart = new uPlot({ ...options, legend: { show: false }, hooks, width, height }, data, el);
    chartRef.current = chart;
    onCreate?.(chart);
    const observer = new ResizeObserver(() => {
      const w = Math.max(240, Math.floor(el.clientWidth));
      if (w !== chart.width) chart.setSize({ width: w, height });
    });
    observer.observe(el);
    return () => {
      cancelAnimationFrame(frame);
      observer.disconnect();
      chart.destroy();
      chartRef.current = null;
    };
    // onCreate is a callback for the chart's birth only; options and data rebuild it.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [options, data, height]);

  const key: KeyItem[] = [
    ...(options.series ?? []).slice(1).flatMap((s) => (s.show === false || typeof s.stroke !== "string" ? [] : [{ label: String(s.label ?? ""), colour: s.stroke, dash: s.dash, width: s.width }])),
    ...extraKey,
  ];

  return (
    <div className="flex min-w-0 flex-col gap-1.5">
      <div ref={ref} role="img" aria-label={label} className={className ?? "tl-chart w-full"} />
      <ChartKey items={key} />
      <p className="tl-readout min-h-10 text-caption tabular-nums text-ink-soft" aria-hidden="true">
        {readout ? (
          <>
            <span className="font-semibold text-ink">{readout.x}</span>
            {readout.values.map((v) => (
              <span key={v.label}>
                {" · "}
                {v.label} <span className="text-ink">{v.value}</span>
              </span>
            ))}
            {suffix ? <> · {suffix}</> : null}
          </>
        ) : (
          <span className="text-ink-faint">{idleReadout}</span>
        )}
      </p>
    </div>
  );
}
