import { describe, expect, it } from "vitest";
import { poissonStockLevel } from "@/lib/stats";
import { poissonProbability } from "./support";

/**
 * Smallest s with P(D ≤ s) ≥ target, searching upward over a running sum of Poisson
 * probabilities exp(k ln λ − λ − ln k!) with jStat.gammaln (reference; jStat.poisson.cdf itself
 * overflows above a mean of about 150).
 */
function referenceStockLevel(mean: number, target: number): number {
  let cdf = 0;
  for (let s = 0; ; s++) {
    cdf += poissonProbability(s, mean);
    if (cdf >= target) return s;
  }
}

describe("poissonStockLevel", () => {
  it.each([
    // [mean, service level, stock] — statistics.md §8 (computed, two libraries)
    [2.5, 0.95, 5],
    [0.5, 0.95, 2],
    [0.5, 0.9, 1],
    [6, 0.95, 10],
    [6, 0.99, 12],
  ])("mean %f at %f → %i (computed)", (mean, level, stock) => {
    expect(poissonStockLevel(mean, level)).toBe(stock);
  });

  it("newsvendor, Stevenson ch. 12: mean 4, shortage 3, excess 2 → service level 0.60 → 4 (published)", () => {
    expect(poissonStockLevel(4, 3 / (3 + 2))).toBe(4);
  });

  it("order-up-to table at mean 1.25: levels switch exactly at the published F(s) (published)", () => {
    // F(0..4) = 0.286505, 0.644636, 0.868468, 0.961731, 0.990876, printed to 6 decimals, so the
    // true F(s) lies within 5e-7: a target 2e-6 below F(s) needs s, 2e-6 above needs s + 1.
    const F = [0.286505, 0.644636, 0.868468, 0.961731, 0.990876];
    F.forEach((value, s) => {
      expect(poissonStockLevel(1.25, value - 2e-6), `just below F(${s})`).toBe(s);
      expect(poissonStockLevel(1.25, value + 2e-6), `just above F(${s})`).toBe(s + 1);
    });
  });

  it("agrees with an upward search over summed Poisson probabilities on a grid of means and targets", () => {
    for (const mean of [0.01, 0.3, 1, 3.7, 12, 45, 250, 1000]) {
      for (const target of [0.05, 0.5, 0.8, 0.9, 0.95, 0.975, 0.99, 0.999]) {
        expect(poissonStockLevel(mean, target), `mean ${mean}, target ${target}`).toBe(
          referenceStockLevel(mean, target),
        );
      }
    }
  });

  it("zero demand needs no stock; a huge mean (10^6) is fast and near mean + z√mean", () => {
    expect(poissonStockLevel(0, 0.99)).toBe(0);
    const started = performance.now();
    const s = poissonStockLevel(1e6, 0.95);
    expect(performance.now() - started).toBeLessThan(1000);
    // 10^6 + 1.6449·1000 = 1,001,645 (normal approximation, computed); exact within a few units.
    expect(Math.abs(s - 1_001_645)).toBeLessThanOrEqual(3);
  });

  it("throws on impossible input, naming the function", () => {
    expect(() => poissonStockLevel(-1, 0.9)).toThrow(
      "poissonStockLevel: mean must be a finite number greater than or equal to 0",
    );
    expect(() => poissonStockLevel(2, 1)).toThrow(/^poissonStockLevel: serviceLevel/);
    expect(() => poissonStockLevel(2, 0)).toThrow(/^poissonStockLevel: serviceLevel/);
  });
});
