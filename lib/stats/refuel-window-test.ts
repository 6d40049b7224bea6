import { median } from "simple-statistics";
import { binomialUpperTail, garwoodBounds } from "./internal/distributions";
import { assertNonNegativeFinite, assertPositiveFinite, fail } from "./internal/validate";

/** A dated-by-odometer record of one vehicle: a stall / no-start event or a fill-up. */
export interface OdometerEvent {
  /** Vehicle identifier, compared with === (so "12" and 12 are different vehicles). */
  vehicle: string | number;
  odometer: number;
}

export interface RefuelWindowResult {
  /** Events within windowMiles after the last fill-up. */
  observed: number;
  /** Expected number of such events if events had no link to refuelling. */
  expected: number;
  /** observed / expected */
  ratio: number;
  /** 95% limits of the ratio: exact Poisson (Garwood) limits on observed, divided by expected. */
  lower: number;
  upper: number;
  /** One-sided exact p-value P(X ≥ observed) under no link (see the doc comment). */
  pValue: number;
  /** Events left out: no fill-up in the previous 1,000 miles (or no way to judge the interval). */
  noFuelData: number;
}

/** Events further than this from the last fill-up are counted as having no fuel data. */
const LOOKBACK_MILES = 1000;
/** Above this many events the exact Poisson-binomial gives way to a binomial (see below). */
const EXACT_LIMIT = 20000;
/** Probabilities below this are dropped from the ends of the Poisson-binomial recursion. */
const NEGLIGIBLE = 1e-300;

/**
 * Do stalls / no-starts come more often within a few miles after a fill-up than chance would
 * give (a sign of contaminated or wrong fuel, or of a fuel-system fault triggered by filling)?
 *
 * Definition: for each event, d = miles since the vehicle's last fill-up at or before the
 * event's odometer, and I = the interval between that fill-up and the next one after the event.
 * The event is "in the window" when d ≤ W. With no link to refuelling, an event is equally
 * likely anywhere in its interval, so its chance of falling in the window is
 * πᵢ = min(1, W / I). Observed O = number of events in the window; expected E = Σ πᵢ.
 * When a vehicle has no fill-up after the event, I is taken as that vehicle's median
 * refuelling interval (median gap between its distinct fill-up odometers), or d if d is
 * longer (the interval cannot be shorter than the miles already driven); with fewer than two
 * fill-ups, the fleet's median interval (over all vehicles' gaps) is used instead.
 * Events with no fill-up in the previous 1,000 miles, and events whose interval cannot be
 * estimated at all (no fill-up gaps anywhere), are left out and counted in noFuelData.
 *
 * Test: under no link, O is a sum of independent Bernoulli(πᵢ): Poisson-binomial. The p-value
 * is one-sided, P(O' ≥ O), because the question is an excess of events after refuelling. It
 * is computed exactly by the Poisson-binomial recursion (O(n·width), trimming probabilities
 * below 1e-300 at the ends) for up to 20,000 events; above that a binomial with the mean chance
 * E/n is used, which has the same mean and a variance at least as large, so its p-value is
 * conservative.
 * Ratio O/E with limits L/E and U/E, where (L, U) is the exact Garwood 95% interval for a
 * Poisson count O: slightly conservative, as the Poisson-binomial varies less than a Poisson.
 * With no usable events, ratio is NaN (0/0), lower 0, upper Infinity and pValue 1.
 * Missing fill-up records widen intervals and shrink πᵢ: the test assumes fill-ups are complete.
 *
 * Sources: the window idea is common practice in fuel-quality investigations (stalls typically
 * show within about 20 miles of a fill-up); the test is the exact Poisson-binomial test
 * (Hong, Y. (2013), "On computing the distribution function for the Poisson binomial
 * distribution", Computational Statistics & Data Analysis 59:41–51, recursive method); the
 * interval is Garwood (1936), Biometrika 28:437–442.
 *
 * @param events stalls / no-starts: vehicle and odometer (finite ≥ 0)
 * @param fillUps fill-ups: vehicle and odometer (finite ≥ 0), any order
 * @param windowMiles W, finite > 0 (default 20)
 * @throws Error "refuelWindowTest: …" when events or fillUps are not arrays, an odometer is not
 *   a finite number ≥ 0, or windowMiles is not a finite number > 0
 * @example
 * refuelWindowTest(
 *   [{ vehicle: "A", odometer: 1010 }],
 *   [{ vehicle: "A", odometer: 1000 }, { vehicle: "A", odometer: 1400 }],
 * ); // observed 1, expected 0.05 (20/400), pValue 0.05
 */
