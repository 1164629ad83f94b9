/**
 * The mode table: for each model, every predicted mode with the partial it matched (median over
 * units, with the spread between units), the ratio, the residual after calibration, τ by support
 * and what the hold does; then the measured partials no model predicts. Rigid-body modes are
 * folded into one line. Wide: it scrolls sideways on a phone rather than squeezing the numbers.
 */
import clsx from "clsx";
import { modeKindLabels, type MeasuredModeView, type ModeMap, type ModeMapRow } from "@shared/schemas/modes";
import { Badge } from "@/components/ui/panel";
import { formatCents, formatNumber } from "@/lib/format";
import { holdVerdictText, ratioText } from "../lib/words";

const hz = (v: number | null, spread?: number | null) => (v === null ? "—" : `${v.toFixed(1)}${spread != null ? ` ± ${spread.toFixed(1)}` : ""}`);
const tau = (v: number | null) => formatNumber(v, v !== null && v < 1 ? 3 : 2);

function HoldCell({ row }: { row: Pick<ModeMapRow, "holdEffect"> }) {
  const h = row.holdEffect;
  if (!h) return <span className="text-ink-faint">—</span>;
  const tone = h.verdict === "rings" ? "moss" : h.verdict === "damped" ? "rust" : h.verdict === "support_mode" ? "ochre" : "neutral";
  return (
    <span className="flex min-w-40 flex-col items-start gap-1">
      {h.ratio !== null && h.ratioUncertainty !== null ? <span className="whitespace-nowrap tabular-nums">{ratioText(h.ratio, h.ratioUncertainty)}</span> : null}
      <Badge tone={tone}>{holdVerdictText(h)}</Badge>
      {h.agreement === "disagrees" ? <span className="text-caption font-semibold text-rust-700">model says {h.modelKind ? modeKindLabels[h.modelKind].toLowerCase() : "otherwise"}</span> : null}
    </span>
  );
}

function TauAndHoldCells({ of, stand }: { of: Pick<ModeMapRow, "tauBySupport" | "holdEffect">; stand: boolean }) {
  const cell = "whitespace-nowrap px-2 py-2 text-right tabular-nums";
  return (
    <>
      <td className={cell}>{tau(of.tauBySupport.suspended)}</td>
      <td className={cell}>{tau(of.tauBySupport.hand)}</td>
      {stand ? <td className={cell}>{tau(of.tauBySupport.stand)}</td> : null}
      <td className="px-2 py-2">
        <HoldCell row={of} />
      </td>
    </>
  );
}

function SectionTitle({ title, span }: { title: string; span: number }) {
  return (
    <tr>
      <th colSpan={span} scope="colgroup" className="bg-sunken px-2 py-2 text-left text-caption font-semibold text-ink">
        {title}
      </th>
    </tr>
  );
}

function ModelRows({ rows, title, stand }: { rows: ModeMapRow[]; title: string; stand: boolean }) {
  const span = stand ? 10 : 9;
  const rigid = rows.filter((r) => r.kind === "rigid_body");
  const others = rows.filter((r) => r.kind !== "rigid_body");
  return (
    <tbody>
      <SectionTitle title={title} span={span} />
      {rigid.length ? (
        <tr className="border-t border-line text-ink-faint">
          <td className="px-2 py-2 tabular-nums">
            {rigid.length === 1 ? rigid[0].mode : `${Math.min(...rigid.map((r) => r.mode))}–${Math.max(...rigid.map((r) => r.mode))}`}
          </td>
          <td colSpan={span - 1} className="px-2 py-2">
            {rigid.length} rigid-body mode{rigid.length === 1 ? "" : "s"} near 0 Hz — motion of the whole part, kept but never matched.
          </td>
        </tr>
      ) : null}
      {others.map((r) => (
        <tr key={`${r.listId}-${r.mode}`} className={clsx("border-t border-line align-top", r.measuredHz === null && "text-ink-soft")} data-mode={`${r.condition}-${r.mode}`}>
          <td className="sticky left-0 min-w-44 bg-surface px-2 py-2">
            <span className="font-semibold tabular-nums">{r.mode}</span>
            {r.kind ? <span className="ml-2 text-caption text-ink-soft">{modeKindLabels[r.kind]}</span> : null}
            {r.label ? <span className="block text-caption text-ink-soft">{r.label}</span> : null}
          </td>
          <td className="whitespace-nowrap px-2 py-2 text-right tabular-nums">{r.predictedHz.toFixed(1)}</td>
          <td className="whitespace-nowrap px-2 py-2 text-right tabular-nums">{hz(r.measuredHz, r.measuredSpreadHz)}</td>
          <td className="whitespace-nowrap px-2 py-2 text-right tabular-nums">{r.units || "—"}</td>
          <td className="whitespace-nowrap px-2 py-2 text-right tabular-nums">{formatNumber(r.ratio, 4)}</td>
          <td className={clsx("whitespace-nowrap px-2 py-2 text-right tabular-nums", r.inFit === false && r.kind !== "support" && "font-semibold text-rust-700")}>
            {formatCents(r.residualCents)}
            {r.inFit === false && r.kind !== "support" ? <span className="block text-caption font-normal">not in the fit</span> : null}
          </td>
          <TauAndHoldCells of={r} stand={stand} />
        </tr>
      ))}
    </tbody>
  );
}

