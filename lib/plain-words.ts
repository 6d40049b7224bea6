/**
 * Figures in the words a mechanic or a fleet manager reads first: a count and its denominator,
 * a percentage, and "likely between …" for the interval; the method, p and q sit one click away
 * (FigureDetails). Pure, shared by server pages, client components, mail and exports.
 *
 * "Likely" stands for the organisation's confidence level (80–99%); the details and the column
 * headers name the level itself ("90% interval").
 */
import { milesToUnit } from "./units";

const whole = new Intl.NumberFormat("en-GB", { maximumFractionDigits: 0 });

/** A share as a percentage people read: "38%", "0.4%" below 1%, "under 0.1%", "100%". */
export function formatPercent(share: number | null | undefined): string {
  if (share === null || share === undefined || !Number.isFinite(share)) return "—";
  const pct = share * 100;
  if (pct === 0) return "0%";
  if (pct < 0.1) return "under 0.1%";
  if (pct < 1) return `${pct.toFixed(1)}%`;
  if (pct > 99 && pct < 100) return `${pct.toFixed(1)}%`;
  return `${whole.format(pct)}%`;
}

/** A count with its noun: "1 repair", "34 repairs", "1 vehicle". */
export function countOf(n: number, singular: string, plural = `${singular}s`): string {
  return `${whole.format(n)} ${n === 1 ? singular : plural}`;
}

/**
 * A number for running text, to two significant figures below 10 and whole above, never in
 * exponent form: 5.2, 0.35, 0.053, 12, 6,300; "under 0.001" for less.
 */
export function formatPlain(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  const abs = Math.abs(value);
  if (abs === 0) return "0";
  if (abs >= 9.95) return whole.format(Math.round(value));
  if (abs < 0.001) return "under 0.001";
  return String(Number(value.toPrecision(2)));
}

/**
 * "34 of 89 repairs (38%), likely between 29% and 49%": a count out of its denominator, the
 * share, and its interval at the organisation's confidence. Without trials: "no repairs yet".
 */
export function describeShare(f: {
  count: number;
  of: number;
  lower: number | null;
  upper: number | null;
  noun: [singular: string, plural?: string];
}): string {
  const [singular, plural] = f.noun;
  if (f.of <= 0) return `no ${plural ?? `${singular}s`} yet`;
  const head = `${whole.format(f.count)} of ${countOf(f.of, singular, plural)} (${formatPercent(f.count / f.of)})`;
  if (f.lower === null || f.upper === null) return head;
  return `${head}, likely between ${formatPercent(f.lower)} and ${formatPercent(f.upper)}`;
}

/** "about 6 times", "about half", "about the same as" for a ratio. */
function timesWords(ratio: number): string {
  if (ratio >= 0.9 && ratio <= 1.1) return "about the same as";
  if (ratio < 1) {
    if (ratio >= 0.45 && ratio <= 0.55) return "about half";
    if (ratio >= 0.3 && ratio < 0.36) return "about a third of";
    if (ratio >= 0.22 && ratio < 0.28) return "about a quarter of";
    return `about ${formatPlain(ratio)} times`;
  }
  return `about ${formatPlain(ratio)} times`;
}

/**
 * A rate ratio against the rest of the fleet in the same band, in words:
 * - "about 6 times the rest of the fleet, at least 5.2 times";
 * - "about 1.4 times the rest of the fleet; could be chance (from 0.8 times)" when the interval
 *   reaches below 1;
 * - "no repairs of this in the rest of the fleet in this band" (+ ", at least 28 times its rate")
 *   instead of an infinite ratio;
 * - "none here, and none in the rest of the fleet in this band" when both are zero.
 * `lower`/`upper` are the interval at the organisation's confidence.
 */
export function describeRatio(f: {
  ratio: number | null;
  lower: number | null;
  upper: number | null;
  events: number;
}): string {
  const rest = "the rest of the fleet";
  if (f.ratio === null || !Number.isFinite(f.ratio)) {
    if (f.events === 0) return `none here, and none in ${rest} in this band`;
    const atLeast =
      f.lower !== null && Number.isFinite(f.lower) && f.lower > 1
        ? `, at least ${formatPlain(f.lower)} times its rate`
        : "";
    return `no repairs of this in ${rest} in this band${atLeast}`;
  }
  if (f.events === 0) return `none here against some in ${rest}`;
  const head = `${timesWords(f.ratio)} ${rest}`;
  if (f.lower !== null && f.lower > 1) return `${head}, at least ${formatPlain(f.lower)} times`;
  if (f.upper !== null && Number.isFinite(f.upper) && f.upper < 1)
    return `${head}, at most ${formatPlain(f.upper)} times`;
  return `${head}; could be chance (likely between ${formatPlain(f.lower ?? 0)} and ${
    f.upper === null || !Number.isFinite(f.upper) ? "many" : formatPlain(f.upper)
  } times)`;
}

