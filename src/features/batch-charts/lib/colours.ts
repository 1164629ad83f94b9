/** Batch chart colours from the theme tokens (src/index.css); dark lines on light ground, for print. */
export const colours = {
  ink: "#1d2628",
  axis: "#4a5558",
  faint: "#6f787a",
  grid: "#e4ddd2",
  line: "#1f5d65",
  point: "#1f5d65",
  signal: "#9c3526",
  centre: "#1d2628",
  limit: "#184b52",
  spec: "#8a5a0f",
  bar: "#a9cfd2",
  barStroke: "#1f5d65",
} as const;
