import { describe, expect, it } from "vitest";
import { rateRatio } from "@/lib/stats";
import {
  expectAbsolutelyClose,
  expectLimits,
  expectRelativelyClose,
  jStat,
  seededInteger,
} from "./support";

/**
 * Two-sided exact binomial p-value by R's binom.test rule, summed over every outcome with
 * jstat's probabilities: sum of P(X = i) over i with P(X = i) ≤ P(X = x)·(1 + 1e-7).
 * A brute-force reference, independent of lib/stats (which bisects with @stdlib).
 */
function bruteForceBinomTest(x: number, n: number, p: number): number {
  const limit = jStat.binomial.pdf(x, n, p) * (1 + 1e-7);
  if (x === n * p) return 1;
  let sum = 0;
  for (let i = 0; i <= n; i++) {
    const probability = jStat.binomial.pdf(i, n, p);
    if (probability <= limit) sum += probability;
  }
  return Math.min(1, sum);
}

describe("rateRatio", () => {
  it("(10, 2) over (20000, 17887) → 4.47175, 0.95295 – 41.9744, p = 0.0421 (computed; R poisson.test)", () => {
    const result = rateRatio(10, 20000, 2, 17887);
    expectRelativelyClose(result.ratio, 4.47175, 1e-6, "ratio");
    expectAbsolutelyClose(result.lower, 0.95295, 0.000005, "lower");
    expectAbsolutelyClose(result.upper, 41.9744, 0.00005, "upper");
    expectAbsolutelyClose(result.pValue, 0.0421, 0.00005, "p");
  });

  it("(11, 21) over (800, 3011) → 1.9715, 0.8584 – 4.2773 (computed)", () => {
    const result = rateRatio(11, 800, 21, 3011);
    expectAbsolutelyClose(result.ratio, 1.9715, 0.00005, "ratio");
    expectLimits(result, 0.8584, 4.2773, 0.00005);
    // Lower bound below 1: no signal, and the p-value must agree (> 0.05).
    expect(result.pValue).toBeGreaterThan(0.05);
  });

  it("p-value follows R's binom.test two-sided rule (brute force with jstat on 300 seeded inputs)", () => {
    const integer = seededInteger("rate-ratio-p");
    for (let i = 0; i < 300; i++) {
      const a = integer(0, 120);
      const b = integer(0, 120);
      if (a + b === 0) continue;
      const exposureA = integer(1, 5000);
      const exposureB = integer(1, 5000);
      const expected = bruteForceBinomTest(a, a + b, exposureA / (exposureA + exposureB));
      const got = rateRatio(a, exposureA, b, exposureB).pValue;
      expectAbsolutelyClose(got, expected, 1e-9, `(${a}, ${b}) over (${exposureA}, ${exposureB})`);
    }
  });

  it("equal exposures: p = 2·P(X ≤ min(x, n − x)) for Binomial(n, ½), ties included (symmetry)", () => {
    // With π0 = ½ the outcomes x and n − x are equally likely; R's rule (tolerance 1 + 1e-7)
    // must count both even when rounding makes their computed probabilities differ in the
    // last bit. Reference: the exact symmetric sum with jstat, capped at 1.
    for (const n of [7, 10, 25, 60, 101, 250]) {
      for (let x = 0; x <= n; x++) {
        if (2 * x === n) continue;
        let tail = 0;
        for (let i = 0; i <= Math.min(x, n - x); i++) tail += jStat.binomial.pdf(i, n, 0.5);
        const got = rateRatio(x, 3.7, n - x, 3.7).pValue;
        expectAbsolutelyClose(got, Math.min(1, 2 * tail), 1e-9, `x=${x}, n=${n}`);
      }
    }
  });

  it("two equally likely modes: observing either gives p = 1 (R's 1 + 1e-7 tolerance at work)", () => {
    // Binomial(n, π0) with (n + 1)·π0 = k an integer has P(k − 1) = P(k) exactly, so observing
    // k − 1 or k leaves no outcome more likely than the one observed: p = 1 (definition).
    // π0 = k/(n + 1) comes from exposures k and n + 1 − k; rounding may tip one mode above the
    // other in the last bit, which the tolerance must absorb.
    for (const n of [5, 8, 11, 20, 29, 44, 99, 150]) {
      for (const k of [1, 2, Math.floor((n + 1) / 3), Math.floor((n + 1) / 2), n]) {
        for (const x of [k - 1, k]) {
          expectAbsolutelyClose(
            rateRatio(x, k, n - x, n + 1 - k).pValue,
            1,
            1e-12,
            `n=${n}, k=${k}, x=${x}`,
          );
        }
      }
    }
  });

  it("equal observed rates give p = 1 and a ratio of exactly 1", () => {
    const result = rateRatio(5, 100, 10, 200);
    expect(result.ratio).toBe(1);
    expect(result.pValue).toBe(1);
    expect(result.lower).toBeLessThan(1);
    expect(result.upper).toBeGreaterThan(1);
  });

  it("swapping the groups inverts the ratio and its limits and keeps the p-value", () => {
    const ab = rateRatio(17, 1200, 40, 9000);
    const ba = rateRatio(40, 9000, 17, 1200);
    expectRelativelyClose(ba.ratio, 1 / ab.ratio, 1e-12, "ratio");
    expectRelativelyClose(ba.lower, 1 / ab.upper, 1e-9, "lower");
    expectRelativelyClose(ba.upper, 1 / ab.lower, 1e-9, "upper");
    expectRelativelyClose(ba.pValue, ab.pValue, 1e-9, "p");
  });

  it("zero events: in A → ratio 0, lower 0; in B → ratio and upper Infinity; in both → no information", () => {
    const noneInA = rateRatio(0, 1000, 12, 1000);
    expect(noneInA.ratio).toBe(0);
    expect(noneInA.lower).toBe(0);
    expect(noneInA.upper).toBeGreaterThan(0);
    expect(Number.isFinite(noneInA.upper)).toBe(true);
    // P(X = 0) under Binomial(12, ½) = 2^-12, doubled by symmetry (computed).
    expectRelativelyClose(noneInA.pValue, 2 * 0.5 ** 12, 1e-9, "p");

    const noneInB = rateRatio(12, 1000, 0, 1000);
    expect(noneInB.ratio).toBe(Infinity);
    expect(noneInB.upper).toBe(Infinity);
    expect(noneInB.lower).toBeGreaterThan(1);

    const none = rateRatio(0, 1000, 0, 1000);
    expect(none.ratio).toBeNaN();
    expect(none.lower).toBe(0);
    expect(none.upper).toBe(Infinity);
    expect(none.pValue).toBe(1);
  });

  it("huge counts: 10^6 events against 10^6 is fast and matches the normal approximation", () => {
    const started = performance.now();
    const result = rateRatio(1_000_000, 1e6, 1_000_500, 1e6);
    expect(performance.now() - started).toBeLessThan(2000);
    // log ratio ± z·√(1/a + 1/b) (delta method, computed): 0.99950 (0.99673 – 1.00228).
    const logRatio = Math.log(1_000_000 / 1_000_500);
    const se = Math.sqrt(1 / 1_000_000 + 1 / 1_000_500);
    expectRelativelyClose(result.lower, Math.exp(logRatio - 1.959964 * se), 1e-5, "lower");
    expectRelativelyClose(result.upper, Math.exp(logRatio + 1.959964 * se), 1e-5, "upper");
    // z = 500/√2000500 = 0.3535: two-sided normal p ≈ 0.7237 (computed); exact is close.
    expectAbsolutelyClose(result.pValue, 0.7237, 0.002, "p");
  });

  it("throws on zero exposure and bad counts, naming the function", () => {
    expect(() => rateRatio(1, 0, 1, 10)).toThrow(
      "rateRatio: exposureA must be a finite number greater than 0",
    );
    expect(() => rateRatio(1, 10, 1, 0)).toThrow(/^rateRatio: exposureB/);
    expect(() => rateRatio(-1, 10, 1, 10)).toThrow(/^rateRatio: eventsA/);
    expect(() => rateRatio(1, 10, 0.5, 10)).toThrow(/^rateRatio: eventsB/);
    expect(() => rateRatio(1, 10, 1, 10, 0)).toThrow(/^rateRatio: confidence/);
  });
});
