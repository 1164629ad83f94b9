/**
 * Bucket decimation for plots: at most one point per pixel column, so a chart never carries more
 * points than it can show. Each bucket keeps its extreme value (the maximum for a spectrum, so a
 * narrow partial peak is never averaged away; the minimum and maximum alternately for an
 * envelope, so beats keep their depth). Pure: arrays in, arrays out.
 */

export type Series = { x: number[]; y: (number | null)[] };

/**
 * @param x ascending x values (Hz or s); @param y values at x (dB), null for gaps.
 * @param buckets number of pixel columns (≥ 1); @param range [lo, hi] of x to keep.
 * @param log buckets equal in log10(x) (for a logarithmic axis); x must then be > 0.
 * @param mode "max" keeps each bucket's largest y; "minmax" keeps its smallest and largest, in x order.
 */
export function decimate(
  x: readonly number[],
  y: readonly (number | null)[],
  buckets: number,
  options: { range?: readonly [number, number]; log?: boolean; mode?: "max" | "minmax" } = {},
): Series {
  const keep = decimateIndices(x, y, buckets, options);
  return { x: keep.map((i) => x[i]), y: keep.map((i) => y[i]) };
}

/** As `decimate`, but returns the kept indices, so companion series (a noise floor) can follow. */
export function decimateIndices(
  x: readonly number[],
  y: readonly (number | null)[],
  buckets: number,
  options: { range?: readonly [number, number]; log?: boolean; mode?: "max" | "minmax" } = {},
): number[] {
  if (x.length !== y.length) throw new RangeError(`decimate: x and y must have the same length, got ${x.length} and ${y.length}.`);
  if (!(buckets >= 1)) throw new RangeError(`decimate: the number of buckets must be at least 1, got ${buckets}.`);
  if (x.length === 0) return [];
  const n = Math.floor(buckets);
  const log = options.log ?? false;
  const mode = options.mode ?? "max";
  const lo = options.range ? options.range[0] : x[0];
  const hi = options.range ? options.range[1] : x[x.length - 1];
  if (log && !(lo > 0)) throw new RangeError(`decimate: a logarithmic axis needs x > 0, got a range starting at ${lo}.`);
  const f = (v: number) => (log ? Math.log10(v) : v);
  const a = f(lo);
  const span = f(hi) - a;
  const inRange: number[] = [];
  x.forEach((v, i) => {
    if (v >= lo && v <= hi) inRange.push(i);
  });
  // Few enough points already: keep those in range as they are.
  if (inRange.length <= (mode === "minmax" ? 2 * n : n) || !(span > 0)) return inRange;
  const maxI = new Array<number>(n).fill(-1);
  const minI = new Array<number>(n).fill(-1);
  for (const i of inRange) {
    const yi = y[i];
    if (yi === null || !Number.isFinite(yi)) continue;
    const k = Math.min(n - 1, Math.floor(((f(x[i]) - a) / span) * n));
    if (maxI[k] < 0 || yi > (y[maxI[k]] as number)) maxI[k] = i;
    if (minI[k] < 0 || yi < (y[minI[k]] as number)) minI[k] = i;
  }
  const out: number[] = [];
  for (let k = 0; k < n; k++) {
    if (maxI[k] < 0) continue;
    if (mode === "minmax" && minI[k] !== maxI[k]) out.push(Math.min(minI[k], maxI[k]), Math.max(minI[k], maxI[k]));
    else out.push(maxI[k]);
  }
  return out;
}
