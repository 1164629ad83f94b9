import { useState } from "react";
import type { IndividualsChart as Chart, NelsonResult } from "@shared/spc";
import { formatCents } from "@/lib/format";
import { useWidth } from "@/lib/use-width";
import { colours } from "../lib/colours";
import { extent, linearScale, niceTicks } from "../lib/scale";
import type { MeasuredUnit } from "./batch-charts";

export const MARGIN = { top: 16, right: 92, bottom: 44, left: 60 };

/**
 * Individuals chart: each unit's deviation (cents) in measuring order, centre line x̄ and control
 * limits. A point that breaks a Nelson rule is drawn as a rust diamond with the rule numbers
 * beside it; hovering or focusing it names the rules.
 */
export function IndividualsChart({ units, chart, height = 280 }: { units: MeasuredUnit[]; chart: Chart & NelsonResult; height?: number }) {
  const [ref, width] = useWidth<HTMLDivElement>({ initial: 720, min: 280 });
  const [active, setActive] = useState<number | null>(null);
  const values = units.map((u) => u.deviationCents);
  const [lo, hi] = extent([...values, chart.ucl, chart.lcl]);
  const x = linearScale([0, Math.max(1, units.length - 1)], [MARGIN.left, width - MARGIN.right]);
  const y = linearScale([lo, hi], [height - MARGIN.bottom, MARGIN.top]);
  const path = values.map((v, i) => `${i === 0 ? "M" : "L"}${x(i).toFixed(1)},${y(v).toFixed(1)}`).join("");
  const everyNth = Math.max(1, Math.ceil(units.length / Math.max(2, Math.floor((width - MARGIN.left - MARGIN.right) / 56))));
  const lines = [
    { key: "ucl", v: chart.ucl, label: "UCL", dash: "6 4" },
    { key: "centre", v: chart.mean, label: "x̄", dash: undefined },
    { key: "lcl", v: chart.lcl, label: "LCL", dash: "6 4" },
  ];
  const activePoint = active !== null ? chart.points[active] : null;

  return (
    <figure ref={ref} className="tl-spc-figure relative w-full">
      <svg
        width={width}
        height={height}
        viewBox={`0 0 ${width} ${height}`}
        role="group"
        aria-label={`Individuals chart of the fundamental's deviation: centre ${formatCents(chart.mean)}, upper control limit ${formatCents(chart.ucl)}, lower control limit ${formatCents(chart.lcl)}`}
        data-testid="individuals-chart"
        className="tl-spc-chart block h-auto max-w-full"
      >
        {niceTicks(lo, hi, 6).map((t) => (
          <g key={t}>
            <line x1={MARGIN.left} x2={width - MARGIN.right} y1={y(t)} y2={y(t)} stroke={colours.grid} />
            <text x={MARGIN.left - 8} y={y(t)} dy="0.32em" textAnchor="end" fontSize={12} fill={colours.axis}>
              {t.toFixed(Math.abs(t) < 10 && t % 1 !== 0 ? 1 : 0)}
            </text>
          </g>
        ))}
        <text transform={`translate(14 ${(MARGIN.top + height - MARGIN.bottom) / 2}) rotate(-90)`} textAnchor="middle" fontSize={12} fill={colours.axis}>
          Deviation (cents)
        </text>
        {lines.map((l) => (
          <g key={l.key} data-limit={l.key}>
            <line x1={MARGIN.left} x2={width - MARGIN.right} y1={y(l.v)} y2={y(l.v)} stroke={l.key === "centre" ? colours.centre : colours.limit} strokeWidth={l.key === "centre" ? 1.5 : 1.5} strokeDasharray={l.dash} />
            <text x={width - MARGIN.right + 6} y={y(l.v)} dy="0.32em" fontSize={12} fill={colours.ink} className="tl-limit-label">
              {l.label} {formatCents(l.v)}
            </text>
          </g>
        ))}
        <path d={path} fill="none" stroke={colours.line} strokeWidth={1.25} />
        {chart.points.map((p, i) => {
          const cx = x(i);
          const cy = y(p.value);
          const flagged = p.breaks.length > 0;
          const name = `${units[i].serial}: ${formatCents(p.value)}${flagged ? `; breaks ${p.breaks.map((b) => `rule ${b.rule}, ${b.name}`).join("; ")}` : ""}`;
          return (
            <g
              key={units[i].id}
              tabIndex={0}
              role="img"
              aria-label={name}
              data-serial={units[i].serial}
              data-rules={p.breaks.map((b) => b.rule).join(",")}
              onMouseEnter={() => setActive(i)}
              onMouseLeave={() => setActive((a) => (a === i ? null : a))}
              onFocus={() => setActive(i)}
              onBlur={() => setActive((a) => (a === i ? null : a))}
              className="tl-spc-point cursor-default outline-none"
            >
              <title>{name}</title>
              {/* A larger transparent target so the point is easy to hit with a finger. */}
              <circle cx={cx} cy={cy} r={12} fill="transparent" />
              {flagged ? (
                <>
                  <path d={`M${cx},${cy - 7}L${cx + 7},${cy}L${cx},${cy + 7}L${cx - 7},${cy}Z`} fill={colours.signal} stroke="#fff" strokeWidth={1} />
                  <text x={cx} y={cy - 11} textAnchor="middle" fontSize={11} fontWeight={600} fill={colours.signal}>
                    {p.breaks.map((b) => b.rule).join(",")}
                  </text>
                </>
              ) : (
                <circle cx={cx} cy={cy} r={active === i ? 5.5 : 4} fill={colours.point} stroke="#fff" strokeWidth={1} />
              )}
              {active === i ? <circle cx={cx} cy={cy} r={10} fill="none" stroke={colours.ink} strokeWidth={1.5} /> : null}
            </g>
          );
        })}
        {units.map((u, i) =>
          i % everyNth === 0 ? (
            <text key={u.id} x={x(i)} y={height - MARGIN.bottom + 16} textAnchor="middle" fontSize={11} fill={colours.axis}>
              {u.serial}
            </text>
          ) : null,
        )}
        <text x={(MARGIN.left + width - MARGIN.right) / 2} y={height - 6} textAnchor="middle" fontSize={12} fill={colours.axis}>
          Unit, in measuring order
        </text>
      </svg>
      {activePoint ? (
        <div
          role="status"
          className="tl-spc-tip pointer-events-none absolute z-10 max-w-xs rounded-control border border-line-strong bg-surface px-3 py-2 text-caption shadow-panel"
          style={{ left: Math.min(Math.max(0, x(activePoint.index) - 120), width - 260), top: Math.max(0, y(activePoint.value) + 14) }}
        >
          <p className="font-semibold">
            {units[activePoint.index].serial}: {formatCents(activePoint.value)}
          </p>
          {activePoint.breaks.length ? (
            activePoint.breaks.map((b) => (
              <p key={b.rule} className="mt-1 text-rust-700">
                <span className="font-semibold">Rule {b.rule} — {b.name}.</span> {b.description}
              </p>
            ))
          ) : (
            <p className="text-ink-soft">No rule broken.</p>
          )}
        </div>
      ) : null}
    </figure>
  );
}
