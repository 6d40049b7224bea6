/**
 * The metrics Recurra's screens show for a cell, each defined once: its label in the
 * organisation's distance unit, its value and interval (the interval at the confidence its run
 * was computed with, named by intervalLabel), its method, how its numbers are printed and its
 * sentence in plain words. The heatmap, its legend and metric choice, the ranked table, the
 * drill-down, the lookup, the known issues, the CSV exports and the command line all read them
 * from here. Adding a metric: DEVELOPERS.md, "Add a metric".
 *
 * Values come per 10,000 mi from the cells (lib/cell-types.ts) and are shown per 10,000 of the
 * organisation's unit. Pure; safe in client components.
 */
import type { CellFigures } from "./cell-types";
import {
  countOf,
  describeRate,
  describeRatio,
  describeShare,
  describeWearRatio,
  formatPercent,
  formatPlain,
  formatProbability,
  formatRange,
  intervalLabel,
  perTenThousand,
} from "./plain-words";
import { milesToUnit } from "./units";

export type DistanceUnit = "mi" | "km";
/** Who reads the figure: the organisation's unit and the confidence of the cells' run. */
export type MetricContext = { unit: DistanceUnit; confidence: number };
export type MetricKey = "rate" | "wearRate" | "ratio" | "share" | "shrunk";
/** The heatmap's colour scale for a metric (lib/heat-colour.ts). */
export type MetricScale = "rate" | "ratio" | "share";
export type Interval = { lower: number | null; upper: number | null };

export type Metric = {
  key: MetricKey;
  /** What the number is, in the organisation's unit ("Repairs per 10,000 km"). */
  label: (unit: DistanceUnit) => string;
  /** The method, named with its source, for the details. */
  method: string;
  scale: MetricScale;
  /**
   * The value in the organisation's unit; Infinity for a ratio whose rest of the fleet had no
   * such repairs (never shown as ∞: see format and describe).
   */
  value: (c: CellFigures, unit: DistanceUnit) => number | null;
  interval: (c: CellFigures, unit: DistanceUnit) => Interval;
  /** A value as the tables and the heatmap print it. */
  format: (value: number | null, interval: Interval) => string;
  /** An interval as the details print it ("4.5 to 42", "2.1% to 9%"). */
  formatInterval: (interval: Interval) => string;
  /** The figure in the words a mechanic reads first. */
  describe: (c: CellFigures, ctx: MetricContext) => string;
};

const per10k = (v: number | null, unit: DistanceUnit) =>
  v === null ? null : perTenThousand(v, unit);

const rateOf = (noun: string, kind: "rate" | "wearRate"): Metric => ({
  key: kind,
  label: (unit) => `${noun[0]!.toUpperCase()}${noun.slice(1)}s per 10,000 ${unit}`,
  method: "Exact Poisson interval (Garwood 1936)",
  scale: "rate",
  value: (c, unit) => per10k(c.ratePer10k, unit),
  interval: (c, unit) => ({ lower: per10k(c.rateLower, unit), upper: per10k(c.rateUpper, unit) }),
  format: (v) => formatPlain(v),
  formatInterval: (i) => formatRange(i.lower, i.upper),
  describe: (c, ctx) =>
    describeRate({
      events: c.events,
      exposureMi: c.exposureMi,
      ratePer10kMi: c.ratePer10k,
      lowerPer10kMi: c.rateLower,
      upperPer10kMi: c.rateUpper,
      unit: ctx.unit,
      noun: [noun],
    }),
});

/** Repairs per 10,000 of the unit driven: a failure cell's rate. */
export const RATE = rateOf("repair", "rate");
/** The rate of a wear cell: wear repairs per 10,000 of the unit driven. */
export const WEAR_RATE = rateOf("wear repair", "wearRate");

/** The rate against the rest of the fleet in the same band. */
export const RATIO: Metric = {
  key: "ratio",
  label: () => "Times the rest of the fleet",
  method: "Exact conditional test against the rest of the fleet in the same band",
  scale: "ratio",
  value: (c) =>
    c.rateRatio ?? (c.events > 0 && c.ratioLower !== null ? Number.POSITIVE_INFINITY : null),
  interval: (c) => ({ lower: c.ratioLower, upper: c.ratioUpper }),
  // No ∞: a fault the rest of the fleet never had reads as "at least" its lower limit.
  format: (v, i) =>
    v === Number.POSITIVE_INFINITY
      ? i.lower !== null && i.lower > 0
        ? `≥ ${formatPlain(i.lower)}`
        : "only here"
      : formatPlain(v),
  formatInterval: (i) => formatRange(i.lower, i.upper),
  describe: (c) =>
    (c.kind === "wear" ? describeWearRatio : describeRatio)({
      ratio: c.rateRatio,
      lower: c.ratioLower,
      upper: c.ratioUpper,
      events: c.events,
    }),
};

/** The share of the cohort's vehicles in the band that had the repair. */
export const SHARE: Metric = {
  key: "share",
  label: () => "Share of vehicles affected",
  method: "Wilson score interval (Wilson 1927)",
  scale: "share",
  value: (c) => c.shareAffected,
  interval: (c) => ({ lower: c.shareLower, upper: c.shareUpper }),
  format: (v) => formatPercent(v),
  formatInterval: (i) => `${formatPercent(i.lower)} to ${formatPercent(i.upper)}`,
  describe: (c) =>
    `affected: ${describeShare({
      count: c.vehiclesAffected,
      of: c.vehiclesAtRisk,
      lower: c.shareLower,
      upper: c.shareUpper,
      noun: ["vehicle"],
    })}`,
};

