import { garwoodBounds } from "./internal/distributions";
import {
  assertConfidence,
  assertNonNegativeInteger,
  assertPositiveFinite,
} from "./internal/validate";

/** A rate (events per unit of exposure) with its confidence limits. */
export interface RateInterval {
  /** events / exposure */
  rate: number;
  lower: number;
  upper: number;
}

/**
 * Exact (Garwood) confidence interval for a Poisson rate: failures per unit of exposure
 * (miles, vehicle-years, hours).
 *
 * Definition: for a count x, L = χ²(α/2; 2x)/2 and U = χ²(1 − α/2; 2x + 2)/2 (L = 0 when x = 0),
 * the inversion of the two one-sided exact Poisson tests; the rate limits are L/T and U/T for
 * exposure T. Coverage is at least the nominal level for every true rate.
 *
 * Method: χ²(p; 2k)/2 is the Gamma(k, 1) quantile; it starts from
 * @stdlib/stats-base-dists-gamma-quantile and, above 100 events, is polished by Newton steps on
 * exact Poisson sums, because @stdlib's incomplete gamma loses accuracy there (internal/gamma.ts).
 *
 * Sources: Garwood, F. (1936), "Fiducial limits for the Poisson distribution", Biometrika
 * 28:437–442; NIST/SEMATECH e-Handbook of Statistical Methods §8.4.5.1 (the same bounds as
 * MTBF limits for a time-truncated test).
 *
 * @param events integer ≥ 0
 * @param exposure finite number > 0 (default 1: the interval is then for the count)
 * @param confidence two-sided confidence level, 0 < confidence < 1 (default 0.95)
 * @throws Error "poissonInterval: …" when events is not a non-negative integer, exposure is
 *   not a finite number > 0 (zero exposure is an error, not a zero rate), or confidence is
 *   outside (0, 1)
 * @example
 * poissonInterval(14, 400); // { rate: 0.035, lower: 0.019135, upper: 0.058724 }
 */
export function poissonInterval(events: number, exposure = 1, confidence = 0.95): RateInterval {
  const fn = "poissonInterval";
  assertNonNegativeInteger(fn, "events", events);
  assertPositiveFinite(fn, "exposure", exposure);
  assertConfidence(fn, confidence);

  const { lower, upper } = garwoodBounds(events, confidence);
  return { rate: events / exposure, lower: lower / exposure, upper: upper / exposure };
}
