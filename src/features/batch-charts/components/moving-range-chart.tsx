import type { IndividualsChart as Chart } from "@shared/spc";
import { useWidth } from "@/lib/use-width";
import { colours } from "../lib/colours";
import { linearScale, niceTicks } from "../lib/scale";
import type { MeasuredUnit } from "./batch-charts";
import { MARGIN } from "./individuals-chart";

const cents = (v: number) => `${v.toFixed(1)} ¢`;

/** Moving range of two |xᵢ − xᵢ₋₁| (cents), aligned under the individuals chart; limit 3.267·MR̄, lower limit 0. */
export function MovingRangeChart({ units, chart, height = 170 }: { units: MeasuredUnit[]; chart: Chart; height?: number }) {
  const [ref, width] = useWidth<HTMLDivElement>({ initial: 720, min: 280 });
  const ranges = chart.movingRanges;
  const top = Math.max(chart.mrUcl, ...ranges.map((r) => r ?? 0)) * 1.12 || 1;
  const x = linearScale([0, Math.max(1, units.length - 1)], [MARGIN.left, width - MARGIN.right]);
  const y = linearScale([0, top], [height - MARGIN.bottom + 20, MARGIN.top]);
  let path = "";
  ranges.forEach((r, i) => {
    if (r === null) return;
    path += `${path ? "L" : "M"}${x(i).toFixed(1)},${y(r).toFixed(1)}`;
  });

  return (
    <figure ref={ref} className="tl-spc-figure w-full">
      <svg
        width={width}
        height={height}
        viewBox={`0 0 ${width} ${height}`}
        role="group"
        aria-label={`Moving-range chart: average moving range ${cents(chart.mrCentre)}, upper limit ${cents(chart.mrUcl)}`}
        data-testid="moving-range-chart"
        className="tl-spc-chart block h-auto max-w-full"
      >
        {niceTicks(0, top, 4).map((t) => (
          <g key={t}>
            <line x1={MARGIN.left} x2={width - MARGIN.right} y1={y(t)} y2={y(t)} stroke={colours.grid} />
            <text x={MARGIN.left - 8} y={y(t)} dy="0.32em" textAnchor="end" fontSize={12} fill={colours.axis}>
              {t.toFixed(t % 1 ? 1 : 0)}
            </text>
          </g>
        ))}
        <text transform={`translate(14 ${(MARGIN.top + height - MARGIN.bottom + 20) / 2}) rotate(-90)`} textAnchor="middle" fontSize={12} fill={colours.axis}>
          Moving range (cents)
        </text>
        <g data-limit="mr-ucl">
          <line x1={MARGIN.left} x2={width - MARGIN.right} y1={y(chart.mrUcl)} y2={y(chart.mrUcl)} stroke={colours.limit} strokeWidth={1.5} strokeDasharray="6 4" />
          <text x={width - MARGIN.right + 6} y={y(chart.mrUcl)} dy="0.32em" fontSize={12} fill={colours.ink} className="tl-limit-label">
            UCL {cents(chart.mrUcl)}
          </text>
        </g>
        <g data-limit="mr-centre">
          <line x1={MARGIN.left} x2={width - MARGIN.right} y1={y(chart.mrCentre)} y2={y(chart.mrCentre)} stroke={colours.centre} strokeWidth={1.5} />
          <text x={width - MARGIN.right + 6} y={y(chart.mrCentre)} dy="0.32em" fontSize={12} fill={colours.ink} className="tl-limit-label">
            MR̄ {cents(chart.mrCentre)}
          </text>
        </g>
        <path d={path} fill="none" stroke={colours.line} strokeWidth={1.25} />
        {ranges.map((r, i) => {
          if (r === null) return null;
          const above = chart.mrAboveLimit[i];
          const label = `${units[i - 1].serial} → ${units[i].serial}: moving range ${cents(r)}${above ? ", above the upper limit" : ""}`;
          return (
            <g key={units[i].id} tabIndex={0} role="img" aria-label={label} className="outline-none">
              <title>{label}</title>
              <circle cx={x(i)} cy={y(r)} r={12} fill="transparent" />
              {above ? (
                <path d={`M${x(i)},${y(r) - 7}L${x(i) + 7},${y(r)}L${x(i)},${y(r) + 7}L${x(i) - 7},${y(r)}Z`} fill={colours.signal} stroke="#fff" />
              ) : (
                <circle cx={x(i)} cy={y(r)} r={3.5} fill={colours.point} stroke="#fff" />
              )}
            </g>
          );
        })}
      </svg>
    </figure>
  );
}
