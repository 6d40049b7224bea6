/**
 * Recurra's heatmap colours: a value-suppressing scale in the spirit of Correll, Moritz & Heer
 * (2018), "Value-Suppressing Uncertainty Palettes", CHI. The more uncertain a cell, the fewer
 * value levels it can show and the closer its colour moves to a neutral tone, so a wide
 * interval cannot look like a confident extreme. Palettes are Recurra's own: a single-hue blue
 * lightness ramp for rates and shares, a blue–ochre diverging ramp (neutral at a ratio of 1)
 * for rate ratios; both stay distinguishable with the common colour-vision deficiencies
 * because they differ in lightness, not only in hue.
 */
export type HeatMetric = "rate" | "ratio" | "share";

export const SEQUENTIAL = ["#eef1f6", "#c3cee0", "#8fa6c7", "#56729f", "#243e6b"] as const;
export const DIVERGING = ["#2f6f8f", "#9cc3d4", "#ece8dc", "#dba66a", "#9a4f14"] as const;
export const NEUTRAL = "#b8b4aa";
/** Cells with too little exposure: not a value at all. */
export const TOO_LITTLE = "#f4f2ed";

/** Ratio bin edges (diverging around 1). */
export const RATIO_EDGES = [0.5, 0.9, 1.5, 4] as const;

/** How many value levels survive at each certainty level (0 = most certain). */
const LEVELS = [5, 3, 2, 1] as const;

function hexToRgb(hex: string): [number, number, number] {
  const v = parseInt(hex.slice(1), 16);
  return [(v >> 16) & 255, (v >> 8) & 255, v & 255];
}

function rgbToHex([r, g, b]: [number, number, number]): string {
  return `#${[r, g, b].map((c) => Math.round(c).toString(16).padStart(2, "0")).join("")}`;
}

function mix(a: string, b: string, t: number): string {
  const x = hexToRgb(a);
  const y = hexToRgb(b);
  return rgbToHex([x[0] + (y[0] - x[0]) * t, x[1] + (y[1] - x[1]) * t, x[2] + (y[2] - x[2]) * t]);
}

/** Value bin 0–4 of an estimate. Rates and shares are binned against the map's own maximum. */
export function valueBin(metric: HeatMetric, value: number, maxValue: number): number {
  if (value === Infinity) return 4;
  if (metric === "ratio") {
    let bin = 0;
    for (const edge of RATIO_EDGES) if (value >= edge) bin++;
    return bin;
  }
  if (!(maxValue > 0) || value <= 0) return 0;
  return Math.min(4, Math.floor((value / maxValue) * 5));
}

/**
 * Certainty level 0–3: how many value bins the interval spans beyond the estimate's own. An
 * interval inside one bin is certain (level 0) however wide it is in absolute terms (an open
 * ratio interval whose lower limit is already in the top bin is certain); one spanning four or
 * more bins is level 3 and shows as neutral.
 */
export function certaintyLevel(
  metric: HeatMetric,
  lower: number | null,
  upper: number | null,
  maxValue: number,
): number {
  if (lower === null) return 3;
  const top = upper === null || !Number.isFinite(upper) ? 4 : valueBin(metric, upper, maxValue);
  const bottom = valueBin(metric, lower, maxValue);
  return Math.max(0, Math.min(3, top - bottom));
}

/**
 * The colour of a cell: its value bin merged with its neighbours as certainty drops (5, 3, 2,
 * 1 levels), then moved towards the neutral tone.
 */
export function heatColour(metric: HeatMetric, bin: number, certainty: number): string {
  const palette = metric === "ratio" ? DIVERGING : SEQUENTIAL;
  const level = Math.max(0, Math.min(3, certainty));
  const groups = LEVELS[level] as number;
  // Which of the merged groups the bin falls into, and the bins that group spans.
  const group = Math.min(groups - 1, Math.floor((bin * groups) / 5));
  const from = Math.floor((group * 5) / groups);
  const to = Math.max(from, Math.ceil(((group + 1) * 5) / groups) - 1);
  const members = palette.slice(from, to + 1);
  const averaged = members.reduce(
    (acc, hex, i) => mix(acc, hex, 1 / (i + 1)),
    members[0] as string,
  );
  return mix(averaged, NEUTRAL, level / 3.5);
}
