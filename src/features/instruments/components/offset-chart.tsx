/**
 * A recorder's clock offset over time: one point per calibration with its expanded uncertainty
 * (k = 2) as a bar, joined in date order, so drift between calibrations shows at a glance.
 */
import type { CalibrationView } from "@shared/schemas/instrument";
import { formatDate } from "@/lib/format";
import { linearTicks } from "@/lib/ticks";
import { useWidth } from "@/lib/use-width";
import { formatPpm } from "../lib/format";

const M = { left: 64, right: 20, top: 14, bottom: 34 };
const INK = "#1E2A32";
const AXIS = "#5B6B73";
const GRID = "#E3EAE8";
const LINE = "#2F6F6A";

export function OffsetChart({ calibrations, height = 200 }: { calibrations: CalibrationView[]; height?: number }) {
  const [ref, width] = useWidth<HTMLDivElement>({ initial: 640, min: 280 });
  const points = calibrations
    .filter((c) => c.offsetPpm !== null && c.expandedOffsetUncertaintyPpm !== null)
    .map((c) => ({ t: new Date(c.calibratedAt).getTime(), y: c.offsetPpm!, u: c.expandedOffsetUncertaintyPpm!, c }))
    .sort((a, b) => a.t - b.t);
  if (points.length === 0) return null;
  const day = 86_400_000;
  let t0 = Math.min(...points.map((p) => p.t));
  let t1 = Math.max(...points.map((p) => p.t));
  if (t1 - t0 < 30 * day) {
    t0 -= 15 * day;
    t1 += 15 * day;
  }
  const pad = (t1 - t0) * 0.06;
  t0 -= pad;
  t1 += pad;
  let lo = Math.min(...points.map((p) => p.y - p.u));
  let hi = Math.max(...points.map((p) => p.y + p.u));
  const span = Math.max(hi - lo, 2);
  lo -= span * 0.15;
  hi += span * 0.15;
  const x = (t: number) => M.left + ((t - t0) / (t1 - t0)) * (width - M.left - M.right);
  const y = (v: number) => M.top + ((hi - v) / (hi - lo)) * (height - M.top - M.bottom);
  const yTicks = linearTicks(lo, hi, 4);
  const yDecimals = yTicks.length > 1 ? Math.max(0, -Math.floor(Math.log10(yTicks[1] - yTicks[0] + 1e-12))) : 1;
  const xTicks = linearTicks(t0, t1, Math.max(2, Math.floor(width / 140)));
  const summary = points.map((p) => `${formatDate(p.c.calibratedAt)}: ${formatPpm(p.y)} ± ${p.u.toFixed(2)} ppm`).join("; ");
  return (
    <figure ref={ref} className="w-full">
      <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-label={`Clock offset over time (k = 2 bars): ${summary}`} data-testid="offset-chart" className="block max-w-full">
        {yTicks.map((v) => (
          <g key={v}>
            <line x1={M.left} x2={width - M.right} y1={y(v)} y2={y(v)} stroke={GRID} />
            <text x={M.left - 8} y={y(v)} dy="0.32em" textAnchor="end" fontSize={12} fill={AXIS}>
              {v.toFixed(yDecimals)}
            </text>
          </g>
        ))}
        {xTicks.map((t) => (
          <text key={t} x={x(t)} y={height - 10} textAnchor="middle" fontSize={12} fill={AXIS}>
            {formatDate(new Date(t))}
          </text>
        ))}
        <text transform={`translate(14 ${(M.top + height - M.bottom) / 2}) rotate(-90)`} textAnchor="middle" fontSize={12} fill={AXIS}>
          Offset (ppm)
        </text>
        <path d={points.map((p, i) => `${i ? "L" : "M"}${x(p.t).toFixed(1)},${y(p.y).toFixed(1)}`).join("")} fill="none" stroke={LINE} strokeWidth={1.25} strokeDasharray="4 3" />
        {points.map((p) => (
          <g key={p.c.id}>
            <title>{`${p.c.number}, ${formatDate(p.c.calibratedAt)}: ${formatPpm(p.y)} ± ${p.u.toFixed(2)} ppm (k = 2)`}</title>
            <line x1={x(p.t)} x2={x(p.t)} y1={y(p.y - p.u)} y2={y(p.y + p.u)} stroke={INK} strokeWidth={1.5} />
            <line x1={x(p.t) - 5} x2={x(p.t) + 5} y1={y(p.y - p.u)} y2={y(p.y - p.u)} stroke={INK} strokeWidth={1.5} />
            <line x1={x(p.t) - 5} x2={x(p.t) + 5} y1={y(p.y + p.u)} y2={y(p.y + p.u)} stroke={INK} strokeWidth={1.5} />
            <circle cx={x(p.t)} cy={y(p.y)} r={4.5} fill={LINE} stroke="#fff" />
          </g>
        ))}
      </svg>
      <figcaption className="mt-1 text-caption text-ink-faint">Each point is one calibration; the bar is its expanded uncertainty (k = 2). A steady drift means the recorder's clock ages: calibrate more often if it nears your tolerance.</figcaption>
    </figure>
  );
}
