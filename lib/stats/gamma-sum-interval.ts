import { gammaQuantile, tailProbabilities } from "./internal/distributions";
import {
  assertConfidence,
  assertNonNegativeFinite,
  assertPositiveFinite,
  fail,
} from "./internal/validate";

/** One term w·X of the sum, X ~ Gamma(shape, rate) (mean shape / rate). */
export interface GammaTerm {
  shape: number;
  rate: number;
  /** The term's multiplier w ≥ 0 (e.g. the miles driven at this rate). */
  weight: number;
}

/** A sum's mean and its central interval. */
export interface SumInterval {
  mean: number;
  lower: number;
  upper: number;
}

/**
 * Central interval of S = Σ wᵢ·Xᵢ for independent Xᵢ ~ Gamma(shapeᵢ, rateᵢ): the expected
 * failures over miles spread across mileage bands whose rates have gamma posteriors
 * (gammaPoissonShrinkage).
 *
 * Method: S is approximated by the gamma with the same mean and variance,
 * k = (Σ wᵢ·shapeᵢ/rateᵢ)² / Σ wᵢ²·shapeᵢ/rateᵢ², rate k / mean — the Satterthwaite (1946)
 * moment match for a linear combination of gamma (scaled χ²) variates. It is exact for one term
 * (a gamma scaled by w) and for terms with equal wᵢ/rateᵢ (the gamma family's additivity), and
 * an approximation otherwise.
 *
 * Source: Satterthwaite, F. E. (1946), "An approximate distribution of estimates of variance
 * components", Biometrics Bulletin 2(6):110–114 (citation from memory).
 */
export function gammaSumInterval(terms: readonly GammaTerm[], confidence = 0.95): SumInterval {
  const fn = "gammaSumInterval";
  assertConfidence(fn, confidence);
  if (!Array.isArray(terms)) fail(fn, "terms must be an array");
  let mean = 0;
  let variance = 0;
  terms.forEach((t, i) => {
    assertPositiveFinite(fn, `terms[${i}].shape`, t?.shape);
    assertPositiveFinite(fn, `terms[${i}].rate`, t?.rate);
    assertNonNegativeFinite(fn, `terms[${i}].weight`, t?.weight);
    mean += (t.weight * t.shape) / t.rate;
    variance += (t.weight * t.weight * t.shape) / (t.rate * t.rate);
  });
  if (!(mean > 0) || !(variance > 0)) return { mean: 0, lower: 0, upper: 0 };
  const shape = (mean * mean) / variance;
  const rate = mean / variance;
  const tails = tailProbabilities(confidence);
  return {
    mean,
    lower: gammaQuantile(tails.lower, shape, rate),
    upper: gammaQuantile(tails.upper, shape, rate),
  };
}
