/**
 * A small React wrapper around uPlot: builds the chart for the container's width, rebuilds it
 * when the options change, follows the container's width and destroys it on unmount.
 * uPlot is chosen for staying smooth with 10⁵ points (STACK.md); the server already decimates.
 */
import { useEffect, useRef } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";

export type ChartOptions = Omit<uPlot.Options, "width" | "height">;

export function UplotChart({
  options,
  data,
  height,
  label,
  onCreate,
  className,
}: {
  options: ChartOptions;
  data: uPlot.AlignedData;
  height: number;
  /** Accessible name of the chart (the canvas itself says nothing to a screen reader). */
  label: string;
  onCreate?: (chart: uPlot) => void;
  className?: string;
}) {
  const ref = useRef<HTMLDivElement>(null);
  const chartRef = useRef<uPlot | null>(null);

  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const width = Math.max(240, Math.floor(el.clientWidth));
    const chart = new uPlot({ ...options, width, height }, data, el);
    chartRef.current = chart;
    onCreate?.(chart);
    const observer = new ResizeObserver(() => {
      const w = Math.max(240, Math.floor(el.clientWidth));
      if (w !== chart.width) chart.setSize({ width: w, height });
    });
    observer.observe(el);
    return () => {
      observer.disconnect();
      chart.destroy();
      chartRef.current = null;
    };
    // onCreate is a callback for the chart's birth only; options and data rebuild it.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [options, data, height]);

  return <div ref={ref} role="img" aria-label={label} className={className ?? "tl-chart w-full"} />;
}
