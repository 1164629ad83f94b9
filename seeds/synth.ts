/**
 * Synthetic strikes for the demo workshop only (invented data, never used as a reference): a sum of
 * exponentially decaying partials, a little noise and optional mains hum, written as 16-bit PCM WAV.
 */
import wavefile from "wavefile";

const { WaveFile } = wavefile;

export type SynthPartial = { frequencyHz: number; amplitude: number; tauS: number; beatHz?: number };

/** Small deterministic PRNG (mulberry32) so the demo is the same on every machine. */
export function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function synthStrikeWav(opts: { sampleRate?: number; durationS: number; onsetS?: number; partials: SynthPartial[]; noise?: number; humHz?: number; seed: number }): Uint8Array {
  const rate = opts.sampleRate ?? 48000;
  const n = Math.round(opts.durationS * rate);
  const onset = Math.round((opts.onsetS ?? 0.1) * rate);
  const rand = prng(opts.seed);
  const gauss = () => Math.sqrt(-2 * Math.log(rand() + 1e-12)) * Math.cos(2 * Math.PI * rand());
  const x = new Float64Array(n);
  const phases = opts.partials.map(() => rand() * 2 * Math.PI);
  for (let i = 0; i < n; i++) {
    let v = (opts.noise ?? 1e-4) * gauss();
    if (opts.humHz) v += 2e-4 * Math.sin(2 * Math.PI * opts.humHz * (i / rate));
    if (i >= onset) {
      const t = (i - onset) / rate;
      opts.partials.forEach((p, k) => {
        const env = p.amplitude * Math.exp(-t / p.tauS);
        const carrier = Math.cos(2 * Math.PI * p.frequencyHz * t + phases[k]);
        // A doublet: two equal modes p.beatHz apart beat at p.beatHz.
        v += p.beatHz ? 0.5 * env * (carrier + Math.cos(2 * Math.PI * (p.frequencyHz + p.beatHz) * t + phases[k])) : env * carrier;
      });
    }
    x[i] = v;
  }
  const pcm = Int16Array.from(x, (v) => Math.max(-32768, Math.min(32767, Math.round(v * 32767))));
  const wav = new WaveFile();
  wav.fromScratch(1, rate, "16", pcm);
  return wav.toBuffer();
}
