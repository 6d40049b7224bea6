/**
 * Coverage by simulation (statistics.md, "Method choices"): 10,000 seeded draws per setting.
 * Draws come from jstat's probabilities by CDF inversion (support.ts); each interval is computed
 * once per possible count and looked up, which keeps the run to a few seconds.
 * Exact coverages (Σ P(x) over the x whose interval holds the truth, jstat's probabilities) are
 * printed beside the simulated ones and checked too where the method guarantees them.
 */
import { describe, expect, it } from "vitest";
import { clopperPearsonInterval, poissonInterval, rateRatio, wilsonInterval } from "@/lib/stats";
import {
  binomialSampler,
  jStat,
  poissonProbability,
  poissonSampler,
  report,
  seededUniform,
} from "./support";

const DRAWS = 10_000;

interface Limits {
  lower: number;
  upper: number;
}

/** Share of draws whose interval holds the truth. */
function simulateCoverage(draw: () => number, intervals: Limits[], truth: number): number {
  let covered = 0;
  for (let i = 0; i < DRAWS; i++) {
    const limits = intervals[draw()]!;
    if (limits.lower <= truth && truth <= limits.upper) covered++;
  }
  return covered / DRAWS;
}

/** Σ P(X = x) over the x whose interval holds the truth. */
function exactCoverage(probability: (x: number) => number, intervals: Limits[], truth: number) {
  return intervals.reduce(
    (sum, limits, x) =>
      limits.lower <= truth && truth <= limits.upper ? sum + probability(x) : sum,
    0,
  );
}

describe(`coverage by simulation (${DRAWS.toLocaleString("en")} draws per setting, seeded)`, () => {
  it("Clopper–Pearson covers p in ≥ 95% of draws at n ∈ {10, 30, 100, 500} × p ∈ {0.01, 0.05, 0.2, 0.5}", () => {
    const uniform = seededUniform("coverage-cp");
    for (const n of [10, 30, 100, 500]) {
      const intervals = Array.from({ length: n + 1 }, (_, x) => clopperPearsonInterval(x, n));
      for (const p of [0.01, 0.05, 0.2, 0.5]) {
        const simulated = simulateCoverage(binomialSampler(n, p, uniform), intervals, p);
        const exact = exactCoverage((x) => jStat.binomial.pdf(x, n, p), intervals, p);
        report(
          `coverage Clopper–Pearson n=${n} p=${p}: simulated ${simulated.toFixed(4)}, exact ${exact.toFixed(4)}`,
        );
        expect(simulated, `CP n=${n} p=${p}`).toBeGreaterThanOrEqual(0.95);
        expect(exact, `CP exact n=${n} p=${p}`).toBeGreaterThanOrEqual(0.95);
      }
    }
  });

  it("Garwood covers the mean in ≥ 95% of draws at means 0.5, 1, 2, 5, 10, 20 (exposure 250)", () => {
    const uniform = seededUniform("coverage-garwood");
    const exposure = 250; // the rate is mean/250 per unit of exposure; the interval is for the rate
    for (const mean of [0.5, 1, 2, 5, 10, 20]) {
      const sampler = poissonSampler(mean, uniform);
      const max = Math.ceil(mean + 12 * Math.sqrt(mean) + 20);
      const intervals = Array.from({ length: max + 1 }, (_, x) => poissonInterval(x, exposure));
      const rate = mean / exposure;
      const simulated = simulateCoverage(sampler, intervals, rate);
      const exact = exactCoverage((x) => poissonProbability(x, mean), intervals, rate);
      report(
        `coverage Garwood mean=${mean}: simulated ${simulated.toFixed(4)}, exact ${exact.toFixed(4)}`,
      );
      expect(simulated, `Garwood mean=${mean}`).toBeGreaterThanOrEqual(0.95);
    }
  });

  it("Garwood's exact coverage is ≥ 95% over a wider grid of means, 0.1 to 120", () => {
    for (const mean of [0.1, 0.3, 0.7, 1.5, 3, 7, 15, 30, 50, 80, 120]) {
      const max = Math.ceil(mean + 12 * Math.sqrt(mean) + 20);
      const intervals = Array.from({ length: max + 1 }, (_, x) => poissonInterval(x));
      const exact = exactCoverage((x) => poissonProbability(x, mean), intervals, mean);
      report(`coverage Garwood mean=${mean}: exact ${exact.toFixed(4)}`);
      expect(exact, `Garwood exact mean=${mean}`).toBeGreaterThanOrEqual(0.95);
    }
  });

  it("Wilson's coverage averaged over p = 0.05, 0.06, …, 0.95 at n = 100 is 95% ± 1%", () => {
    const uniform = seededUniform("coverage-wilson");
    const n = 100;
    const intervals = Array.from({ length: n + 1 }, (_, x) => wilsonInterval(x, n));
    const simulated: number[] = [];
    for (let k = 5; k <= 95; k++) {
      const p = k / 100;
      simulated.push(simulateCoverage(binomialSampler(n, p, uniform), intervals, p));
    }
    const average = simulated.reduce((s, c) => s + c, 0) / simulated.length;
    const lowest = Math.min(...simulated);
    report(
      `coverage Wilson n=100 over 91 values of p: average ${average.toFixed(4)}, ` +
        `lowest ${lowest.toFixed(4)}, highest ${Math.max(...simulated).toFixed(4)}`,
    );
    expect(average).toBeGreaterThanOrEqual(0.94);
    expect(average).toBeLessThanOrEqual(0.96);
  });

  it("rate-ratio limits cover the true ratio in ≥ 95% of draws at three settings", () => {
    const uniform = seededUniform("coverage-ratio");
    // [expected events A, exposure A, expected events B, exposure B]: true ratio (λA/TA)/(λB/TB).
    for (const [meanA, exposureA, meanB, exposureB] of [
      [5, 1000, 5, 1000],
      [3, 200, 30, 9000],
      [12, 5000, 40, 8000],
    ] as const) {
      const truth = meanA / exposureA / (meanB / exposureB);
      const drawA = poissonSampler(meanA, uniform);
      const drawB = poissonSampler(meanB, uniform);
      const cache = new Map<string, Limits>();
      let covered = 0;
      for (let i = 0; i < DRAWS; i++) {
        const a = drawA();
        const b = drawB();
        const key = `${a},${b}`;
        let limits = cache.get(key);
        if (!limits) {
          limits = rateRatio(a, exposureA, b, exposureB);
          cache.set(key, limits);
        }
        if (limits.lower <= truth && truth <= limits.upper) covered++;
      }
      const simulated = covered / DRAWS;
      report(
        `coverage rate ratio ${meanA}/${exposureA} vs ${meanB}/${exposureB} (ratio ${truth.toFixed(3)}): simulated ${simulated.toFixed(4)}`,
      );
      expect(simulated).toBeGreaterThanOrEqual(0.95);
    }
  });
});
