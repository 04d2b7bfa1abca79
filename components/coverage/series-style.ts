/**
 * Colours and dash patterns of compared configurations: the Okabe & Ito (2008) colour-blind-safe
 * palette, each with its own dash pattern so the lines differ without colour too.
 */
export const SERIES_STYLES = [
  { colour: "#0072B2", dash: "", dashLabel: "solid" },
  { colour: "#D55E00", dash: "9 5", dashLabel: "dashed" },
  { colour: "#009E73", dash: "2 4", dashLabel: "dotted" },
  { colour: "#CC79A7", dash: "12 4 3 4", dashLabel: "dash-dot" },
] as const;
