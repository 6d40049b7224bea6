import { binomialTestTwoSided, clopperPearsonBounds } from "./internal/distributions";
import {
  assertConfidence,
  assertNonNegativeInteger,
  assertPositiveFinite,
} from "./internal/validate";

/** Ratio of two Poisson rates with exact limits and an exact two-sided p-value. */
export interface RateRatioResult {
  /** (eventsA / exposureA) / (eventsB / exposureB) */
  ratio: number;
  lower: number;
  upper: number;
  /** Two-sided exact p-value for H0: ratio = 1. */
  pValue: number;
}

/**
 * Ratio of the failure rate of group A (a cell) to that of group B (the rest of the fleet),
 * with an exact conditional confidence interval and p-value.
 *
 * Definition: with xA events in exposure TA and xB in TB, condition on n = xA + xB. Then
 * xA ~ Binomial(n, π) with π = ρTA / (ρTA + TB), ρ the rate ratio. Clopper–Pearson limits
 * pL, pU on π give ratio limits p/(1 − p) · TB/TA. The p-value is the exact binomial test of
 * π0 = TA / (TA + TB), two-sided by R's binom.test convention: the sum of the probabilities of
 * all outcomes no more likely than the observed one (with relative tolerance 1 + 1e-7). This
 * is what R's poisson.test reports for two samples.
 *
 * Method: beta quantiles and binomial probabilities from @stdlib; the outcomes on the far side
 * of the mean are counted by bisection, so 10⁶ events are fast.
 *
 * Sources: Przyborowski, J. & Wilenski, H. (1940), "Homogeneity of results in testing samples
 * from Poisson series", Biometrika 31:313–323 (conditional test); Clopper & Pearson (1934);
 * R Core Team, stats::poisson.test and stats::binom.test.
 *
 * Degenerate cases: eventsB = 0 gives ratio = Infinity (if eventsA > 0) and upper = Infinity;
 * eventsA = 0 gives ratio = 0 and lower = 0; with no events at all the ratio is NaN (0/0, no
 * information), lower = 0, upper = Infinity and pValue = 1, as in R.
 *
 * @param eventsA integer ≥ 0
 * @param exposureA finite number > 0
 * @param eventsB integer ≥ 0
 * @param exposureB finite number > 0
 * @param confidence two-sided confidence level, 0 < confidence < 1 (default 0.95)
 * @throws Error "rateRatio: …" when a count is not a non-negative integer, an exposure is not a
 *   finite number > 0, or confidence is outside (0, 1)
 * @example
 * rateRatio(10, 20000, 2, 17887); // { ratio: 4.47175, lower: 0.95295, upper: 41.9744, pValue: 0.0421 }
 */
export function rateRatio(
  eventsA: number,
  exposureA: number,
  eventsB: number,
  exposureB: number,
  confidence = 0.95,
): RateRatioResult {
  const fn = "rateRatio";
  assertNonNegativeInteger(fn, "eventsA", eventsA);
  assertPositiveFinite(fn, "exposureA", exposureA);
  assertNonNegativeInteger(fn, "eventsB", eventsB);
  assertPositiveFinite(fn, "exposureB", exposureB);
  assertConfidence(fn, confidence);

  const n = eventsA + eventsB;
  if (n === 0) return { ratio: NaN, lower: 0, upper: Infinity, pValue: 1 };

  const exposureScale = exposureB / exposureA;
  const toRatio = (p: number): number => (p >= 1 ? Infinity : (p / (1 - p)) * exposureScale);
  const bounds = clopperPearsonBounds(eventsA, n, confidence);
  const ratio = eventsB === 0 ? Infinity : (eventsA / eventsB) * exposureScale;
  const nullShare = exposureA / (exposureA + exposureB);
  return {
    ratio,
    lower: toRatio(bounds.lower),
    upper: toRatio(bounds.upper),
    pValue: binomialTestTwoSided(eventsA, n, nullShare),
  };
}