export function refuelWindowTest(
  events: readonly OdometerEvent[],
  fillUps: readonly OdometerEvent[],
  windowMiles = 20,
): RefuelWindowResult {
  const fn = "refuelWindowTest";
  if (!Array.isArray(events)) fail(fn, "events must be an array");
  if (!Array.isArray(fillUps)) fail(fn, "fillUps must be an array");
  assertPositiveFinite(fn, "windowMiles", windowMiles);
  events.forEach((e, i) => assertNonNegativeFinite(fn, `events[${i}].odometer`, e?.odometer));
  fillUps.forEach((f, i) => assertNonNegativeFinite(fn, `fillUps[${i}].odometer`, f?.odometer));

  // Each vehicle's distinct fill-up odometers, ascending, and the gaps between them.
  const fillUpsByVehicle = new Map<string | number, number[]>();
  for (const { vehicle, odometer } of fillUps) {
    const list = fillUpsByVehicle.get(vehicle);
    if (list) list.push(odometer);
    else fillUpsByVehicle.set(vehicle, [odometer]);
  }
  const medianGap = new Map<string | number, number>();
  const allGaps: number[] = [];
  for (const [vehicle, list] of fillUpsByVehicle) {
    const sorted = [...new Set(list)].sort((a, b) => a - b);
    fillUpsByVehicle.set(vehicle, sorted);
    const gaps = sorted.slice(1).map((odometer, i) => odometer - sorted[i]!);
    if (gaps.length > 0) medianGap.set(vehicle, median(gaps));
    allGaps.push(...gaps);
  }
  const fleetGap = allGaps.length > 0 ? median(allGaps) : undefined;

  let observed = 0;
  let noFuelData = 0;
  const chances: number[] = [];
  for (const { vehicle, odometer } of events) {
    const sorted = fillUpsByVehicle.get(vehicle) ?? [];
    const next = firstAbove(sorted, odometer);
    const last = next > 0 ? sorted[next - 1]! : undefined;
    if (last === undefined || odometer - last > LOOKBACK_MILES) {
      noFuelData++;
      continue;
    }
    const since = odometer - last;
    const typicalGap = medianGap.get(vehicle) ?? fleetGap;
    const interval =
      next < sorted.length
        ? sorted[next]! - last
        : typicalGap === undefined
          ? undefined
          : Math.max(typicalGap, since);
    if (interval === undefined) {
      noFuelData++;
      continue;
    }
    chances.push(Math.min(1, windowMiles / interval));
    if (since <= windowMiles) observed++;
  }

  const expected = chances.reduce((sum, p) => sum + p, 0);
  if (chances.length === 0) {
    return { observed, expected, ratio: NaN, lower: 0, upper: Infinity, pValue: 1, noFuelData };
  }
  const pValue =
    chances.length <= EXACT_LIMIT
      ? poissonBinomialUpperTail(chances, observed)
      : binomialUpperTail(observed, chances.length, expected / chances.length);
  const limits = garwoodBounds(observed, 0.95);
  return {
    observed,
    expected,
    ratio: observed / expected,
    lower: limits.lower / expected,
    upper: limits.upper / expected,
    pValue: Math.min(1, pValue),
    noFuelData,
  };
}

/** Index of the first element of an ascending array that is > value (its length if none). */
function firstAbove(sorted: readonly number[], value: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid]! <= value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** P(S ≥ k) for S a sum of independent Bernoulli(pᵢ), by the exact recursion. */
function poissonBinomialUpperTail(chances: readonly number[], k: number): number {
  // dist[j - offset] = P(S = j) over the window of j that still carries probability.
  let dist = new Float64Array([1]);
  let offset = 0;
  for (const p of chances) {
    const next = new Float64Array(dist.length + 1);
    for (let j = 0; j < dist.length; j++) {
      next[j] = next[j]! + dist[j]! * (1 - p);
      next[j + 1] = dist[j]! * p;
    }
    let start = 0;
    let end = next.length;
    while (start < end - 1 && next[start]! < NEGLIGIBLE) start++;
    while (end - 1 > start && next[end - 1]! < NEGLIGIBLE) end--;
    dist = next.subarray(start, end);
    offset += start;
  }
  let tail = 0;
  for (let j = Math.max(0, k - offset); j < dist.length; j++) tail += dist[j]!;
  return tail;
}
