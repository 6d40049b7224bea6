/**
 * Distribution quantiles and tail probabilities shared by lib/stats, in one place so that every
 * interval uses the same, tested numerical routines (the @stdlib/stats-base-dists-* packages).
 * simple-statistics' probit is not used: it is off in the 4th decimal (see statistics.md).
 * Internal: not re-exported from lib/stats/index.ts; callers validate their inputs first.
 */
import betaQuantile from "@stdlib/stats-base-dists-beta-quantile";
import binomialCdf from "@stdlib/stats-base-dists-binomial-cdf";
import binomialPmf from "@stdlib/stats-base-dists-binomial-pmf";
import normalQuantile from "@stdlib/stats-base-dists-normal-quantile";
import { gammaQuantile, lowerRegularizedGamma, upperRegularizedGamma } from "./gamma";

export { gammaQuantile };

export interface Bounds {
  lower: number;
  upper: number;
}

/** Lower and upper tail probabilities of a two-sided interval: (1 − c)/2 and 1 − (1 − c)/2. */
export function tailProbabilities(confidence: number): Bounds {
  const alphaHalf = (1 - confidence) / 2;
  return { lower: alphaHalf, upper: 1 - alphaHalf };
}

/** Φ⁻¹(p), the standard normal quantile. */
export function standardNormalQuantile(p: number): number {
  return normalQuantile(p, 0, 1);
}

/** z = Φ⁻¹(1 − α/2): 1.959964 at 95%. */
export function twoSidedZ(confidence: number): number {
  return standardNormalQuantile(tailProbabilities(confidence).upper);
}

/**
 * Clopper–Pearson bounds for x successes in n trials: L = B⁻¹(α/2; x, n−x+1),
 * U = B⁻¹(1−α/2; x+1, n−x); L = 0 when x = 0 and U = 1 when x = n.
 */
export function clopperPearsonBounds(x: number, n: number, confidence: number): Bounds {
  const tails = tailProbabilities(confidence);
  const lower = x === 0 ? 0 : betaQuantile(tails.lower, x, n - x + 1);
  const upper = x === n ? 1 : betaQuantile(tails.upper, x + 1, n - x);
  return { lower, upper };
}

/**
 * Garwood (1936) exact bounds on a Poisson mean from a count x: L = χ²(α/2; 2x)/2,
 * U = χ²(1−α/2; 2x+2)/2; L = 0 when x = 0. χ²(p; 2k)/2 is the Gamma(k, 1) quantile, which is
 * how they are computed (see ./gamma.ts for why not @stdlib's chi-square quantile).
 */
export function garwoodBounds(x: number, confidence: number): Bounds {
  const tails = tailProbabilities(confidence);
  const lower = x === 0 ? 0 : gammaQuantile(tails.lower, x, 1);
  const upper = gammaQuantile(tails.upper, x + 1, 1);
  return { lower, upper };
}

/** P(D ≤ k) for D ~ Poisson(mean): Q(k + 1, mean). */
export function poissonLowerTail(k: number, mean: number): number {
  if (k < 0) return 0;
  if (mean === 0) return 1;
  return upperRegularizedGamma(k + 1, mean);
}

/** P(D ≥ k) for D ~ Poisson(mean): P(k, mean), with the upper tail's own relative precision. */
export function poissonUpperTail(k: number, mean: number): number {
  if (k <= 0) return 1;
  if (mean === 0) return 0;
  return lowerRegularizedGamma(k, mean);
}

/** P(X ≤ x) for X ~ Binomial(n, p); 0 for x < 0. */
export function binomialLowerTail(x: number, n: number, p: number): number {
  return x < 0 ? 0 : binomialCdf(x, n, p);
}

/**
 * P(X ≥ x) for X ~ Binomial(n, p), computed as P(n − X ≤ n − x) with n − X ~ Binomial(n, 1 − p)
 * so that small upper tails keep their relative precision (1 − cdf would round them to 0).
 */
export function binomialUpperTail(x: number, n: number, p: number): number {
  if (x <= 0) return 1;
  if (x > n) return 0;
  return binomialCdf(n - x, n, 1 - p);
}

/** Relative tolerance R's binom.test uses when comparing probabilities with the observed one. */
const RELATIVE_TOLERANCE = 1 + 1e-7;

/**
 * Two-sided exact binomial test p-value with R's binom.test convention: the sum of P(X = i) over
 * all i whose probability is at most the observed P(X = x) × (1 + 1e-7).
 *
 * The probabilities on the far side of the mean are monotone (the mode lies between floor(np)
 * and ceil(np)), so the number of qualifying outcomes there is found by bisection: O(log n)
 * evaluations, which keeps 10⁶-event inputs fast.
 */
export function binomialTestTwoSided(x: number, n: number, p: number): number {
  const mean = n * p;
  if (x === mean) return 1;
  const limit = binomialPmf(x, n, p) * RELATIVE_TOLERANCE;
  let pValue: number;
  if (x < mean) {
    // Outcomes ceil(mean)..n: probabilities non-increasing; find the first one ≤ limit.
    let lo = Math.ceil(mean);
    let hi = n + 1;
    while (lo < hi) {
      const mid = Math.floor((lo + hi) / 2);
      if (binomialPmf(mid, n, p) <= limit) hi = mid;
      else lo = mid + 1;
    }
    // Outcomes lo..n qualify.
    pValue = binomialLowerTail(x, n, p) + binomialUpperTail(lo, n, p);
  } else {
    // Outcomes 0..floor(mean): probabilities non-decreasing; find the first one > limit.
    let lo = 0;
    let hi = Math.floor(mean) + 1;
    while (lo < hi) {
      const mid = Math.floor((lo + hi) / 2);
      if (binomialPmf(mid, n, p) > limit) hi = mid;
      else lo = mid + 1;
    }
    // Outcomes 0..lo−1 qualify.
    pValue = binomialLowerTail(lo - 1, n, p) + binomialUpperTail(x, n, p);
  }
  return Math.min(1, pValue);
}
