import { fixed, signed, splitUncertainty } from "../lib/format";
import { ratioReference, type PartialRow } from "../lib/partial-rows";

/**
 * The partials of one strike, in frequency order. Frequencies and τ carry their standard
 * uncertainty (k = 1) from the fit; the deviation is this strike's own, before the evaluation's
 * temperature correction and combination of strikes.
 */
export function PartialsTable({ rows }: { rows: PartialRow[] }) {
  const anyBeat = rows.some((r) => r.partial.beatHz !== null);
  const anyTarget = rows.some((r) => r.deviationCents !== null);
  const reference = ratioReference(rows);
  return (
    <div className="overflow-x-auto">
      <table className="tl-partials w-full min-w-[46rem] border-collapse text-left text-body tabular-nums">
        <caption className="sr-only">Partials of this strike</caption>
        <thead>
          <tr className="border-b border-line-strong text-caption font-semibold text-ink-soft">
            <th scope="col" className="py-2 pr-3">Partial</th>
            <th scope="col" className="py-2 pr-3 text-right">Frequency ± u</th>
            <th scope="col" className="py-2 pr-3 text-right">{reference === "lowest" ? "Ratio to lowest" : "Ratio to f₀"}</th>
            <th scope="col" className="py-2 pr-3 text-right">Deviation</th>
            <th scope="col" className="py-2 pr-3 text-right">Amplitude</th>
            <th scope="col" className="py-2 pr-3 text-right">τ ± u</th>
            <th scope="col" className="py-2 pr-3 text-right">T60</th>
            <th scope="col" className="py-2 pr-3 text-right">Q</th>
            <th scope="col" className="py-2 pr-3 text-right">Fit R²</th>
            <th scope="col" className="py-2 text-right">Beat</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => {
            const p = row.partial;
            const out = row.deviationCents !== null && row.toleranceCents !== null && Math.abs(row.deviationCents) > row.toleranceCents;
            return (
              <tr key={row.index} className="border-b border-line align-top" data-partial-index={row.index}>
                <th scope="row" className="py-2 pr-3 font-medium">
                  <span className="tl-partial-label">{row.label}</span>
                  {row.isFundamental ? <span className="ml-2 text-caption text-ink-faint">f₀</span> : null}
                  {p.tauUnreliable ? <span className="ml-2 text-caption text-ochre-600">τ unreliable</span> : null}
                </th>
                <td className="py-2 pr-3 text-right font-mono text-caption whitespace-nowrap"><ValueU value={p.frequencyHz} u={p.frequencyUncertaintyHz} unit="Hz" /></td>
                <td className="py-2 pr-3 text-right font-mono text-caption whitespace-nowrap">
                  {row.ratio === null ? "–" : fixed(row.ratio, 4)}
                  {row.targetRatio !== null ? <span className="block text-ink-faint">target {fixed(row.targetRatio, 4)}</span> : null}
                </td>
                <td className={`py-2 pr-3 text-right font-mono text-caption whitespace-nowrap ${out ? "font-semibold text-rust-700" : ""}`}>
                  {row.deviationCents === null ? (
                    <span className="text-ink-faint">{row.labelled ? "–" : "no target"}</span>
                  ) : (
                    <>
                      {signed(row.deviationCents, 1)} cents
                      {row.toleranceCents !== null ? <span className="block text-ink-faint">tolerance ±{fixed(row.toleranceCents, 1)}</span> : null}
                    </>
                  )}
                </td>
                <td className="py-2 pr-3 text-right font-mono text-caption whitespace-nowrap">{fixed(p.amplitudeDb, 1)} dBFS</td>
                <td className="py-2 pr-3 text-right font-mono text-caption whitespace-nowrap"><ValueU value={p.tauS} u={p.tauUncertaintyS} unit="s" /></td>
                <td className="py-2 pr-3 text-right font-mono text-caption whitespace-nowrap">{fixed(p.t60S, 2)} s</td>
                <td className="py-2 pr-3 text-right font-mono text-caption whitespace-nowrap">{Math.round(p.q).toLocaleString("en-GB")}</td>
                <td className="py-2 pr-3 text-right font-mono text-caption whitespace-nowrap">{fixed(p.fitR2, 3)}</td>
                <td className="py-2 text-right font-mono text-caption whitespace-nowrap">{p.beatHz === null ? "–" : `${fixed(p.beatHz, 2)} Hz`}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="mt-2 text-caption text-ink-faint">
        u: standard uncertainty (k = 1) from the fit. T60 = τ·ln 1000; Q = π·f·τ.
        {anyTarget ? " Deviation: this strike alone, before temperature correction; the unit's verdict combines its strikes." : " No spec targets matched this strike, so only ratios are shown."}
        {reference === "lowest" ? " No partial matched the spec's fundamental, so ratios are to the lowest partial." : ""}
        {anyBeat ? " Beat: the difference of a doublet's two close modes." : ""}
      </p>
    </div>
  );
}

/** Value and unit on one line, its standard uncertainty below it. */
function ValueU({ value, u, unit }: { value: number; u: number; unit: string }) {
  const s = splitUncertainty(value, u);
  return (
    <>
      {s.value} {unit}
      {s.u !== null ? <span className="block text-ink-faint">± {s.u} {unit}</span> : null}
    </>
  );
}
