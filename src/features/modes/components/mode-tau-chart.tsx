/**
 * τ per mode by support: each measured mode at its frequency (log axis), its median τ suspended,
 * in the hand and on a stand (log axis), joined by a line so the drop under the hold shows at a
 * glance, and named by its model mode (F8 = mode 8 of the free model).
 */
import { useMemo } from "react";
import type uPlot from "uplot";
import type { ModeMap } from "@shared/schemas/modes";
import { UplotChart, type ChartOptions } from "@/components/charts/uplot-chart";
import { useWidth } from "@/lib/use-width";
import { hzLabel, logAxis, secondsLabel } from "../lib/axes";
import { modeColours } from "../lib/colours";
import { measuredModeNames } from "../lib/words";
import { drawShape, KeyItem, type Shape } from "./marker-shapes";

const SUPPORTS = [
  { key: "suspended", label: "suspended", shape: "circle", colour: modeColours.suspended },
  { key: "hand", label: "held in hand", shape: "triangle", colour: modeColours.hand },
  { key: "stand", label: "on a stand", shape: "square", colour: modeColours.stand },
] as const satisfies readonly { key: "suspended" | "hand" | "stand"; label: string; shape: Shape; colour: string }[];


export function ModeTauChart({ map }: { map: ModeMap }) {
  const [ref, width] = useWidth<HTMLElement>({ initial: 720 });
  const narrow = width < 520;
  const modes = useMemo(() => map.measuredModes.filter((m) => SUPPORTS.some((s) => m.tauBySupport[s.key] !== null)).sort((a, b) => a.measuredHz - b.measuredHz), [map]);
  const names = useMemo(() => measuredModeNames(map), [map]);
  const present = SUPPORTS.filter((s) => modes.some((m) => m.tauBySupport[s.key] !== null));

  const bounds = useMemo(() => {
    const f = modes.map((m) => m.measuredHz);
    const t = modes.flatMap((m) => SUPPORTS.map((s) => m.tauBySupport[s.key]).filter((v): v is number => v !== null && v > 0));
    return { fLo: Math.min(...f) / 1.3, fHi: Math.max(...f) * 1.3, tLo: Math.min(...t) / 1.8, tHi: Math.max(...t) * 2.2 };
  }, [modes]);

  const options = useMemo<ChartOptions>(() => {
    const draw = (u: uPlot) => {
      const ctx = u.ctx;
      const dpr = devicePixelRatio || 1;
      const X = (f: number) => u.valToPos(f, "x", true);
      const Y = (t: number) => u.valToPos(t, "y", true);
      ctx.save();
      ctx.lineWidth = 1.5 * dpr;
      ctx.font = `${600} ${11 * dpr}px "Inter Variable", ui-sans-serif, sans-serif`;
      ctx.textAlign = "center";
      let lastRight = -Infinity;
      for (const m of modes) {
        const values = SUPPORTS.map((s) => m.tauBySupport[s.key]).filter((v): v is number => v !== null);
        const x = X(m.measuredHz);
        if (values.length > 1) {
          ctx.strokeStyle = modeColours.faint;
          ctx.beginPath();
          ctx.moveTo(x, Y(Math.max(...values)));
          ctx.lineTo(x, Y(Math.min(...values)));
          ctx.stroke();
        }
        for (const s of SUPPORTS) {
          const t = m.tauBySupport[s.key];
          if (t !== null) drawShape(ctx, s.shape, x, Y(t), 5.5 * dpr, s.colour, modeColours.paper);
        }
        const name = names.get(m.id) ?? (m.supportMode ? "support" : "");
        const w = ctx.measureText(name).width;
        if (name && x - w / 2 > lastRight + 3 * dpr) {
          lastRight = x + w / 2;
          ctx.fillStyle = m.supportMode ? modeColours.support : modeColours.ink;
          ctx.fillText(name, x, Y(Math.max(...values)) - 11 * dpr);
        }
      }
      ctx.restore();
    };
    return {
      scales: {
        x: { time: false, distr: 3, log: 10, range: () => [bounds.fLo, bounds.fHi] },
        y: { distr: 3, log: 10, range: () => [bounds.tLo, bounds.tHi] },
      },
      axes: [
        logAxis(narrow ? "Frequency (Hz, log)" : "Frequency of the mode (Hz, logarithmic)", hzLabel),
        logAxis(narrow ? "τ (s, log)" : "τ (s, logarithmic)", secondsLabel, { size: 52 }),
      ],
      series: [{}, { label: "frame", stroke: "transparent", points: { show: false } }],
      legend: { show: false },
      cursor: { show: false },
      hooks: { draw: [draw] },
    };
  }, [modes, names, bounds, narrow]);

  const data = useMemo<uPlot.AlignedData>(() => [[bounds.fLo, bounds.fHi], [null, null]], [bounds]);
  if (!modes.length) return null;
  const label = `Time constant τ of ${modes.length} measured modes by support: ${modes
    .map((m) => `${names.get(m.id) ?? `${m.measuredHz.toFixed(0)} Hz`}: ${present.map((s) => `${s.label} ${m.tauBySupport[s.key]?.toFixed(2) ?? "—"} s`).join(", ")}`)
    .join("; ")}.`;

  return (
    <figure ref={ref} className="flex flex-col gap-2" data-testid="mode-tau-chart">
      <UplotChart options={options} data={data} height={300} label={label} className="tl-chart w-full" />
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-caption text-ink-soft">
        {present.map((s) => (
          <KeyItem key={s.key} shape={s.shape} colour={s.colour}>
            {s.label}
          </KeyItem>
        ))}
        <span>Median τ over units.{names.size ? " F8 is mode 8 of the free model, H1 mode 1 of the held model." : ""}</span>
      </figcaption>
    </figure>
  );
}
