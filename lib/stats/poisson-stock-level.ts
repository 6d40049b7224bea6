import { poissonLowerTail, standardNormalQuantile } from "./internal/distributions";
import { assertConfidence, assertNonNegativeFinite } from "./internal/validate";

/**
 * Parts stock level: the smallest stock s that covers the demand over lead time + review
 * period with at least the target probability, when demand is Poisson.
 *
 * Definition: s = min{ s ≥ 0 : P(D ≤ s) ≥ serviceLevel }, D ~ Poisson(mean).
 * For the newsvendor (single period) the service level is Cs / (Cs + Ce), with Cs the cost
 * of a shortage and Ce the cost of an excess unit. The cautious option is to pass the upper
 * confidence bound of the demand rate as the mean.
 *
 * Method: start at the normal approximation mean + z·√mean and step down or up with the
 * Poisson CDF (the regularized incomplete gamma Q(s + 1, mean); @stdlib's below shape 100, exact
 * Poisson sums above, see internal/gamma.ts) until the definition holds; a handful of CDF
 * evaluations even for a mean of 10⁶.
 *
 * Sources: Silver, E. A., Pyke, D. F. & Peterson, R. (1998), Inventory Management and
 * Production Planning and Scheduling, 3rd ed., ch. 7 (order-up-to level for Poisson demand);
 * Stevenson, W. J., Operations Management, ch. 12 (single-period model, newsvendor).
 *
 * @param mean expected demand, finite ≥ 0 (0 gives 0)
 * @param serviceLevel target P(no shortage), 0 < serviceLevel < 1
 * @throws Error "poissonStockLevel: …" when mean is not a finite number ≥ 0 or serviceLevel is
 *   outside (0, 1)
 * @example
 * poissonStockLevel(2.5, 0.95); // 5 (P(D ≤ 5) = 0.958)
 * poissonStockLevel(4, 3 / (3 + 2)); // 4 (newsvendor: shortage 3, excess 2)
 */
export function poissonStockLevel(mean: number, serviceLevel: number): number {
  const fn = "poissonStockLevel";
  assertNonNegativeFinite(fn, "mean", mean);
  assertConfidence(fn, serviceLevel, "serviceLevel");
  if (mean === 0) return 0;

  const z = standardNormalQuantile(serviceLevel);
  let s = Math.max(0, Math.floor(mean + z * Math.sqrt(mean)));
  while (s > 0 && poissonLowerTail(s - 1, mean) >= serviceLevel) s--;
  while (poissonLowerTail(s, mean) < serviceLevel) s++;
  return s;
}
