import gammaln from "@stdlib/math-base-special-gammaln";
import { gammaQuantile, tailProbabilities } from "./internal/distributions";
import {
  assertConfidence,
  assertNonNegativeInteger,
  assertPositiveFinite,
  fail,
} from "./internal/validate";

/** One cell: a count of events over an exposure (miles, vehicle-years, …). */
export interface ShrinkageCell {
  events: number;
  exposure: number;
}

/** A cell's posterior rate: mean and equal-tailed credible limits. */
export interface ShrunkRate {
  mean: number;
  lower: number;
  upper: number;
}

export interface GammaPoissonShrinkageResult {
  /** Shape of the fitted gamma prior on the rates. */
  alpha: number;
  /** Rate (1/scale) of the fitted gamma prior, in the unit of 1/exposure. */
  beta: number;
  /** Posterior of each input cell, in the input order. */
  cells: ShrunkRate[];
}

/** Smallest prior shape tried (extreme spread between cells). */
const MIN_ALPHA = 1e-8;
/** Jeffreys prior for a Poisson rate, used when no prior can be fitted. */
const JEFFREYS = { alpha: 0.5, beta: 0 };

interface Group {
  events: number;
  exposure: number;
  weight: number;
}

/**
 * Empirical-Bayes shrinkage of many cells' failure rates towards each other (gamma–Poisson
 * model), so that sparse cohorts are not ranked on noise.
 *
 * Definition: cell i has events xᵢ ~ Poisson(λᵢ·Tᵢ) with λᵢ ~ Gamma(α, β) (shape α, rate β).
 * Marginally xᵢ is negative binomial with exposure offset Tᵢ:
 *   P(xᵢ) = Γ(α + xᵢ) / (Γ(α) xᵢ!) · (β/(β + Tᵢ))^α · (Tᵢ/(β + Tᵢ))^xᵢ.
 * Each cell's posterior is Gamma(α + xᵢ, β + Tᵢ): mean (α + xᵢ)/(β + Tᵢ), limits its
 * (1 ∓ confidence)/2 quantiles (equal-tailed credible interval).
 *
 * Fitting method: marginal maximum likelihood of (α, β) under the negative binomial above.
 * For fixed α the score equation in β, Σ [α/β − (α + xᵢ)/(β + Tᵢ)] = 0, has exactly one root
 * (solved by safeguarded Newton steps in log β); the profile log-likelihood in log α is then
 * scanned on a grid over [1e-8, 1e8] and refined by golden-section search. Identical
 * (events, exposure) cells are grouped first, which changes nothing in the fit (9,461
 * unit-exposure cells fit the same as their 8 distinct counts).
 * With unit exposure, α and 1/β are Efron & Hastie's ν and σ, and the posterior mean is
 * (x + ν)σ/(1 + σ).
 *
 * Degenerate cases, all without NaN:
 * - one cell, or no events in any cell: no prior can be fitted from the data; the Jeffreys
 *   prior Gamma(½, 0) is used instead (alpha = 0.5, beta = 0), so each cell's posterior is
 *   Gamma(x + ½, T), its own Jeffreys interval, with no shrinkage;
 * - counts that spread no more than Poisson (the likelihood keeps rising as α → ∞): α is capped
 *   at the total number of events Σx, so the prior never carries more information than all the
 *   events it was fitted from. At the cap (β then ≈ ΣT) every cell is pulled to the pooled rate
 *   Σx/ΣT with limits about as wide as the pooled rate's own: the data give no evidence that
 *   the cells differ. Below the cap the fit is the unconstrained maximum; α is also kept
 *   ≥ 1e-8.
 *
 * Sources: Efron, B. & Hastie, T. (2016), Computer Age Statistical Inference, §6.1 (gamma
 * prior fitted to the negative binomial, Table 6.1); Clayton, D. & Kaldor, J. (1987),
 * "Empirical Bayes estimates of age-standardized relative risks for use in disease mapping",
 * Biometrics 43:671–681 (exposure offsets).
 *
 * @param cells at least one { events: integer ≥ 0, exposure: finite number > 0 }
 * @param confidence credible level, 0 < confidence < 1 (default 0.95)
 * @throws Error "gammaPoissonShrinkage: …" on an empty array, a count that is not a
 *   non-negative integer, an exposure that is not a finite number > 0, or a bad confidence
 * @example
 * // Efron & Hastie's claims table (counts of policies with 0…7 claims, exposure 1 each):
 * const cells = [7840, 1317, 239, 42, 14, 4, 4, 1].flatMap((k, x) =>
 *   Array.from({ length: k }, () => ({ events: x, exposure: 1 })));
 * gammaPoissonShrinkage(cells); // alpha ≈ 0.7015, 1/beta ≈ 0.3056, cells[0].mean ≈ 0.164
 */
