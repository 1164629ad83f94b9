/** Axis ticks for frequency plots (Hz), thinned to the width the axis has. */

/** A 1-2-5 step of about `count` ticks over [lo, hi]. */
export function linearTicks(lo: number, hi: number, count: number): number[] {
  const raw = (hi - lo) / count;
  const mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const n = raw / mag;
  const step = (n >= 7 ? 10 : n >= 3 ? 5 : n >= 1.5 ? 2 : 1) * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi; v += step) out.push(+v.toPrecision(12));
  return out;
}

/** The label a frequency tick gets: "50", "2.5k", "12k". */
export function frequencyTickLabel(v: number): string {
  return v >= 1000 ? `${+(v / 1000).toFixed(3)}k` : `${+v.toFixed(v < 10 ? 1 : 0)}`;
}

/** Room one tick label needs, CSS px: about 7 px a character at 12 px type, plus a gap. */
export function tickLabelPx(text: string): number {
  return text.length * 7 + 14;
}

/** Smallest distance between neighbouring ticks, px, on an axis `widthPx` wide. */
function tightest(ticks: number[], lo: number, hi: number, log: boolean, widthPx: number): number {
  const pos = (v: number) => (log ? (Math.log(v) - Math.log(lo)) / (Math.log(hi) - Math.log(lo)) : (v - lo) / (hi - lo)) * widthPx;
  let min = Infinity;
  for (let i = 1; i < ticks.length; i++) {
    const room = (tickLabelPx(frequencyTickLabel(ticks[i - 1])) + tickLabelPx(frequencyTickLabel(ticks[i]))) / 2;
    min = Math.min(min, pos(ticks[i]) - pos(ticks[i - 1]) - room);
  }
  return min;
}

/**
 * Frequency ticks: 1, 2 and 5 × 10ⁿ on a log axis spanning a factor of four or more; otherwise
 * (linear axis, or a zoomed-in log axis) evenly stepped ticks. Given `widthPx`, the ticks are
 * thinned until neighbouring labels do not run into each other: on a log axis 1-2-5, then 1-5,
 * then powers of ten, then every other power; on a linear one, fewer steps.
 */
export function frequencyTicks(lo: number, hi: number, log: boolean, widthPx?: number): number[] {
  if (!(hi > lo)) return [lo];
  if (!log || hi / lo < 4) {
    const wanted = log ? 5 : 8;
    if (widthPx === undefined) return linearTicks(lo, hi, wanted);
    for (let count = wanted; count >= 2; count--) {
      const ticks = linearTicks(lo, hi, count);
      if (tightest(ticks, lo, hi, false, widthPx) >= 0) return ticks;
    }
    return linearTicks(lo, hi, 1);
  }
  const decades = (mantissas: number[], every = 1) => {
    const out: number[] = [];
    const first = Math.floor(Math.log10(lo));
    for (let e = first; e <= Math.ceil(Math.log10(hi)); e++) {
      for (const m of mantissas) {
        const v = m * Math.pow(10, e);
        if (v >= lo && v <= hi && (m !== 1 || (e - first) % every === 0)) out.push(v);
      }
    }
    return out;
  };
  const choices = [decades([1, 2, 5]), decades([1, 5]), decades([1]), decades([1], 2)];
  if (widthPx === undefined) return choices[0];
  return choices.find((ticks) => tightest(ticks, lo, hi, true, widthPx) >= 0) ?? choices[choices.length - 1];
}
