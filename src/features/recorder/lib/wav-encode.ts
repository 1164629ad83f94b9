/**
 * Writes mono float samples (−1…1) as a RIFF/WAVE file with 24-bit integer PCM (WAVE_FORMAT_PCM,
 * Microsoft "Multimedia Programming Interface and Data Specifications 1.0", 1991). 24 bits keep
 * about 144 dB of range, so a ring can be followed far into the room noise without quantisation
 * limiting the decay fit; every common player and Tinelog's decoder read it.
 */

export class WavEncodeError extends Error {
  override name = "WavEncodeError";
}

const FULL_SCALE_24 = 8_388_607; // 2²³ − 1

/** Encodes `samples` at `sampleRate` Hz; values beyond ±1 are clipped to full scale. */
export function encodeWav24(samples: Float32Array, sampleRate: number): ArrayBuffer {
  if (!Number.isInteger(sampleRate) || sampleRate < 8000 || sampleRate > 384_000) {
    throw new WavEncodeError(`The sample rate must be a whole number of Hz from 8000 to 384000, got ${sampleRate}.`);
  }
  if (samples.length === 0) throw new WavEncodeError("Nothing was recorded: there are no samples to write.");
  const bytesPerSample = 3;
  const dataBytes = samples.length * bytesPerSample;
  const buffer = new ArrayBuffer(44 + dataBytes + (dataBytes % 2));
  const view = new DataView(buffer);
  const ascii = (offset: number, text: string) => {
    for (let i = 0; i < text.length; i++) view.setUint8(offset + i, text.charCodeAt(i));
  };
  ascii(0, "RIFF");
  view.setUint32(4, 36 + dataBytes + (dataBytes % 2), true);
  ascii(8, "WAVE");
  ascii(12, "fmt ");
  view.setUint32(16, 16, true);
  view.setUint16(20, 1, true); // WAVE_FORMAT_PCM
  view.setUint16(22, 1, true); // mono
  view.setUint32(24, sampleRate, true);
  view.setUint32(28, sampleRate * bytesPerSample, true);
  view.setUint16(32, bytesPerSample, true);
  view.setUint16(34, 24, true);
  ascii(36, "data");
  view.setUint32(40, dataBytes, true);
  let o = 44;
  for (let i = 0; i < samples.length; i++) {
    const s = Math.max(-1, Math.min(1, samples[i]));
    let v = Math.round(s * FULL_SCALE_24);
    if (v < 0) v += 0x1000000;
    view.setUint8(o, v & 0xff);
    view.setUint8(o + 1, (v >> 8) & 0xff);
    view.setUint8(o + 2, (v >> 16) & 0xff);
    o += 3;
  }
  return buffer;
}
