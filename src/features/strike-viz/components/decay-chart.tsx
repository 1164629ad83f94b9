/**
 * One partial's decay: its envelope (dBFS) against time, the fitted exponential as a straight
 * line in dB, the evaluation (fit) range shaded, the noise floor, the two slopes of a two-stage
 * decay, and the beat of a doublet.
 *
 * The fitted line: x ∝ e^(−t/τ) gives a level of A − 20·log10(e)·(t − t0)/τ dB, and
 * 20·log10(e) = 8.686 dB per neper (IEC 60027-3 relates the neper and the decibel).
 */
import { useMemo } from "react";
import type uPlot from "uplot";
import type { Partial, StrikePlot } from "@shared/schemas/analysis";
import { decimateIndices } from "@/lib/decimate";
import { useWidth } from "@/lib/use-width";
import { UplotChart, type ChartOptions } from "@/components/charts/uplot-chart";
import { chartColours } from "../lib/colours";
import { fixed } from "../lib/format";

/** 20·log10(e): dB per neper of amplitude. */
export const DB_PER_NEPER = 20 * Math.LOG10E;

/** Level of a decay fitted as A at t0 with time constant τ, dB at time t (s). */
export function fittedLevelDb(amplitudeDb: number, t0: number, tauS: number, t: number): number {
  return amplitudeDb - (DB_PER_NEPER * (t - t0)) / tauS;
}

/**
 * Level at t = 0 (dB) of the line with time constant τ that passes through the mean of the
 * envelope between `fromS` and `toS` (least squares for the offset with the slope fixed), or
 * null when no envelope point falls in that range.
 */
export function stageAnchor(envelope: { timeS: number[]; levelDb: number[] }, fromS: number, toS: number, tauS: number): number | null {
  let sum = 0;
  let n = 0;
  envelope.timeS.forEach((t, i) => {
    const level = envelope.levelDb[i];
    if (t >= fromS && t <= toS && Number.isFinite(level)) {
      sum += level + (DB_PER_NEPER * t) / tauS;
      n++;
    }
  });
  return n ? sum / n : null;
}

/** The caption's sentence on what the recording saw of the decay and why τ may not hold. */
function decayNote(p: Partial): string {
  const seen =
    typeof p.observedDecayDb !== "number"
      ? ""
      : p.observedDecayDb < 60
        ? ` The recording saw ${fixed(p.observedDecayDb, 0)} dB of the decay; T60 (60 dB) is extrapolated from it.`
        : ` The recording saw ${fixed(p.observedDecayDb, 0)} dB of the decay, all of T60's 60 dB.`;
  if (!p.tauUnreliable) return seen;
  if (p.nonExponential) return `${seen} τ is unreliable here: the envelope does not fall along a straight line in dB (it parts from the fit by ${fixed(p.envelopeDeviationDb ?? 0, 1)} dB RMS), so no single τ describes this decay.`;
  if (p.roomMasked) return `${seen} τ is unreliable here: the room's reverberation lasts about as long as this partial.`;
  if (p.earlyStageOverlap) return `${seen} τ is unreliable here: a faster early decay overlaps the whole measurable decay.`;
  return `${seen} τ is unreliable here: the partial fell by less than 3 dB in the recording.`;
}

