/**
 * Tinelog's own spectrogram colour map: 256 RGBA entries (0…1) from the paper ground through
 * steel-teal to near-black ink, so loud is dark and the view prints on white.
 */
const stops: [number, [number, number, number]][] = [
  [0, [0xff, 0xfd, 0xf9]],
  [0.35, [0xa9, 0xcf, 0xd2]],
  [0.65, [0x2c, 0x73, 0x7b]],
  [0.88, [0x13, 0x3b, 0x41]],
  [1, [0x0b, 0x16, 0x18]],
];

function at(t: number): [number, number, number, number] {
  for (let i = 1; i < stops.length; i++) {
    const [t1, c1] = stops[i];
    const [t0, c0] = stops[i - 1];
    if (t <= t1) {
      const u = (t - t0) / (t1 - t0);
      return [(c0[0] + u * (c1[0] - c0[0])) / 255, (c0[1] + u * (c1[1] - c0[1])) / 255, (c0[2] + u * (c1[2] - c0[2])) / 255, 1];
    }
  }
  return [stops[stops.length - 1][1][0] / 255, stops[stops.length - 1][1][1] / 255, stops[stops.length - 1][1][2] / 255, 1];
}

export const spectrogramColourMap: number[][] = Array.from({ length: 256 }, (_, i) => at(i / 255));