/**
 * A rate per 10,000 of the organisation's unit, with its denominator: "12 repairs in 340,000 mi
 * driven: about 0.35 per 10,000 mi, likely between 0.18 and 0.61". Rates come per 10,000 mi.
 */
export function describeRate(f: {
  events: number;
  exposureMi: number;
  ratePer10kMi: number | null;
  lowerPer10kMi: number | null;
  upperPer10kMi: number | null;
  unit: "mi" | "km";
  noun?: [singular: string, plural?: string];
}): string {
  const [singular, plural] = f.noun ?? ["repair"];
  const driven = `${whole.format(milesToUnit(f.exposureMi, f.unit))} ${f.unit} driven`;
  const head = `${countOf(f.events, singular, plural)} in ${driven}`;
  if (f.ratePer10kMi === null) return head;
  const per = (v: number) => formatPlain(perTenThousand(v, f.unit));
  const rate = `about ${per(f.ratePer10kMi)} per 10,000 ${f.unit}`;
  if (f.lowerPer10kMi === null || f.upperPer10kMi === null) return `${head}: ${rate}`;
  return `${head}: ${rate}, likely between ${per(f.lowerPer10kMi)} and ${per(f.upperPer10kMi)}`;
}

/** A rate per 10,000 mi as per 10,000 of the unit. */
export function perTenThousand(ratePer10kMi: number, unit: "mi" | "km"): number {
  return unit === "km" ? ratePer10kMi / 1.609344 : ratePer10kMi;
}

/**
 * An expected count in words. Below one, the chance of at least one (Poisson: 1 − e^−λ) says
 * more than "0.48 expected failures": "about a 38% chance of a failure"; from one up, "about 3
 * failures"; with its interval "likely 1 to 6" when given.
 */
export function describeExpected(f: {
  expected: number;
  lower?: number | null;
  upper?: number | null;
  noun: [singular: string, plural?: string];
}): string {
  const [singular, plural] = f.noun;
  const e = f.expected;
  if (!Number.isFinite(e) || e <= 0) return `no ${plural ?? `${singular}s`} expected`;
  const what = `${/^[aeiou]/i.test(singular) ? "an" : "a"} ${singular}`;
  const chance = 1 - Math.exp(-e);
  const pct = formatPercent(chance);
  const head =
    e >= 1
      ? `about ${formatPlain(e)} ${e < 1.5 ? singular : (plural ?? `${singular}s`)}`
      : chance < 0.001
        ? `under a 0.1% chance of ${what}`
        : `about ${articleFor(pct)} ${pct} chance of ${what}`;
  if (f.lower === null || f.lower === undefined || f.upper === null || f.upper === undefined)
    return head;
  return `${head} (likely ${formatPlain(f.lower)} to ${formatPlain(f.upper)})`;
}

/** "a" or "an" before a percentage as it is read aloud: "an 8%", "an 11%", "a 38%". */
function articleFor(percent: string): "a" | "an" {
  return /^(8|11(?![\d])|18(?![\d]))/.test(percent) ? "an" : "a";
}

/**
 * An expected count over a horizon with its interval, read one way: below one, the chance of at
 * least one (Poisson: 1 − e^−λ) with its likely range as chances too ("about a 38% chance of a
 * failure, likely between 18% and 50%": 1 − e^−λ rises with λ, so each bound maps to a bound;
 * "under a 0.1% chance …", "likely under 2%" at the small end); from one up, as describeExpected
 * ("about 3.2 failures (likely 1.1 to 6.4)").
 */