/** The shrunk rate: the rate with the luck of small numbers taken out. */
export const SHRUNK: Metric = {
  key: "shrunk",
  label: (unit) => `Steady rate per 10,000 ${unit}`,
  method: "Empirical Bayes, gamma–Poisson",
  scale: "rate",
  value: (c, unit) => per10k(c.shrunkRatePer10k, unit),
  interval: (c, unit) => ({
    lower: per10k(c.shrunkLower, unit),
    upper: per10k(c.shrunkUpper, unit),
  }),
  format: (v) => formatPlain(v),
  formatInterval: (i) => formatRange(i.lower, i.upper),
  describe: (c, ctx) => {
    const v = per10k(c.shrunkRatePer10k, ctx.unit);
    if (v === null) return "no steady rate: no distance driven";
    const i = SHRUNK.interval(c, ctx.unit);
    const range =
      i.lower === null || i.upper === null
        ? ""
        : `, likely between ${formatPlain(i.lower)} and ${formatPlain(i.upper)}`;
    return `steady rate about ${formatPlain(v)} per 10,000 ${ctx.unit}${range} (the rate with the luck of small numbers taken out)`;
  },
};

export const METRICS: Record<MetricKey, Metric> = {
  rate: RATE,
  wearRate: WEAR_RATE,
  ratio: RATIO,
  share: SHARE,
  shrunk: SHRUNK,
};

/** The metrics a person can colour the heatmap by (the rate is the wear rate on wear cells). */
export const CHOOSABLE_METRICS = ["rate", "ratio", "share", "shrunk"] as const;
export type ChoosableMetric = (typeof CHOOSABLE_METRICS)[number];

/** The metric of a choice for cells of a kind: a wear cell's rate is its wear rate. */
export function metricFor(choice: ChoosableMetric, kind: "failure" | "wear" | "service"): Metric {
  return choice === "rate" && kind === "wear" ? WEAR_RATE : METRICS[choice];
}

/** A column header: the label and its interval ("Repairs per 10,000 km (90% interval)"). */
export function metricHeader(m: Metric, ctx: MetricContext): string {
  return `${m.label(ctx.unit)} (${intervalLabel(ctx.confidence)})`;
}

/** A cell's figure as tables print it: the value and "likely …" for its interval. */
export function metricFigure(
  m: Metric,
  c: CellFigures,
  unit: DistanceUnit,
): { value: string; likely: string } {
  const interval = m.interval(c, unit);
  const hasInterval = interval.lower !== null || interval.upper !== null;
  return {
    value: m.format(m.value(c, unit), interval),
    likely: hasInterval ? `likely ${m.formatInterval(interval)}` : "",
  };
}

/** A cell too thin to judge, in words (the screens show it as uncertain, never as zero). */
export function describeTooLittle(c: CellFigures, unit: DistanceUnit): string {
  return `Too little data to judge: ${countOf(c.events, "repair")} in ${formatPlain(
    milesToUnit(c.exposureMi, unit),
  )} ${unit} driven. Not tested.`;
}

/**
 * A cell in one sentence: its rate and how it compares with the rest of the fleet (wear:
 * whether it wears out sooner), or that there is too little data.
 */
export function describeCell(c: CellFigures, ctx: MetricContext): string {
  if (c.hasTooLittleData) return describeTooLittle(c, ctx.unit);
  const rate = metricFor("rate", c.kind).describe(c, ctx);
  return `${rate}; ${RATIO.describe(c, ctx)}.`;
}

/**
 * The method and exact figures behind a cell, one click away (FigureDetails): each metric's
 * value, interval and method, the exact test's p and the false-discovery q.
 */
export function cellDetails(
  c: CellFigures,
  ctx: MetricContext,
  metrics: readonly Metric[] = [metricFor("rate", c.kind), RATIO, SHARE, SHRUNK],
): [label: string, value: string][] {
  const level = intervalLabel(ctx.confidence);
  const rows: [string, string][] = metrics.map((m) => {
    const interval = m.interval(c, ctx.unit);
    return [
      m.label(ctx.unit),
      `${m.format(m.value(c, ctx.unit), interval)}; ${level} ${m.formatInterval(interval)}. ${m.method}.`,
    ];
  });
  rows.push(
    ["p (exact test against the rest of the fleet)", formatProbability(c.pValue)],
    [
      `q (false discovery rate across the ${c.kind === "wear" ? "wear" : "failure"} cells)`,
      formatProbability(c.qValue),
    ],
    [
      "Signal",
      c.isSignal
        ? "yes: q at most 0.05, the ratio's interval above 1 and at least 3 repairs"
        : "no (a signal needs q at most 0.05, the ratio's interval above 1 and at least 3 repairs)",
    ],
  );
  return rows;
}

/** A clause as a sentence: its first letter in capitals. */
export function sentence(clause: string): string {
  return clause ? `${clause[0]!.toUpperCase()}${clause.slice(1)}` : clause;
}
