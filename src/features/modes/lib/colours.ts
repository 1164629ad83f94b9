/**
 * Colours of the Modes charts, from the theme tokens in src/index.css (canvas cannot read CSS
 * variables cheaply on every redraw, so the hex values are repeated here; keep them in step).
 * Shapes tell the series apart as well as colours, so the charts read in grey print too.
 */
export const modeColours = {
  ink: "#1d2628",
  axis: "#4a5558",
  faint: "#6f787a",
  grid: "rgba(29,38,40,0.09)",
  lane: "rgba(29,38,40,0.16)",
  free: "#1f5d65",
  held: "#8a5a0f",
  measured: "#1d2628",
  support: "#9c3526",
  unmatched: "#6f787a",
  close: "#1f5d65",
  off: "#8a5a0f",
  far: "#9c3526",
  calibrated: "#78b0b5",
  suspended: "#1f5d65",
  hand: "#9c3526",
  stand: "#8a5a0f",
  paper: "#fffdf9",
} as const;

/** A match line's colour by the residual after calibration, cents: within 10, within 25, further. */
export function residualColour(cents: number): string {
  const a = Math.abs(cents);
  return a <= 10 ? modeColours.close : a <= 25 ? modeColours.off : modeColours.far;
}
