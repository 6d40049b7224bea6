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
  const head =
    e < 1
      ? `about a ${formatPercent(1 - Math.exp(-e))} chance of ${/^[aeiou]/i.test(singular) ? "an" : "a"} ${singular}`
      : `about ${formatPlain(e)} ${e < 1.5 ? singular : (plural ?? `${singular}s`)}`;
  if (f.lower === null || f.lower === undefined || f.upper === null || f.upper === undefined)
    return head;
  return `${head} (likely ${formatPlain(f.lower)} to ${formatPlain(f.upper)})`;
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