export function describeOutlook(f: {
  expected: number;
  lower: number | null;
  upper: number | null;
  noun: [singular: string, plural?: string];
}): string {
  const e = f.expected;
  if (!(e > 0) || e >= 1) return describeExpected(f);
  const [singular] = f.noun;
  const chanceOf = (l: number) => 1 - Math.exp(-Math.max(0, l));
  const what = `${/^[aeiou]/i.test(singular) ? "an" : "a"} ${singular}`;
  const p = chanceOf(e);
  const pct = formatPercent(p);
  const head =
    p < 0.001
      ? `under a 0.1% chance of ${what}`
      : `about ${articleFor(pct)} ${pct} chance of ${what}`;
  if (f.lower === null || f.upper === null) return head;
  const [lo, hi] = [chanceOf(f.lower), chanceOf(f.upper)];
  if (hi < 0.001) return head;
  if (lo < 0.001) return `${head}, likely under ${formatPercent(hi)}`;
  return `${head}, likely between ${formatPercent(lo)} and ${formatPercent(hi)}`;
}

/**
 * Events counted against what chance predicts (the post-refuel test), in words:
 * "about 6.7 times what chance predicts, at least 3.9 times"; "about 1.3 times what chance
 * predicts; could be chance (likely between 0.6 and 2.4 times)"; "none, against about 2.1 by
 * chance". `lower`/`upper`: the ratio's interval at the organisation's confidence.
 */
export function describeAgainstChance(f: {
  observed: number;
  expected: number;
  lower: number | null;
  upper: number | null;
}): string {
  if (!(f.expected > 0)) return "nothing measured to set against chance";
  if (f.observed === 0) return `none, against about ${formatPlain(f.expected)} by chance`;
  const ratio = f.observed / f.expected;
  const head =
    ratio >= 0.9 && ratio <= 1.1
      ? "about what chance predicts"
      : `about ${formatPlain(ratio)} times what chance predicts`;
  if (f.lower !== null && f.lower > 1) return `${head}, at least ${formatPlain(f.lower)} times`;
  if (f.upper !== null && Number.isFinite(f.upper) && f.upper < 1)
    return `${head}, at most ${formatPlain(f.upper)} times`;
  const upper = f.upper === null || !Number.isFinite(f.upper) ? "many" : formatPlain(f.upper);
  return `${head}; could be chance (likely between ${formatPlain(f.lower ?? 0)} and ${upper} times)`;
}

/** How a cohort × band × fault cell's figures are worked out, for its details. */
export const CELL_METHOD =
  "Rate: exact Poisson (Garwood) interval. Ratio: exact conditional test against the rest of the fleet in the same band (Przyborowski & Wilenski), with Clopper–Pearson limits. q: Benjamini–Hochberg false-discovery control across all cells.";

/**
 * The exact figures of a cohort × band × fault cell for a FigureDetails disclosure: the rate per
 * 10,000 of the organisation's unit and the ratio with their intervals, p, q and the method.
 * Rates come per 10,000 mi.
 */
export function cellFigureRows(
  c: {
    ratePer10kMi: number | null;
    rateLower: number | null;
    rateUpper: number | null;
    ratio: number | null;
    ratioLower: number | null;
    ratioUpper: number | null;
    pValue: number | null;
    qValue: number | null;
  },
  confidence: number,
  unit: "mi" | "km",
): [label: string, value: string][] {
  const level = intervalLabel(confidence);
  const per = (v: number | null) => (v === null ? "—" : formatPlain(perTenThousand(v, unit)));
  return [
    [
      `Rate per 10,000 ${unit}`,
      `${per(c.ratePer10kMi)} (${level}: ${per(c.rateLower)} to ${per(c.rateUpper)})`,
    ],
    [
      "Rate ratio, against the rest of the fleet",
      `${c.ratio === null || !Number.isFinite(c.ratio) ? "not finite: no repairs of this in the rest of the fleet" : formatPlain(c.ratio)} (${level}: ${formatRange(c.ratioLower, c.ratioUpper)})`,
    ],
    ["p (exact test of the ratio)", formatProbability(c.pValue)],
    ["q (false-discovery rate)", formatProbability(c.qValue)],
    ["Method", CELL_METHOD],
  ];
}

/** The interval's name for headers and details: "90% interval". */
export function intervalLabel(confidence: number): string {
  return `${formatConfidence(confidence)} interval`;
}

/** A confidence level as people write it: 0.9 → "90%", 0.95 → "95%", 0.995 → "99.5%". */
export function formatConfidence(confidence: number): string {
  const pct = Math.round(confidence * 1000) / 10;
  return `${pct}%`;
}

