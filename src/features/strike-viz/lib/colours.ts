/**
 * Chart colours, taken from the theme tokens in src/index.css (canvas cannot read CSS variables
 * cheaply on every redraw, so the hex values are repeated here; keep them in step).
 */
export const chartColours = {
  ink: "#1d2628",
  axis: "#4a5558",
  grid: "rgba(29,38,40,0.09)",
  wave: "#78b0b5",
  waveProgress: "#1f5d65",
  cursor: "#9c3526",
  onset: "rgba(138,90,15,0.85)",
  spectrum: "#1f5d65",
  noise: "#8a5a0f",
  partial: "#9c3526",
  strikeNote: "#2c737b",
  hum: "#6f787a",
  envelope: "#1f5d65",
  /** Lighter than the fit lines so a fit drawn on top of its envelope stays visible. */
  envelopeLight: "#4a8f96",
  fit: "#9c3526",
  early: "#8a5a0f",
  late: "#2f6b3c",
  fitBand: "rgba(120,176,181,0.16)",
} as const;

/** A palette for overlays (compare strikes): distinct hues that stay apart in print. */
export const overlayPalette = ["#1f5d65", "#9c3526", "#8a5a0f", "#2f6b3c", "#5b4a8a", "#4a5558"] as const;
