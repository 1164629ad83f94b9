import { t60ExtrapolatedFrom } from "@shared/physics";
import type { StrikeNoteReading } from "@shared/schemas/strike";
import { fixed, signed, splitUncertainty, unreliableReason } from "../lib/format";
import { ratioReference, type PartialRow } from "../lib/partial-rows";

const num = "py-2 pl-3 text-right font-mono text-caption whitespace-nowrap align-top";

/**
 * The partials of one strike, in frequency order. Units sit in the column headers so the cells
 * stay narrow enough for a tablet. Frequencies and τ carry their standard uncertainty (k = 1)
 * from the fit; the deviation is this strike's own, before the evaluation's temperature
 * correction and combination of strikes.
 */
export function PartialsTable({ rows, strikeNote = null, strikeNoteIsFundamental = false }: { rows: PartialRow[]; strikeNote?: StrikeNoteReading | null; strikeNoteIsFundamental?: boolean }) {
  const anyBeat = rows.some((r) => r.partial.beatHz !== null);
  const anyTarget = rows.some((r) => r.deviationCents !== null);
  const reference = ratioReference(rows, strikeNote, strikeNoteIsFundamental);
  return (
    <div className="overflow-x-auto">
      <table className="tl-partials w-full border-collapse text-left text-body tabular-nums">
        <caption className="sr-only">Partials of this strike</caption>
        <thead>
          <tr className="border-b border-line-strong align-bottom text-caption font-semibold text-ink-soft">
            <th scope="col" className="sticky left-0 bg-surface py-2 pr-2">Partial</th>
            <th scope="col" className="py-2 pl-3 text-right">Frequency (Hz)<span className="block font-normal">± u (k = 1)</span></th>
            <th scope="col" className="py-2 pl-3 text-right">{reference === "lowest" ? "Ratio to lowest" : reference === "strike_note" ? "Ratio to strike note" : "Ratio to f₁"}</th>
            <th scope="col" className="py-2 pl-3 text-right">Deviation (cents)</th>
            <th scope="col" className="py-2 pl-3 text-right">Amplitude (dBFS)</th>
            <th scope="col" className="py-2 pl-3 text-right">τ (s)<span className="block font-normal">± u (k = 1)</span></th>
            <th scope="col" className="py-2 pl-3 text-right">T60 (s)</th>
            <th scope="col" className="py-2 pl-3 text-right">Q</th>
            <th scope="col" className="py-2 pl-3 text-right">Fit R²<span className="block font-normal">vs envelope</span></th>
            <th scope="col" className="py-2 pl-3 text-right">Beat (Hz)</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => {
            const p = row.partial;
            const out = row.deviationCents !== null && row.toleranceCents !== null && Math.abs(row.deviationCents) > row.toleranceCents;
            return (
              <tr key={row.index} className="border-b border-line" data-partial-index={row.index}>
                <th scope="row" className="sticky left-0 bg-surface py-2 pr-2 align-top font-medium">
                  <span className="tl-partial-label">{row.label}</span>
                  {row.isFundamental ? <span className="block text-caption font-normal text-ink-faint">fundamental, f₁</span> : null}
                  {row.strikeNoteHarmonic !== null ? <span className="block text-caption font-normal text-steel-700">strike note ×{row.strikeNoteHarmonic}</span> : null}
                  {p.tauUnreliable ? <span className="block text-caption font-normal text-ochre-600">τ unreliable: {unreliableReason(p)}</span> : null}
                </th>
                <td className={num}>
                  <ValueU value={p.frequencyHz} u={p.frequencyUncertaintyHz} />
                </td>
                <td className={num}>
                  {row.ratio === null ? "–" : fixed(row.ratio, 4)}
                  {row.targetRatio !== null ? <span className="block text-ink-faint">target {fixed(row.targetRatio, 4)}</span> : null}
                </td>
                <td className={`${num} ${out ? "font-semibold text-rust-700" : ""}`}>
                  {row.deviationCents === null ? (
                    <span className="text-ink-faint">{row.labelled ? "–" : "no target"}</span>
                  ) : (
                    <>
                      {signed(row.deviationCents, 1)}
                      {row.toleranceCents !== null ? <span className="block font-normal text-ink-faint">of ±{fixed(row.toleranceCents, 1)}</span> : null}
                    </>
                  )}
                </td>
                <td className={num}>{signed(p.amplitudeDb, 1)}</td>
                <td className={num}>
                  <ValueU value={p.tauS} u={p.tauUncertaintyS} />
                </td>
                <td className={num}>
                  {fixed(p.t60S, 2)}
                  {t60ExtrapolatedFrom(p.observedDecayDb) ? <span className="block text-ink-faint">{t60ExtrapolatedFrom(p.observedDecayDb)}</span> : null}
                </td>
                <td className={num}>{Math.round(p.q).toLocaleString("en-GB")}</td>
                <td className={num}>{fixed(p.fitR2, 3)}</td>
                <td className={num}>{p.beatHz === null ? "–" : fixed(p.beatHz, 2)}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="mt-2 text-caption text-ink-faint">
        u: standard uncertainty (k = 1) from the fit. T60 = τ·ln 1000; Q = π·f·τ. “from 28 dB”: the recording saw 28 dB of the decay, and T60 (60 dB) is extrapolated from it. Fit R²: the fitted decay against the partial’s own envelope.
        {anyTarget ? " Deviation: this strike alone, before temperature correction; the unit's verdict combines its strikes." : " No spec targets matched this strike, so only ratios are shown."}
        {reference === "lowest" ? " No partial matched the spec's fundamental, so ratios are to the lowest partial." : ""}
        {strikeNote ? " Strike note ×n: the partial stands near n times the strike note and was used to read it." : ""}
        {anyBeat ? " Beat: the difference of a doublet's two close modes." : ""}
      </p>
    </div>
  );
}

/** A value on one line, its standard uncertainty below it. */
function ValueU({ value, u }: { value: number; u: number }) {
  const s = splitUncertainty(value, u);
  return (
    <>
      {s.value}
      {s.u !== null ? <span className="block text-ink-faint">± {s.u}</span> : null}
    </>
  );
}
