/** When a take stops by itself: the phases on worked level sequences (block levels in dBFS). */
import { describe, expect, it } from "vitest";
import { RingWatch, medianDb, toDbfs } from "./ring-watch";

/** Levels of a strike ringing down from `peak` with time constant τ (dB falls 8.686/τ per second). */
function ring(peakDb: number, tauS: number, blockS: number, seconds: number, noiseDb: number): number[] {
  const out: number[] = [];
  for (let t = 0; t < seconds; t += blockS) {
    const level = peakDb - (20 * Math.LOG10E * t) / tauS;
    // Ring and noise add in power.
    out.push(10 * Math.log10(10 ** (level / 10) + 10 ** (noiseDb / 10)));
  }
  return out;
}

describe("RingWatch", () => {
  const blockS = 2048 / 48_000;

  it("waits for a strike, rings, and stops half a second after the ring is within 6 dB of the noise", () => {
    const noise = -70;
    const watch = new RingWatch({ noiseDb: noise, blockS });
    expect(watch.push(-69)).toBe("waiting");
    const levels = ring(-12, 0.5, blockS, 10, noise);
    let stoppedAt = -1;
    levels.forEach((l, i) => {
      if (stoppedAt < 0 && watch.push(l) === "decayed") stoppedAt = i * blockS;
    });
    // Ring above noise+6 dB until -12 - 8.686 t/0.5 = -64 + ~1 dB margin: t ≈ 3.0 s; plus the 0.5 s hold.
    const reachesQuiet = ((-12 - (noise + 6 - 1)) * 0.5) / (20 * Math.LOG10E);
    expect(stoppedAt).toBeGreaterThan(reachesQuiet);
    expect(stoppedAt).toBeLessThan(reachesQuiet + 0.5 + 0.3);
  });

  it("keeps ringing through a second strike and never stops before the minimum ring time", () => {
    const watch = new RingWatch({ noiseDb: -60, blockS, minRingS: 1 });
    watch.push(-10);
    for (let i = 0; i < Math.round(0.6 / blockS); i++) expect(watch.push(-65)).toBe("ringing");
    expect(watch.push(-10)).toBe("ringing"); // re-strike resets the quiet time
    let phase = watch.current;
    for (let i = 0; i < Math.round(0.49 / blockS); i++) phase = watch.push(-65);
    expect(phase).toBe("ringing");
    for (let i = 0; i < 3; i++) phase = watch.push(-65);
    expect(phase).toBe("decayed");
  });

  it("does not take room noise for a strike", () => {
    const watch = new RingWatch({ noiseDb: -50, blockS });
    for (let i = 0; i < 200; i++) expect(watch.push(-50 + 15 * Math.sin(i))).toBe("waiting");
  });

  it("rejects a missing noise level with a message", () => {
    expect(() => new RingWatch({ noiseDb: Number.NaN, blockS })).toThrow(/room noise in dBFS/);
  });
});

describe("level helpers", () => {
  it("toDbfs: full scale is 0 dBFS, half is −6.02 dBFS (20·log10 0.5), silence is clamped", () => {
    expect(toDbfs(1)).toBe(0);
    expect(toDbfs(0.5)).toBeCloseTo(-6.0206, 4);
    expect(toDbfs(0)).toBe(-160);
  });
  it("medianDb ignores a cough during the count-in", () => {
    expect(medianDb([-70, -71, -20, -69, -70])).toBe(-70);
    expect(medianDb([-60, -62])).toBe(-61);
  });
});