export function gammaPoissonShrinkage(
  cells: readonly ShrinkageCell[],
  confidence = 0.95,
): GammaPoissonShrinkageResult {
  const fn = "gammaPoissonShrinkage";
  if (!Array.isArray(cells) || cells.length === 0) fail(fn, "cells must be a non-empty array");
  assertConfidence(fn, confidence);
  cells.forEach((cell, i) => {
    assertNonNegativeInteger(fn, `cells[${i}].events`, cell?.events);
    assertPositiveFinite(fn, `cells[${i}].exposure`, cell?.exposure);
  });

  const groups = groupCells(cells);
  const totalEvents = groups.reduce((sum, g) => sum + g.weight * g.events, 0);
  const prior = cells.length === 1 || totalEvents === 0 ? JEFFREYS : fitPrior(groups, totalEvents);

  const tails = tailProbabilities(confidence);
  const cache = new Map<string, ShrunkRate>();
  const posterior = cells.map((cell) => {
    const key = `${cell.events}|${cell.exposure}`;
    let result = cache.get(key);
    if (!result) {
      const shape = prior.alpha + cell.events;
      const rate = prior.beta + cell.exposure;
      result = {
        mean: shape / rate,
        lower: gammaQuantile(tails.lower, shape, rate),
        upper: gammaQuantile(tails.upper, shape, rate),
      };
      cache.set(key, result);
    }
    return { ...result };
  });
  return { alpha: prior.alpha, beta: prior.beta, cells: posterior };
}

function groupCells(cells: readonly ShrinkageCell[]): Group[] {
  const byKey = new Map<string, Group>();
  for (const { events, exposure } of cells) {
    const key = `${events}|${exposure}`;
    const group = byKey.get(key);
    if (group) group.weight += 1;
    else byKey.set(key, { events, exposure, weight: 1 });
  }
  // A fixed order makes the fit independent of the input order to the last bit.
  return [...byKey.values()].sort((a, b) => a.events - b.events || a.exposure - b.exposure);
}

/** Σ_{j<x} log(α + j) = log Γ(α + x) − log Γ(α), summed directly for small x (no cancellation). */
function logRisingFactorial(alpha: number, x: number): number {
  if (x > 50) return gammaln(alpha + x) - gammaln(alpha);
  let sum = 0;
  for (let j = 0; j < x; j++) sum += Math.log(alpha + j);
  return sum;
}

/** The unique root in β of the score equation for fixed α, by Newton steps in log β. */
function profileBeta(groups: readonly Group[], alpha: number): number {
  // g(u) = Σ w [α − (α + x)·β/(β + T)] with β = e^u: strictly decreasing from Σwα to −Σwx.
  const score = (u: number): { value: number; slope: number } => {
    const beta = Math.exp(u);
    let value = 0;
    let slope = 0;
    for (const g of groups) {
      const share = beta / (beta + g.exposure);
      value += g.weight * (alpha - (alpha + g.events) * share);
      slope -= g.weight * (alpha + g.events) * share * (1 - share);
    }
    return { value, slope };
  };
  let totalEvents = 0;
  let totalExposure = 0;
  for (const g of groups) {
    totalEvents += g.weight * g.events;
    totalExposure += g.weight * g.exposure;
  }
  // Start where the prior mean α/β equals the pooled rate, then bracket the root.
  let u = Math.log((alpha * totalExposure) / totalEvents);
  let lo = u;
  let hi = u;
  for (let step = 1; score(lo).value < 0; step *= 2) lo -= step;
  for (let step = 1; score(hi).value > 0; step *= 2) hi += step;
  for (let i = 0; i < 200; i++) {
    const { value, slope } = score(u);
    if (value === 0) break;
    if (value > 0) lo = u;
    else hi = u;
    const newton = u - value / slope;
    const next = newton > lo && newton < hi ? newton : (lo + hi) / 2;
    const converged = Math.abs(next - u) <= 1e-14 * Math.max(1, Math.abs(u));
    u = next;
    if (converged || hi - lo <= 1e-14 * Math.max(1, Math.abs(u))) break;
  }
  return Math.exp(u);
}

/** Negative binomial log-likelihood (without terms free of α and β). */
function logLikelihood(groups: readonly Group[], alpha: number, beta: number): number {
  let sum = 0;
  const logBeta = Math.log(beta);
  for (const g of groups) {
    sum +=
      g.weight *
      (logRisingFactorial(alpha, g.events) +
        alpha * logBeta -
        (alpha + g.events) * Math.log(beta + g.exposure));
  }
  return sum;
}

function fitPrior(groups: readonly Group[], maxAlpha: number): { alpha: number; beta: number } {
  const profile = (v: number): number => {
    const alpha = Math.exp(v);
    return logLikelihood(groups, alpha, profileBeta(groups, alpha));
  };
  const vMin = Math.log(MIN_ALPHA);
  const vMax = Math.log(maxAlpha);
  const steps = 74;
  let best = 0;
  let bestValue = -Infinity;
  for (let i = 0; i <= steps; i++) {
    const value = profile(vMin + ((vMax - vMin) * i) / steps);
    if (value > bestValue) {
      bestValue = value;
      best = i;
    }
  }
  if (best === steps) return { alpha: maxAlpha, beta: profileBeta(groups, maxAlpha) };
  let a = vMin + ((vMax - vMin) * Math.max(0, best - 1)) / steps;
  let b = vMin + ((vMax - vMin) * Math.min(steps, best + 1)) / steps;
  const ratio = (Math.sqrt(5) - 1) / 2;
  let c = b - ratio * (b - a);
  let d = a + ratio * (b - a);
  let fc = profile(c);
  let fd = profile(d);
  while (b - a > 1e-10) {
    if (fc >= fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - ratio * (b - a);
      fc = profile(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + ratio * (b - a);
      fd = profile(d);
    }
  }
  const alpha = Math.min(maxAlpha, Math.max(MIN_ALPHA, Math.exp((a + b) / 2)));
  return { alpha, beta: profileBeta(groups, alpha) };
}
