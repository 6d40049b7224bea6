import { twoSidedZ } from "./internal/distributions";
import { assertProportionInputs } from "./internal/validate";

/** A proportion with its confidence limits. */
export interface ProportionInterval {
  /** Observed proportion successes / trials. */
  estimate: number;
  lower: number;
  upper: number;
}

/**
 * Wilson score interval for a binomial proportion (share of vehicles affected).
 *
 * Definition: the set of p for which the score test of H0: π = p does not reject at level
 * 1 − confidence, i.e. L, U = (2x + z² ∓ z·√(z² + 4x(1 − x/n))) / (2(n + z²)) with
 * z = Φ⁻¹(1 − α/2) (1.959964 at 95%).
 *
 * Method: closed form above; z from the normal quantile of @stdlib/stats-base-dists-normal-quantile.
 * The limits are clamped to [0, 1] and set exactly to 0 when x = 0 and to 1 when x = n.
 *
 * Sources: Wilson, E. B. (1927), "Probable inference, the law of succession, and statistical
 * inference", JASA 22:209–212; Newcombe, R. G. (1998), "Two-sided confidence intervals for the
 * single proportion: comparison of seven methods", Statistics in Medicine 17:857–872, method 3.
 *
 * @param successes integer, 0 ≤ successes ≤ trials
 * @param trials integer ≥ 1
 * @param confidence two-sided confidence level, 0 < confidence < 1 (default 0.95)
 * @throws Error "wilsonInterval: …" when trials is not a positive integer, successes is not an
 *   integer in 0..trials, or confidence is outside (0, 1)
 * @example
 * wilsonInterval(81, 263); // { estimate: 0.30798, lower: 0.25529, upper: 0.36621 }
 */
export function wilsonInterval(
  successes: number,
  trials: number,
  confidence = 0.95,
): ProportionInterval {
  assertProportionInputs("wilsonInterval", successes, trials, confidence);

  const z = twoSidedZ(confidence);
  const z2 = z * z;
  const estimate = successes / trials;
  const centre = 2 * successes + z2;
  const spread = z * Math.sqrt(z2 + 4 * successes * (1 - estimate));
  const denominator = 2 * (trials + z2);
  const lower = successes === 0 ? 0 : Math.max(0, (centre - spread) / denominator);
  const upper = successes === trials ? 1 : Math.min(1, (centre + spread) / denominator);
  return { estimate, lower, upper };
}
