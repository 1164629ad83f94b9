/**
 * Compare a unit's strikes: their spectra overlaid, the fundamental's decay overlaid
 * (time from each strike's onset, so they start together), and a table of each partial across the
 * strikes — so a maker sees what the support (in hand, suspended, on a stand) does to each partial.
 */
import { useMemo, useState } from "react";
import uPlot from "uplot";
import type { StrikeDetail, UnitDetail } from "@shared/schemas/strike";
import { cents, t60ExtrapolatedFrom } from "@shared/physics";
import { supportLabels } from "@shared/schemas/spec";
import { Alert } from "@/components/ui/alert";
import { EmptyState } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { useMe } from "@/lib/auth";
import { formatDateTime } from "@/lib/format";
import { decimateIndices } from "@/lib/decimate";
import { frequencyTicks } from "@/lib/ticks";
import { useWidth } from "@/lib/use-width";
import { UplotChart, type ChartOptions } from "@/components/charts/uplot-chart";
import { useStrikes } from "../api/get-strike";

/** Distinct hues from the theme that stay apart in print; the dash pattern repeats the distinction. */
const palette = ["#1f5d65", "#9c3526", "#8a5a0f", "#2f6b3c", "#5b4a8a", "#4a5558"] as const;
const dashes: (number[] | undefined)[] = [undefined, [8, 4], [2, 3], [10, 3, 2, 3], [4, 4], [1, 2]];
const axis = { stroke: "#4a5558", grid: { stroke: "rgba(29,38,40,0.09)" }, ticks: { stroke: "rgba(29,38,40,0.09)" } };

export type ComparedStrike = {
  detail: StrikeDetail;
  name: string;
  colour: string;
  dash: number[] | undefined;
  /** Index of the fundamental in result.strikes[0].partials, or -1. */
  f0Index: number;
};

/**
 * "F-0004-b.wav · 3 Dec 2026, 10:04 · Suspended" — which recording, when, and how the unit was
 * held: two strikes of a unit often share the support, never the file and the time.
 */
export function strikeName(s: StrikeDetail): string {
  return `${s.originalName} · ${formatDateTime(s.uploadedAt)} · ${s.support ? supportLabels[s.support] : "support not given"}`;
}

export function CompareStrikes({ unit }: { unit: UnitDetail }) {
  const me = useMe();
  const workshopId = me.data?.activeWorkshop?.id ?? "";
  const done = unit.strikes.filter((s) => s.state === "done");
  // Oldest first, so colours keep their strike as new strikes arrive.
  const ids = useMemo(() => [...done].sort((a, b) => a.uploadedAt.localeCompare(b.uploadedAt)).map((s) => s.id), [done.map((s) => s.id).join()]);
  const queries = useStrikes(workshopId, ids);
  const fundamentalLabel = unit.evaluation?.requirements.find((r) => r.isFundamental)?.label ?? null;

  if (done.length < 2) {
    return (
      <EmptyState title="Nothing to compare yet">
        {done.length === 0 ? "This unit has no analysed strike." : "This unit has one analysed strike."} Record the unit again in another support — held in hand, suspended,
        on a stand — and the spectra and decays are overlaid here.
      </EmptyState>
    );
  }
  if (queries.some((q) => q.isPending)) return <Spinner label="Loading the strikes to compare…" />;
  const failed = queries.find((q) => q.isError);
  if (failed) {
    return (
      <Alert tone="error" title="The strikes could not be loaded for comparison">
        {failed.error instanceof Error ? failed.error.message : "Check the connection and reload the page."}
      </Alert>
    );
  }
  return <CompareReady queries={queries.map((q) => q.data as StrikeDetail)} fundamentalLabel={fundamentalLabel} />;
}

/** Builds the compared strikes once per change of the fetched data (the unit page polls). */
function CompareReady({ queries, fundamentalLabel }: { queries: StrikeDetail[]; fundamentalLabel: string | null }) {
  const key = queries.map((d) => `${d.id}:${d.finishedAt}`).join("|") + `|${fundamentalLabel}`;
  const strikes = useMemo<ComparedStrike[]>(
    () =>
      queries
        .filter((d) => d.result?.strikes[0])
        .map((detail, i) => ({
          detail,
          name: strikeName(detail),
          colour: palette[i % palette.length],
          dash: dashes[Math.floor(i / palette.length) % dashes.length] ?? dashes[i % dashes.length],
          f0Index: fundamentalIndex(detail, fundamentalLabel),
        })),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [key],
  );
  return <CompareView strikes={strikes} fundamentalLabel={fundamentalLabel} />;
}

function fundamentalIndex(detail: StrikeDetail, fundamentalLabel: string | null): number {
  if (fundamentalLabel) {
    for (const [k, v] of Object.entries(detail.labels)) if (v === fundamentalLabel) return Number(k);
  }
  return detail.result?.strikes[0]?.partials.length ? 0 : -1;
}

