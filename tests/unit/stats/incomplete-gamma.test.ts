/**
 * lib/stats/internal/gamma.ts: the regularized incomplete gamma behind Garwood limits, gamma
 * posteriors and Poisson CDFs. @stdlib/math-base-special-gammainc 0.3.1 is inaccurate for
 * x > 1000 with a near x; these checks pin that region against sums written out here.
 */
import gammainc from "@stdlib/math-base-special-gammainc";
import { describe, expect, it } from "vitest";
import {
  gammaQuantile,
  lowerRegularizedGamma,
  upperRegularizedGamma,
} from "@/lib/stats/internal/gamma";
import { expectAbsolutelyClose, expectRelativelyClose, jStat, poissonCdfBySum } from "./support";

/** P(Poisson(mean) ≤ k) = Q(k + 1, mean), summed term by term (reference, support.ts). */
const poissonSum = poissonCdfBySum;

describe("regularized incomplete gamma (internal)", () => {
  it("@stdlib's gammainc is off near a ≈ x > 1000 (why the internal sums exist)", () => {
    // Q(2001, 2000) = P(Poisson(2000) ≤ 2000) = 0.5059467 (reference sum); @stdlib gives 0.5151.
    expectAbsolutelyClose(poissonSum(2000, 2000), 0.5059467, 1e-7, "reference");
    expect(Math.abs(gammainc(2000, 2001, true, true) - 0.5059467)).toBeGreaterThan(0.009);
    expectAbsolutelyClose(upperRegularizedGamma(2001, 2000), poissonSum(2000, 2000), 1e-9, "fixed");
  });

  it("integer shapes: Q(k + 1, λ) equals the Poisson sum for λ from 100 to 10^5 (absolute 1e-9)", () => {
    for (const mean of [100, 999, 1100, 2000, 4000, 10_000, 100_000]) {
      for (const sd of [-3, -1, 0, 1, 3]) {
        const k = Math.round(mean + sd * Math.sqrt(mean));
        const reference = poissonSum(k, mean);
        expectAbsolutelyClose(
          upperRegularizedGamma(k + 1, mean),
          reference,
          1e-9,
          `Q(${k + 1}, ${mean})`,
        );
        expectAbsolutelyClose(
          lowerRegularizedGamma(k + 1, mean),
          1 - reference,
          1e-9,
          `P(${k + 1}, ${mean})`,
        );
      }
    }
  });

  it("fractional shapes agree with jStat.lowRegGamma (absolute 1e-9)", () => {
    for (const [a, x] of [
      [100.5, 90],
      [150.5, 160],
      [1000.25, 1000],
      [5000.5, 5000],
      [5000.5, 5200],
      [20000.7, 19800],
      [100000.3, 100500],
      [0.7, 0.3],
      [12.5, 1500],
    ] as const) {
      expectAbsolutelyClose(
        lowerRegularizedGamma(a, x),
        jStat.lowRegGamma(a, x),
        1e-9,
        `P(${a}, ${x})`,
      );
      expectAbsolutelyClose(
        lowerRegularizedGamma(a, x) + upperRegularizedGamma(a, x),
        1,
        1e-14,
        `P + Q at (${a}, ${x})`,
      );
    }
  });

  it("far tails: tiny and certain values stay in [0, 1] without NaN", () => {
    expect(lowerRegularizedGamma(1000, 1)).toBe(0);
    expect(upperRegularizedGamma(1000, 1)).toBe(1);
    expect(upperRegularizedGamma(100, 1e4)).toBe(0);
    expect(lowerRegularizedGamma(100, 0)).toBe(0);
  });

  it("gammaQuantile inverts P for shapes from 0.5 to 10^7 (relative 1e-9 on the probability)", () => {
    for (const shape of [0.5, 3, 99.5, 100, 1000.5, 25_000, 1e7]) {
      for (const p of [0.005, 0.025, 0.5, 0.975, 0.995]) {
        const x = gammaQuantile(p, shape, 1);
        const back =
          p <= 0.5 ? lowerRegularizedGamma(shape, x) : 1 - upperRegularizedGamma(shape, x);
        expectRelativelyClose(back, p, 1e-9, `shape ${shape}, p ${p}`);
      }
    }
    // Rate scales the quantile: Gamma(a, rate r) = Gamma(a, 1)/r.
    expectRelativelyClose(
      gammaQuantile(0.9, 2500, 40),
      gammaQuantile(0.9, 2500, 1) / 40,
      1e-14,
      "rate",
    );
  });
});
