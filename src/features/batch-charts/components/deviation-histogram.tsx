import { histogram } from "@shared/spc";
import { formatCents } from "@/lib/format";
import { useWidth } from "@/lib/use-width";
import { colours } from "../lib/colours";
import { linearScale, niceTicks } from "../lib/scale";

const M = { top: 28, right: 56, bottom: 44, left: 64 };

/** A bin width of 1, 2 or 5 × 10ⁿ cents giving about `target` bins over `span`. */
function niceWidth(span: number, target: number): number {
  const raw = span / target;
  const mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const n = raw / mag;
  return (n >= 5 ? 5 : n >= 2 ? 2 : 1) * mag;
}

/**
 * Histogram of the fundamental's deviation (cents) with the spec limits ±tolerance and the target.
 * Bins are anchored at 0 so the limits fall on or between edges symmetrically.
 */
export function DeviationHistogram({ values, toleranceCents, height = 240 }: { values: number[]; toleranceCents: number | null; height?: number }) {
  const [ref, width] = useWidth<HTMLDivElement>({ initial: 480, min: 280 });
  const tol = toleranceCents && toleranceCents > 0 ? toleranceCents : null;
  const lo = Math.min(...values, tol ? -tol : 0);
  const hi = Math.max(...values, tol ? tol : 0);
  // Sturges' rule for the number of bins, rounded to a nice width.
  const binWidth = niceWidth(Math.max(hi - lo, 1), Math.ceil(Math.log2(values.length)) + 1);
  const h = histogram(values, { binWidth, anchor: 0, range: [lo, hi] });
  const x = linearScale([h.edges[0] - binWidth * 0.5, h.edges[h.edges.length - 1] + binWidth * 0.5], [M.left, width - M.right]);
  const maxCount = Math.max(...h.counts, 1);
  const y = linearScale([0, maxCount], [height - M.bottom, M.top]);
  const countTicks = niceTicks(0, maxCount, Math.min(maxCount, 4)).filter((t) => Number.isInteger(t));

  return (
    <figure ref={ref} className="tl-spc-figure w-full">
      <figcaption className="mb-1">
        <h3 className="text-body font-semibold">Histogram of deviations</h3>
        <p className="text-caption text-ink-soft">
          {tol ? `Spec limits ±${tol.toFixed(1)} cents around the target (from the spec version).` : "The spec version gives no tolerance for the fundamental, so no limits are drawn."} Bins of {binWidth} cents.
        </p>
      </figcaption>
      <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" data-testid="deviation-histogram" className="tl-spc-chart block h-auto max-w-full"
        aria-label={`Histogram of ${values.length} deviations in bins of ${binWidth} cents${tol ? `, spec limits ${formatCents(-tol)} and ${formatCents(tol)}` : ""}: ${h.counts.map((c, i) => `${c} from ${h.edges[i].toFixed(1)} to ${h.edges[i + 1].toFixed(1)}`).join(", ")}`}>
        {countTicks.map((t) => (
          <g key={t}>
            <line x1={M.left} x2={width - M.right} y1={y(t)} y2={y(t)} stroke={colours.grid} />
            <text x={M.left - 6} y={y(t)} dy="0.32em" textAnchor="end" fontSize={12} fill={colours.axis}>
              {t}
            </text>
          </g>
        ))}
        {h.counts.map((c, i) => (
          <rect key={i} x={x(h.edges[i]) + 1} y={y(c)} width={Math.max(1, x(h.edges[i + 1]) - x(h.edges[i]) - 2)} height={y(0) - y(c)} fill={colours.bar} stroke={colours.barStroke}>
            <title>{`${c} unit${c === 1 ? "" : "s"} from ${h.edges[i].toFixed(1)} to ${h.edges[i + 1].toFixed(1)} cents`}</title>
          </rect>
        ))}
        {niceTicks(x.domain[0], x.domain[1], 6).map((t) => (
          <text key={t} x={x(t)} y={height - M.bottom + 16} textAnchor="middle" fontSize={11} fill={colours.axis}>
            {t.toFixed(t % 1 ? 1 : 0)}
          </text>
        ))}
        <text x={(M.left + width - M.right) / 2} y={height - 6} textAnchor="middle" fontSize={12} fill={colours.axis}>
          Deviation from target (cents)
        </text>
        <line x1={x(0)} x2={x(0)} y1={M.top - 6} y2={height - M.bottom} stroke={colours.ink} strokeWidth={1} strokeDasharray="2 3" />
        <text x={x(0)} y={M.top - 10} textAnchor="middle" fontSize={11} fill={colours.ink}>target</text>
        {tol
          ? [-tol, tol].map((v) => (
              <g key={v} data-limit={v < 0 ? "lsl" : "usl"}>
                <line x1={x(v)} x2={x(v)} y1={M.top - 6} y2={height - M.bottom} stroke={colours.spec} strokeWidth={2} />
                {/* LSL's label reads leftwards from its line, USL's rightwards, so neither covers "target". */}
                <text x={x(v) + (v < 0 ? -4 : 4)} y={M.top - 10} textAnchor={v < 0 ? "end" : "start"} fontSize={11} fontWeight={600} fill={colours.spec}>
                  {v < 0 ? "LSL" : "USL"} {formatCents(v)}
                </text>
              </g>
            ))
          : null}
      </svg>
    </figure>
  );
}
