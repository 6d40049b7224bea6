import { median as ssMedian } from "simple-statistics";
import { gammaSumInterval } from "@/lib/stats";

/** The watch-list's default horizon: the next 10,000 of the organisation's unit (mi or km). */
export const AT_RISK_HORIZON = 10_000;

/** How the watch-list's figures are worked out, for their details. */
export const AT_RISK_METHOD =
  "Expected failures: the cohort's rate in each mileage band (its shrunk estimate) × the miles the vehicle will drive in that band. Interval: the rates' gamma posteriors, summed over those bands. Chance of at least one: 1 − e^−expected (Poisson).";

/** The miles a vehicle will drive in each mileage band over its next `nextMiles`. */
export function milesByBand(
  odometerMi: number,
  nextMiles: number,
  bandWidthMi: number,
): [band: number, miles: number][] {
  if (!(nextMiles > 0) || !(bandWidthMi > 0)) return [];
  const out: [number, number][] = [];
  let at = Math.max(0, odometerMi);
  const end = at + nextMiles;
  while (at < end) {
    const band = Math.floor(at / bandWidthMi);
    const to = Math.min(end, (band + 1) * bandWidthMi);
    out.push([band, to - at]);
    at = to;
  }
  return out;
}

/**
 * Expected failures of one fault over the next miles a vehicle drives: the cohort's rate per
 * mile in each mileage band, times the miles the vehicle will spend in that band (the
 * piecewise-constant rate of the cohort × band cells; a Poisson process, statistics.md §2).
 */
export function expectedFailures(
  /** The miles ahead by band (milesByBand). */
  miles: readonly (readonly [band: number, miles: number])[],
  ratePerMileByBand: ReadonlyMap<number, number>,
): number {
  return miles.reduce(
    (total, [band, miles]) => total + (ratePerMileByBand.get(band) ?? 0) * miles,
    0,
  );
}

/** A band's rate as its gamma posterior (cell_stats.posterior_shape / posterior_exposure_mi). */
export type BandPosterior = { shape: number; exposureMi: number };

/**
 * The interval of expectedFailures when each band's rate is its gamma posterior (the shrunk
 * rate is the posterior mean): the sum over bands of miles × rate, by gammaSumInterval. A band
 * the vehicle drives through with no posterior counts as no failures, as in expectedFailures.
 */
export function expectedFailuresInterval(
  /** The miles ahead by band (milesByBand). */
  miles: readonly (readonly [band: number, miles: number])[],
  posteriorByBand: ReadonlyMap<number, BandPosterior>,
  confidence: number,
): { lower: number; upper: number } {
  const terms = miles.flatMap(([band, miles]) => {
    const p = posteriorByBand.get(band);
    return p ? [{ shape: p.shape, rate: p.exposureMi, weight: miles }] : [];
  });
  const { lower, upper } = gammaSumInterval(terms, confidence);
  return { lower, upper };
}

/** The median of some numbers (0 for none); simple-statistics' median throws on none. */
export function median(values: number[]): number {
  return values.length === 0 ? 0 : ssMedian(values);
}