function MeasuredRows({ modes, title, stand }: { modes: MeasuredModeView[]; title: string; stand: boolean }) {
  const span = stand ? 10 : 9;
  return (
    <tbody>
      <SectionTitle title={title} span={span} />
      {modes.map((m) => (
        <tr key={m.id} className="border-t border-line align-top" data-measured={m.id}>
          <td className="sticky left-0 min-w-44 bg-surface px-2 py-2 text-caption">{m.supportMode ? "Found only when held" : "—"}</td>
          <td className="px-2 py-2 text-right text-ink-faint">—</td>
          <td className="whitespace-nowrap px-2 py-2 text-right tabular-nums">{hz(m.measuredHz, m.measuredSpreadHz)}</td>
          <td className="whitespace-nowrap px-2 py-2 text-right tabular-nums">{m.units}</td>
          <td className="px-2 py-2 text-right text-ink-faint">—</td>
          <td className="px-2 py-2 text-right text-ink-faint">—</td>
          <TauAndHoldCells of={m} stand={stand} />
        </tr>
      ))}
    </tbody>
  );
}

export function ModeTable({ map }: { map: ModeMap }) {
  const sections = map.models.map((model) => ({ model, rows: map.modes.filter((r) => r.listId === model.id) }));
  // The stand column only when some strike was on a stand.
  const stand = map.scope.strikes.stand > 0;
  return (
    <div className="overflow-x-auto" role="region" aria-label="Mode table" tabIndex={0}>
      <table className="w-full min-w-[48rem] border-collapse text-caption" data-testid="mode-table">
        <caption className="sr-only">Predicted modes, the partials they matched, residuals after calibration, τ by support and the effect of the hold</caption>
        <thead>
          <tr className="text-left text-caption text-ink-soft">
            <th scope="col" className="sticky left-0 bg-surface px-2 py-2">Mode</th>
            <th scope="col" className="px-2 py-2 text-right">Predicted (Hz)</th>
            <th scope="col" className="px-2 py-2 text-right">
              Measured (Hz)
              <span className="block font-normal">median ± spread</span>
            </th>
            <th scope="col" className="px-2 py-2 text-right">Units</th>
            <th scope="col" className="px-2 py-2 text-right">Ratio</th>
            <th scope="col" className="px-2 py-2 text-right">Residual after k</th>
            <th scope="col" className="px-2 py-2 text-right">τ suspended (s)</th>
            <th scope="col" className="px-2 py-2 text-right">τ hand (s)</th>
            {stand ? <th scope="col" className="px-2 py-2 text-right">τ stand (s)</th> : null}
            <th scope="col" className="px-2 py-2">Hold: τ held/free</th>
          </tr>
        </thead>
        {sections.map(({ model, rows }) => (
          <ModelRows
            key={model.id}
            rows={rows}
            stand={stand}
            title={`${model.condition === "free" ? "Free model" : "Held model"}: ${model.name || model.sourceName || "unnamed"} — version ${model.version}${model.youngsModulusGPa ? `, E ${model.youngsModulusGPa} GPa` : ""}${model.densityKgM3 ? `, ρ ${model.densityKgM3} kg/m³` : ""}`}
          />
        ))}
        {map.unmatchedPartials.length ? <MeasuredRows modes={map.unmatchedPartials} stand={stand} title={map.models.length ? "Measured partials no model mode matched" : "Measured modes (no model yet)"} /> : null}
      </table>
    </div>
  );
}
