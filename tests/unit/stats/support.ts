/**
 * Helpers for the lib/stats tests: the jstat reference, seeded samplers and a relative
 * comparison. Not a test file itself (no .test.ts suffix).
 */
import jstat from "jstat";
import seedrandom from "seedrandom";
import { expect } from "vitest";

/** jstat 1.9.6, the independent reference library (statistics.md: agrees with SciPy to 7 s.f.). */
export const jStat = jstat.jStat;

/** A seeded uniform(0, 1) generator (Alea), so every simulated test gives the same draws. */
export function seededUniform(seed: string): () => number {
  const rng = seedrandom.alea(seed);
  return () => rng.double();
}

/** A seeded integer uniform on lo..hi inclusive. */
export function seededInteger(seed: string): (lo: number, hi: number) => number {
  const uniform = seededUniform(seed);
  return (lo, hi) => lo + Math.floor(uniform() * (hi - lo + 1));
}

/**
 * Sampler of a discrete distribution on 0..max by inversion of its CDF, the table built from
 * jstat's probabilities (independent of the code under test).
 */
export function inverseCdfSampler(
  probability: (k: number) => number,
  max: number,
  uniform: () => number,
): () => number {
  const cdf = new Float64Array(max + 1);
  let total = 0;
  for (let k = 0; k <= max; k++) {
    total += probability(k);
    cdf[k] = total;
  }
  return () => {
    const u = uniform() * total;
    let lo = 0;
    let hi = max;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (cdf[mid]! < u) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
}

export function binomialSampler(n: number, p: number, uniform: () => number): () => number {
  return inverseCdfSampler((k) => jStat.binomial.pdf(k, n, p), n, uniform);
}

/**
 * P(X = k) for X ~ Poisson(mean) as exp(k ln mean − mean − ln k!) with jStat.gammaln
 * (jStat.poisson.pdf overflows above a mean of about 150); ~1e-10 relative up to 10^5.
 */
export function poissonProbability(k: number, mean: number): number {
  return Math.exp(k * Math.log(mean) - mean - jStat.gammaln(k + 1));
}

/** P(X ≤ k) for X ~ Poisson(mean), summed term by term (terms below mean − 40√mean are nil). */
export function poissonCdfBySum(k: number, mean: number): number {
  let sum = 0;
  for (let j = Math.max(0, Math.floor(mean - 40 * Math.sqrt(mean) - 50)); j <= k; j++) {
    sum += poissonProbability(j, mean);
  }
  return sum;
}

export function poissonSampler(mean: number, uniform: () => number): () => number {
  const max = Math.ceil(mean + 12 * Math.sqrt(mean) + 20);
  return inverseCdfSampler((k) => poissonProbability(k, mean), max, uniform);
}

/** |actual − expected| ≤ tolerance·|expected| (relative tolerance); exact when expected is 0. */
export function expectRelativelyClose(
  actual: number,
  expected: number,
  tolerance: number,
  label = "",
): void {
  if (expected === 0 || !Number.isFinite(expected)) {
    expect(actual, label).toBe(expected);
    return;
  }
  const error = Math.abs(actual - expected) / Math.abs(expected);
  expect(error, `${label}: got ${actual}, expected ${expected}`).toBeLessThanOrEqual(tolerance);
}

/** |actual − expected| ≤ tolerance (absolute tolerance). */
export function expectAbsolutelyClose(
  actual: number,
  expected: number,
  tolerance: number,
  label = "",
): void {
  expect(
    Math.abs(actual - expected),
    `${label}: got ${actual}, expected ${expected}`,
  ).toBeLessThanOrEqual(tolerance);
}

/** Both limits of an interval within an absolute tolerance. */
export function expectLimits(
  result: { lower: number; upper: number },
  lower: number,
  upper: number,
  tolerance: number,
): void {
  expectAbsolutelyClose(result.lower, lower, tolerance, "lower");
  expectAbsolutelyClose(result.upper, upper, tolerance, "upper");
}

/** Print a line into the test output (figures that belong in the report, e.g. coverages). */
export function report(line: string): void {
  // eslint-disable-next-line no-console -- observed coverages are part of the test report
  console.log(line);
}
