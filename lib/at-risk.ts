import { median as ssMedian } from "simple-statistics";

/** The watch-list's default horizon: the next 10,000 of the organisation's unit (mi or km). */
export const AT_RISK_HORIZON = 10_000;

/**
 * Expected failures of one fault over the next miles a vehicle drives: the cohort's rate per
 * mile in each mileage band, times the miles the vehicle will spend in that band (the
 * piecewise-constant rate of the cohort × band cells; a Poisson process, statistics.md §2).
 */
export function expectedFailures(
  odometerMi: number,
  nextMiles: number,
  bandWidthMi: number,
  ratePerMileByBand: ReadonlyMap<number, number>,
): number {
  if (!(nextMiles > 0) || !(bandWidthMi > 0)) return 0;
  let total = 0;
  let at = Math.max(0, odometerMi);
  const end = at + nextMiles;
  while (at < end) {
    const band = Math.floor(at / bandWidthMi);
    const to = Math.min(end, (band + 1) * bandWidthMi);
    total += (ratePerMileByBand.get(band) ?? 0) * (to - at);
    at = to;
  }
  return total;
}

/** The median of some numbers (0 for none); simple-statistics' median throws on none. */
export function median(values: number[]): number {
  return values.length === 0 ? 0 : ssMedian(values);
}