export function DecayChart({ partial, envelope, label, height = 220 }: { partial: Partial; envelope: StrikePlot["envelopes"][number]; label: string; height?: number }) {
  const t0 = partial.amplitudeAtS ?? partial.fitStartS;
  const two = partial.twoStage ?? null;

  const [wrapRef, width] = useWidth<HTMLDivElement>();
  // No more points than pixel columns: each pair of columns keeps its lowest and highest level,
  // so a beating envelope keeps its depth.
  const columns = Math.max(100, width - 80);
  const envelopeShown = useMemo(() => {
    const keep = decimateIndices(envelope.timeS, envelope.levelDb, Math.max(1, Math.floor(columns / 2)), { mode: "minmax" });
    return { timeS: keep.map((i) => envelope.timeS[i]), levelDb: keep.map((i) => envelope.levelDb[i]) };
  }, [envelope, columns]);

  const data = useMemo<uPlot.AlignedData>(() => {
    const t = envelopeShown.timeS;
    const inFit = (x: number) => x >= partial.fitStartS && x <= partial.fitEndS;
    const series: (number | null)[][] = [envelopeShown.levelDb, t.map(() => envelope.noiseFloorDb)];
    if (two) {
      // The analysis reports each stage's τ and the knee, not the stages' levels: each line is
      // drawn with its reported slope through the mean of the envelope over its own stage.
      const early = stageAnchor(envelope, partial.fitStartS, two.kneeS, two.earlyTauS);
      const late = stageAnchor(envelope, two.kneeS, partial.fitEndS, two.lateTauS);
      series.push(t.map((x) => (early !== null && inFit(x) && x <= two.kneeS ? fittedLevelDb(early, 0, two.earlyTauS, x) : null)));
      series.push(t.map((x) => (late !== null && inFit(x) && x >= two.kneeS ? fittedLevelDb(late, 0, two.lateTauS, x) : null)));
    } else {
      series.push(t.map((x) => (inFit(x) ? fittedLevelDb(partial.amplitudeDb, t0, partial.tauS, x) : null)));
    }
    return [t, ...series];
  }, [envelopeShown, envelope.noiseFloorDb, partial, t0, two]);

  const options = useMemo<ChartOptions>(() => {
    const shade = (u: uPlot) => {
      const ctx = u.ctx;
      const x0 = u.valToPos(partial.fitStartS, "x", true);
      const x1 = u.valToPos(partial.fitEndS, "x", true);
      const { top, height: h, left, width } = u.bbox;
      const a = Math.max(left, Math.min(x0, x1));
      const b = Math.min(left + width, Math.max(x0, x1));
      ctx.save();
      ctx.fillStyle = chartColours.fitBand;
      ctx.fillRect(a, top, Math.max(0, b - a), h);
      if (two) {
        const k = u.valToPos(two.kneeS, "x", true);
        ctx.strokeStyle = chartColours.early;
        ctx.setLineDash([2, 3]);
        ctx.beginPath();
        ctx.moveTo(k, top);
        ctx.lineTo(k, top + h);
        ctx.stroke();
      }
      ctx.restore();
    };
    const levels = [...envelope.levelDb.filter((v) => Number.isFinite(v)), envelope.noiseFloorDb];
    const yMin = Math.min(...levels);
    const yMax = Math.max(...levels, partial.amplitudeDb);
    const dbValue = (_u: uPlot, v: number | null) => (v == null ? "–" : `${v.toFixed(1)} dBFS`);
    const series: uPlot.Series[] = [
      { label: "Time", value: (_u, v) => (v == null ? "–" : `${v.toFixed(3)} s`) },
      { label: "Envelope", stroke: chartColours.envelopeLight, width: 1.5, value: dbValue },
      { label: "Noise floor", stroke: chartColours.noise, width: 1.25, dash: [6, 4], value: dbValue },
    ];
    if (two) {
      series.push({ label: `Early, τ = ${fixed(two.earlyTauS, 3)} s`, stroke: chartColours.early, width: 2.5, dash: [8, 3], value: dbValue });
      series.push({ label: `Late, τ = ${fixed(two.lateTauS, 3)} s`, stroke: chartColours.late, width: 2.5, dash: [8, 3], value: dbValue });
    } else {
      series.push({ label: `Fit, τ = ${fixed(partial.tauS, 3)} s`, stroke: chartColours.fit, width: 2, value: dbValue });
    }
    return {
      scales: { x: { time: false }, y: { range: [Math.floor(yMin / 10) * 10 - 5, Math.ceil(yMax / 10) * 10 + 5] } },
      axes: [
        { label: "Time from file start (s)", stroke: chartColours.axis, grid: { stroke: chartColours.grid }, ticks: { stroke: chartColours.grid } },
        { label: "Level (dBFS)", stroke: chartColours.axis, grid: { stroke: chartColours.grid }, ticks: { stroke: chartColours.grid }, size: 56 },
      ],
      series,
      hooks: { drawAxes: [shade] },
    };
  }, [envelope, partial, two]);

  const description = [
    `Decay of ${label}: envelope from ${fixed(envelope.timeS[0] ?? 0, 2)} s to ${fixed(envelope.timeS[envelope.timeS.length - 1] ?? 0, 2)} s`,
    `fitted from ${fixed(partial.fitStartS, 2)} s to ${fixed(partial.fitEndS, 2)} s with τ = ${fixed(partial.tauS, 3)} s`,
    `noise floor ${fixed(envelope.noiseFloorDb, 1)} dBFS`,
    two ? `two-stage decay: early τ ${fixed(two.earlyTauS, 3)} s, late τ ${fixed(two.lateTauS, 3)} s, knee at ${fixed(two.kneeS, 2)} s` : null,
    partial.beatHz ? `beats at ${fixed(partial.beatHz, 2)} Hz` : null,
  ]
    .filter(Boolean)
    .join("; ");

  return (
    <figure className="flex flex-col gap-1">
      <div ref={wrapRef} className="w-full">
        {width > 0 ? <UplotChart options={options} data={data} height={height} label={description} className="tl-chart tl-decay w-full" idleReadout="Point at the chart to read a time and level." /> : null}
      </div>
      <figcaption className="text-caption text-ink-faint">
        Shaded: the evaluation range, {fixed(partial.fitStartS, 2)}–{fixed(partial.fitEndS, 2)} s.
        {two ? ` Two stages: the dotted line marks the knee at ${fixed(two.kneeS, 2)} s.` : ""}
        {partial.beatHz
          ? ` Beats at ${fixed(partial.beatHz, 2)} Hz (the envelope swells every ${fixed(1 / partial.beatHz, 2)} s): two close modes ring together${partial.modes?.length === 2 ? `, at ${fixed(partial.modes[0].frequencyHz, 2)} and ${fixed(partial.modes[1].frequencyHz, 2)} Hz` : ""}.`
          : ""}
        {decayNote(partial)}
      </figcaption>
    </figure>
  );
}
