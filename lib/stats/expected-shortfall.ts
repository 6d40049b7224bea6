import poissonPmf from "@stdlib/stats-base-dists-poisson-pmf";
import { poissonUpperTail } from "./internal/distributions";
import { assertNonNegativeFinite, assertNonNegativeInteger } from "./internal/validate";

/**
 * Expected shortfall (expected units short) when s parts are held against Poisson demand.
 *
 * Definition: E[(D − s)⁺] = Σ_{k > s} (k − s)·P(D = k), D ~ Poisson(mean).
 *
 * Method: for s ≤ mean, the identity E[(D − s)⁺] = mean·P(D ≥ s) − s·P(D ≥ s + 1) (both tails
 * are large, so no precision is lost); for s > mean, the sum above is added term by term from
 * P(D = s + 1) with the recursion P(D = k + 1) = P(D = k)·mean/(k + 1) until the terms no longer
 * change it, which keeps the relative precision of small shortfalls. Poisson probabilities:
 * P(D = k) from @stdlib/stats-base-dists-poisson-pmf, tails from the regularized incomplete
 * gamma (internal/gamma.ts).
 *
 * Source: Silver, Pyke & Peterson (1998), Inventory Management and Production Planning and
 * Scheduling, 3rd ed., ch. 7 (expected units short, Poisson demand).
 *
 * @param mean expected demand, finite ≥ 0
 * @param stock s, integer ≥ 0
 * @throws Error "expectedShortfall: …" when mean is not a finite number ≥ 0 or stock is not a
 *   non-negative integer
 * @example
 * expectedShortfall(1.25, 1); // 0.53650
 */
export function expectedShortfall(mean: number, stock: number): number {
  const fn = "expectedShortfall";
  assertNonNegativeFinite(fn, "mean", mean);
  assertNonNegativeInteger(fn, "stock", stock);
  if (mean === 0) return 0;

  if (stock <= mean) {
    const shortfall =
      mean * poissonUpperTail(stock, mean) - stock * poissonUpperTail(stock + 1, mean);
    return Math.max(0, shortfall);
  }
  let term = poissonPmf(stock + 1, mean);
  let sum = 0;
  for (let k = stock + 1; term > 0; k++) {
    const before = sum;
    sum += (k - stock) * term;
    if (sum === before) break;
    term *= mean / (k + 1);
  }
  return sum;
}
