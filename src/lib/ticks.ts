/** Axis ticks for frequency plots (Hz). */

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

/**
 * Frequency ticks: 1, 2 and 5 × 10ⁿ on a log axis spanning a factor of four or more; otherwise
 * (linear axis, or a zoomed-in log axis) evenly stepped ticks.
 */
export function frequencyTicks(lo: number, hi: number, log: boolean): number[] {
  if (!(hi > lo)) return [lo];
  if (!log || hi / lo < 4) return linearTicks(lo, hi, log ? 5 : 8);
  const out: number[] = [];
  for (let e = Math.floor(Math.log10(lo)); e <= Math.ceil(Math.log10(hi)); e++) {
    for (const m of [1, 2, 5]) {
      const v = m * Math.pow(10, e);
      if (v >= lo && v <= hi) out.push(v);
    }
  }
  return out;
}