/**
 * A p- or q-value for the details: "0.042", "0.0013", "below 0.0001" (never "2.7e-38"), "1".
 */
export function formatProbability(p: number | null | undefined): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return "not tested";
  if (p < 0.0001) return "below 0.0001";
  if (p >= 0.9995) return "1";
  if (p >= 0.01) return p.toFixed(3).replace(/0+$/, "").replace(/\.$/, "");
  return p.toPrecision(2);
}

/** An exact interval for the details: "4.5 to 42", "28 to no upper limit". */
export function formatRange(lower: number | null, upper: number | null): string {
  const hi = upper === null || !Number.isFinite(upper) ? "no upper limit" : formatPlain(upper);
  return `${formatPlain(lower ?? 0)} to ${hi}`;
}

/** A fault as people name it, for any screen: a DTC with its description, or system → part. */
export function faultName(f: {
  dtc?: string | null;
  dtcDescription?: string | null;
  componentSystem?: string | null;
  componentName?: string | null;
  /** The fault key, used only when nothing better is known. */
  faultKey?: string | null;
}): string {
  if (f.dtc) return f.dtcDescription ? `${f.dtc} — ${f.dtcDescription}` : f.dtc;
  if (f.componentName)
    return f.componentSystem ? `${f.componentSystem} → ${f.componentName}` : f.componentName;
  if (f.faultKey === "all") return "All failures";
  if (f.faultKey === "all:wear") return "All wear";
  const key = f.faultKey ?? "";
  if (key.startsWith("dtc:")) return key.slice(4);
  // A slug without its catalogue entry: its words, not its punctuation.
  const slug = key.replace(/^component:|^service:/, "");
  const [system, part] = slug.split("/");
  const words = (s: string) => s.replaceAll("-", " ").replace(/^./, (c) => c.toUpperCase());
  return part ? `${words(system ?? "")} → ${words(part)}` : slug ? words(slug) : "Unknown fault";
}

/**
 * A wear cell's rate ratio in words: wear is a pattern only when it comes early, so it reads as
 * wearing out sooner (or later) than on the rest of the fleet in the same band:
 * - "wears out sooner than on the rest of the fleet: about 2.1 times as often, at least 1.4 times";
 * - "wears out later than on the rest of the fleet: about half as often, at most 0.8 times";
 * - "may wear out sooner than on the rest of the fleet: about 1.2 times as often, but it could be
 *   chance (likely between 0.8 and 1.9 times)" when the interval reaches across 1;
 * - "no wear repairs of this in the rest of the fleet in this band" (+ ", at least 28 times its
 *   rate") instead of an infinite ratio.
 */
export function describeWearRatio(f: {
  ratio: number | null;
  lower: number | null;
  upper: number | null;
  events: number;
}): string {
  const rest = "the rest of the fleet";
  if (f.ratio === null || !Number.isFinite(f.ratio)) {
    if (f.events === 0) return `no wear repairs here, and none in ${rest} in this band`;
    const atLeast =
      f.lower !== null && Number.isFinite(f.lower) && f.lower > 1
        ? `, at least ${formatPlain(f.lower)} times its rate`
        : "";
    return `no wear repairs of this in ${rest} in this band${atLeast}`;
  }
  if (f.events === 0) return `no wear repairs here against some in ${rest}`;
  const times = timesWords(f.ratio).replace(/ of$/, "");
  const often = times === "about the same as" ? "about as often" : `${times} as often`;
  if (f.lower !== null && f.lower > 1)
    return `wears out sooner than on ${rest}: ${often}, at least ${formatPlain(f.lower)} times`;
  if (f.upper !== null && Number.isFinite(f.upper) && f.upper < 1)
    return `wears out later than on ${rest}: ${often}, at most ${formatPlain(f.upper)} times`;
  const range = `likely between ${formatPlain(f.lower ?? 0)} and ${
    f.upper === null || !Number.isFinite(f.upper) ? "many" : formatPlain(f.upper)
  } times`;
  if (times === "about the same as") return `wears out about as often as on ${rest} (${range})`;
  const way = f.ratio > 1 ? "sooner" : "later";
  return `may wear out ${way} than on ${rest}: ${often}, but it could be chance (${range})`;
}