function CompareView({ strikes, fundamentalLabel }: { strikes: ComparedStrike[]; fundamentalLabel: string | null }) {
  const [showNoise, setShowNoise] = useState(false);
  const [wrapRef, width] = useWidth<HTMLDivElement>();
  // The joined x axis of k strikes holds at most k × their own points: give each strike its share
  // of the plot's pixel columns, so the chart never carries more points than it can show.
  const columns = Math.max(100, width - 80);
  const withPlot = useMemo(() => strikes.filter((s) => s.detail.result?.strikes[0]?.plot), [strikes]);

  const spectrum = useMemo(() => {
    const share = Math.max(1, Math.floor(columns / Math.max(1, withPlot.length)));
    const tables = withPlot.map((s) => {
      const sp = s.detail.result!.strikes[0].plot!.spectrum;
      const positive = sp.frequencyHz.map((f, i) => [f, i] as const).filter(([f]) => f >= 10);
      const fs = positive.map(([f]) => f);
      const ms = positive.map(([, i]) => sp.magnitudeDb[i]);
      const keep = decimateIndices(fs, ms, share, { log: true, mode: "max" });
      return [keep.map((i) => fs[i]), keep.map((i) => ms[i])] as uPlot.AlignedData;
    });
    // uPlot wants one x array: join the strikes' frequency grids, leaving gaps where a grid lacks a point.
    const data = uPlot.join(tables);
    const xs = data[0] as number[];
    const options: ChartOptions = {
      // Log axis from 10 Hz (mains hum at 50/60 Hz stays in view; below 10 Hz is room rumble).
      scales: { x: { time: false, distr: 3, log: 10, range: [10, xs[xs.length - 1] ?? 20_000] } },
      axes: [
        { ...axis, label: "Frequency (Hz)", splits: (_u, _i, min, max) => frequencyTicks(min, max, true), filter: (_u, splits) => splits, values: (_u, vals) => vals.map((v) => (v == null ? "" : v >= 1000 ? `${+(v / 1000).toFixed(2)}k` : `${+v.toFixed(0)}`)) },
        { ...axis, label: "Magnitude (dBFS)", size: 56 },
      ],
      series: [
        { label: "Frequency", value: (_u, v) => (v == null ? "–" : `${v.toFixed(1)} Hz`) },
        ...withPlot.map((s) => ({ label: s.name, stroke: s.colour, dash: s.dash, width: 1.25, spanGaps: true, value: (_u: uPlot, v: number | null) => (v == null ? "–" : `${v.toFixed(1)} dBFS`) })),
      ],
      cursor: { drag: { x: true, y: false, setScale: true } },
    };
    return { data, options };
  }, [withPlot, columns]);

  const decay = useMemo(() => {
    const tables: uPlot.AlignedData[] = [];
    const shown: ComparedStrike[] = [];
    for (const s of withPlot) {
      const r = s.detail.result!.strikes[0];
      const env = s.f0Index >= 0 ? r.plot!.envelopes[s.f0Index] : undefined;
      if (!env) continue;
      // Time from this strike's onset, so strikes recorded with different lead-in line up.
      const keep = decimateIndices(env.timeS, env.levelDb, Math.max(1, Math.floor(columns / Math.max(1, withPlot.length) / 2)), { mode: "minmax" });
      tables.push([keep.map((i) => env.timeS[i] - r.onsetS), keep.map((i) => env.levelDb[i])]);
      shown.push(s);
    }
    const data = tables.length ? uPlot.join(tables) : ([[]] as unknown as uPlot.AlignedData);
    const series: uPlot.Series[] = [{ label: "Time", value: (_u, v) => (v == null ? "–" : `${v.toFixed(3)} s`) }];
    for (const s of shown) series.push({ label: s.name, stroke: s.colour, dash: s.dash, width: 1.5, spanGaps: true, value: (_u, v) => (v == null ? "–" : `${v.toFixed(1)} dBFS`) });
    const noise = (u: uPlot) => {
      if (!showNoise) return;
      const ctx = u.ctx;
      ctx.save();
      ctx.setLineDash([3, 4]);
      shown.forEach((s) => {
        const floor = s.detail.result!.strikes[0].plot!.envelopes[s.f0Index].noiseFloorDb;
        const y = u.valToPos(floor, "y", true);
        ctx.strokeStyle = s.colour;
        ctx.beginPath();
        ctx.moveTo(u.bbox.left, y);
        ctx.lineTo(u.bbox.left + u.bbox.width, y);
        ctx.stroke();
      });
      ctx.restore();
    };
    const options: ChartOptions = {
      scales: { x: { time: false } },
      axes: [
        { ...axis, label: "Time from the strike (s)" },
        { ...axis, label: "Level (dBFS)", size: 56 },
      ],
      series,
      hooks: { draw: [noise] },
    };
    return { data, options, shown };
  }, [withPlot, showNoise, columns]);

  const labels = partialLabels(strikes);

  return (
    <div ref={wrapRef} className="flex flex-col gap-6" data-testid="compare-strikes">
      <section aria-labelledby="compare-spectra-heading">
        <h3 id="compare-spectra-heading" className="text-body font-semibold">Spectra, overlaid</h3>
        <p className="mb-2 text-caption text-ink-faint">Logarithmic frequency axis. Drag across to zoom into a partial; double-click to see all.</p>
        {withPlot.length && width > 0 ? (
          <UplotChart options={spectrum.options} data={spectrum.data} height={300} label={`Spectra of ${withPlot.length} strikes overlaid: ${withPlot.map((s) => s.name).join("; ")}`} />
        ) : (
          <p className="text-ink-soft">These strikes were analysed before plot series were stored.</p>
        )}
      </section>
      <section aria-labelledby="compare-decay-heading">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h3 id="compare-decay-heading" className="text-body font-semibold">
            Decay of the fundamental{fundamentalLabel && fundamentalLabel.toLowerCase() !== "fundamental" ? ` (${fundamentalLabel})` : ""}, overlaid
          </h3>
          <label className="flex min-h-touch items-center gap-2 text-caption">
            <input type="checkbox" checked={showNoise} onChange={(e) => setShowNoise(e.target.checked)} className="size-5" />
            Show each strike's noise floor
          </label>
        </div>
        {decay.shown.length && width > 0 ? (
          <UplotChart options={decay.options} data={decay.data} height={260} label={`Decay of the fundamental for ${decay.shown.length} strikes overlaid`} />
        ) : (
          <p className="text-ink-soft">No strike has an envelope for the fundamental.</p>
        )}
      </section>
      <section aria-labelledby="compare-table-heading">
        <h3 id="compare-table-heading" className="mb-2 text-body font-semibold">Each partial across the strikes</h3>
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-left text-caption tabular-nums">
            <thead>
              <tr className="border-b border-line-strong">
                <th scope="col" className="py-2 pr-3">Partial</th>
                {strikes.map((s) => (
                  <th key={s.detail.id} scope="col" className="py-2 pr-3 font-semibold">
                    {/* The same colour and dash as the strike's line in both charts and their keys. */}
                    <svg width="22" height="8" aria-hidden="true" className="mr-1.5 inline-block align-middle">
                      <line x1="1" y1="4" x2="21" y2="4" stroke={s.colour} strokeWidth={2} strokeDasharray={s.dash?.join(" ")} />
                    </svg>
                    <span className="break-words">{s.name}</span>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {labels.map((label) => (
                <tr key={label} className="border-b border-line">
                  <th scope="row" className="py-2 pr-3 font-medium">{label}</th>
                  {strikes.map((s, i) => {
                    const p = partialByLabel(s, label);
                    const ref = i > 0 ? partialByLabel(strikes[0], label) : undefined;
                    return (
                      <td key={s.detail.id} className="py-2 pr-3 font-mono">
                        {p ? (
                          <>
                            {p.frequencyHz.toFixed(2)} Hz
                            <span className="block text-ink-faint">T60 {p.t60S.toFixed(2)} s{t60ExtrapolatedFrom(p.observedDecayDb) ? ` (${t60ExtrapolatedFrom(p.observedDecayDb)})` : ""} · Q {Math.round(p.q).toLocaleString("en-GB")}</span>
                            {ref ? (
                              <span className="block text-ink-soft" data-testid="compare-delta">
                                {signedCents(cents(p.frequencyHz, ref.frequencyHz))} cents, T60 ×{(p.t60S / ref.t60S).toFixed(2)} against the first
                              </span>
                            ) : null}
                          </>
                        ) : (
                          <span className="text-ink-faint">not found</span>
                        )}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <p className="mt-2 text-caption text-ink-faint">
          Partials matched to the spec are named by their role; frequencies are as measured, before temperature correction. The later strikes are compared with the first
          ({strikes[0].name}): the shift in cents and the T60 as a multiple of the first one's.
        </p>
      </section>
    </div>
  );
}

/** The spec labels seen on any strike, in the order of their first frequency. */
function partialLabels(strikes: ComparedStrike[]): string[] {
  const seen = new Map<string, number>();
  for (const s of strikes) {
    const partials = s.detail.result!.strikes[0].partials;
    for (const [k, label] of Object.entries(s.detail.labels)) {
      const f = partials[Number(k)]?.frequencyHz;
      if (f !== undefined && !seen.has(label)) seen.set(label, f);
    }
  }
  return [...seen.entries()].sort((a, b) => a[1] - b[1]).map(([label]) => label);
}

function partialByLabel(s: ComparedStrike, label: string) {
  const entry = Object.entries(s.detail.labels).find(([, v]) => v === label);
  return entry ? s.detail.result!.strikes[0].partials[Number(entry[0])] : undefined;
}

/** +1.2 / −0.4 with a true minus sign. */
function signedCents(v: number): string {
  const t = v.toFixed(1);
  return v > 0 ? `+${t}` : t.replace("-", "\u2212");
}
