/**
 * Decides when a recording can stop by itself: after a strike has risen well above the room
 * noise measured during the count-in, and its ring has then stayed within a few dB of that noise
 * for about half a second. Pure: feed it block levels in dBFS, it answers with the phase.
 */

export type RingPhase = "waiting" | "ringing" | "decayed";

export type RingWatchOptions = {
  /** Room noise before the strike, RMS dBFS (median of the count-in blocks). */
  noiseDb: number;
  /** Duration of one level block, s. */
  blockS: number;
  /** A strike is heard when a block's RMS rises this far above the noise, dB. */
  riseDb?: number;
  /** The ring counts as decayed below noise + this, dB ("a few dB"). */
  quietAboveNoiseDb?: number;
  /** …held for this long, s. */
  quietHoldS?: number;
  /** Never stop sooner than this after the strike, s (the fit needs some decay to see). */
  minRingS?: number;
};

export class RingWatch {
  private phase: RingPhase = "waiting";
  private quietFor = 0;
  private ringingFor = 0;
  private readonly o: Required<RingWatchOptions>;

  constructor(options: RingWatchOptions) {
    if (!Number.isFinite(options.noiseDb)) throw new RangeError(`RingWatch needs the room noise in dBFS as a finite number, got ${options.noiseDb}.`);
    if (!(options.blockS > 0)) throw new RangeError(`RingWatch needs a positive block duration in s, got ${options.blockS}.`);
    this.o = { riseDb: 20, quietAboveNoiseDb: 6, quietHoldS: 0.5, minRingS: 1, ...options };
  }

  get current(): RingPhase {
    return this.phase;
  }

  /** The level above which the strike counts as heard, dBFS. */
  get strikeThresholdDb(): number {
    return this.o.noiseDb + this.o.riseDb;
  }

  /** The level below which the ring counts as gone, dBFS. */
  get quietThresholdDb(): number {
    return this.o.noiseDb + this.o.quietAboveNoiseDb;
  }

  /** Feeds one block's RMS level (dBFS); returns the phase after it. */
  push(rmsDb: number): RingPhase {
    if (this.phase === "decayed") return this.phase;
    if (this.phase === "waiting") {
      if (rmsDb >= this.strikeThresholdDb) this.phase = "ringing";
      return this.phase;
    }
    this.ringingFor += this.o.blockS;
    // A re-strike while ringing simply keeps it ringing.
    this.quietFor = rmsDb < this.quietThresholdDb ? this.quietFor + this.o.blockS : 0;
    if (this.quietFor >= this.o.quietHoldS - 1e-9 && this.ringingFor >= this.o.minRingS) this.phase = "decayed";
    return this.phase;
  }
}

/** RMS level in dBFS of an amplitude (0 → −∞ clamped to −160 dBFS). */
export function toDbfs(amplitude: number): number {
  return amplitude > 1e-8 ? 20 * Math.log10(amplitude) : -160;
}

/** Median of levels (dB); the count-in's noise estimate, robust to a cough or a bump. */
export function medianDb(levels: readonly number[]): number {
  if (!levels.length) throw new RangeError("medianDb needs at least one level; the count-in recorded nothing.");
  const s = [...levels].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}
