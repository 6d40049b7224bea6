import { clopperPearsonBounds } from "./internal/distributions";
import { assertProportionInputs } from "./internal/validate";
import type { ProportionInterval } from "./wilson-interval";

/**
 * Clopper–Pearson ("exact") interval for a binomial proportion.
 *
 * Definition: L = B⁻¹(α/2; x, n − x + 1) and U = B⁻¹(1 − α/2; x + 1, n − x), where B⁻¹ is the
 * beta quantile; L = 0 when x = 0 and U = 1 when x = n. Each tail of the interval holds at most
 * α/2, so coverage is at least the nominal level for every true proportion.
 *
 * Method: beta quantiles from @stdlib/stats-base-dists-beta-quantile.
 *
 * Sources: Clopper, C. J. & Pearson, E. S. (1934), "The use of confidence or fiducial limits
 * illustrated in the case of the binomial", Biometrika 26:404–413; Newcombe, R. G. (1998),
 * Statistics in Medicine 17:857–872, method 5.
 *
 * @param successes integer, 0 ≤ successes ≤ trials
 * @param trials integer ≥ 1
 * @param confidence two-sided confidence level, 0 < confidence < 1 (default 0.95)
 * @throws Error "clopperPearsonInterval: …" on the same impossible inputs as wilsonInterval
 * @example
 * clopperPearsonInterval(4, 20); // { estimate: 0.2, lower: 0.057334, upper: 0.436614 }
 */
export function clopperPearsonInterval(
  successes: number,
  trials: number,
  confidence = 0.95,
): ProportionInterval {
  assertProportionInputs("clopperPearsonInterval", successes, trials, confidence);

  const { lower, upper } = clopperPearsonBounds(successes, trials, confidence);
  return { estimate: successes / trials, lower, upper };
}
