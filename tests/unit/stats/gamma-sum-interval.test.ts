import { describe, expect, test } from "vitest";
import { gammaSumInterval } from "@/lib/stats";
import { jStat } from "./support";

describe("gammaSumInterval", () => {
  test("one exponential term: the closed-form quantiles −ln(1 − p)·w / rate", () => {
    // Gamma(1, rate) is the exponential distribution; w·X is exponential with rate rate / w.
    const r = gammaSumInterval([{ shape: 1, rate: 2, weight: 3 }], 0.95);
    expect(r.mean).toBeCloseTo(1.5, 12);
    expect(r.lower).toBeCloseTo(-Math.log(0.975) * 1.5, 8);
    expect(r.upper).toBeCloseTo(-Math.log(0.025) * 1.5, 8);
  });

  test("terms with the same weight / rate add up exactly (gamma additivity)", () => {
    // Gamma(a, b) + Gamma(c, b) = Gamma(a + c, b): two bands at the same posterior exposure.
    const split = gammaSumInterval(
      [
        { shape: 3.5, rate: 40_000, weight: 4_000 },
        { shape: 1.25, rate: 40_000, weight: 4_000 },
      ],
      0.9,
    );
    const whole = gammaSumInterval([{ shape: 4.75, rate: 40_000, weight: 4_000 }], 0.9);
    expect(split.mean).toBeCloseTo(whole.mean, 12);
    expect(split.lower).toBeCloseTo(whole.lower, 10);
    expect(split.upper).toBeCloseTo(whole.upper, 10);
    // 4,000 · Gamma(4.75, rate 40,000) is Gamma(4.75, scale 0.1): jstat's gamma inverse (an
    // independent reference library) gives its 5% and 95% points.
    expect(whole.mean).toBeCloseTo(0.475, 12);
    expect(whole.lower).toBeCloseTo(jStat.gamma.inv(0.05, 4.75, 0.1), 6);
    expect(whole.upper).toBeCloseTo(jStat.gamma.inv(0.95, 4.75, 0.1), 6);
  });

  test("unequal terms: the approximation's tails checked against the exact sum's CDF", () => {
    // Y1 = 6,000 · Gamma(12, rate 300,000) = Gamma(12, scale 0.02); Y2 = 4,000 · Gamma(2.5,
    // rate 90,000) = Gamma(2.5, scale 1/22.5). The exact CDF of Y1 + Y2 by numerical
    // convolution of jstat's gamma density and CDF (Simpson's rule, 4,000 steps).
    const r = gammaSumInterval(
      [
        { shape: 12, rate: 300_000, weight: 6_000 },
        { shape: 2.5, rate: 90_000, weight: 4_000 },
      ],
      0.95,
    );
    const exactCdf = (s: number) => {
      const n = 4_000;
      const h = s / n;
      let sum = 0;
      for (let i = 0; i <= n; i++) {
        const y = i * h;
        const f = jStat.gamma.pdf(y, 12, 0.02) * jStat.gamma.cdf(s - y, 2.5, 1 / 22.5);
        sum += f * (i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2);
      }
      return (sum * h) / 3;
    };
    // Measured: 2.19% below the lower bound and 2.65% above the upper one, against 2.5% each.
    expect(Math.abs(exactCdf(r.lower) - 0.025)).toBeLessThan(0.005);
    expect(Math.abs(exactCdf(r.upper) - 0.975)).toBeLessThan(0.005);
  });

  test("unequal terms: the mean is the sum of means and the interval is about it", () => {
    const terms = [
      { shape: 12, rate: 300_000, weight: 6_000 },
      { shape: 2.5, rate: 90_000, weight: 4_000 },
    ];
    const r = gammaSumInterval(terms, 0.95);
    expect(r.mean).toBeCloseTo((6_000 * 12) / 300_000 + (4_000 * 2.5) / 90_000, 12);
    expect(r.lower).toBeGreaterThan(0);
    expect(r.lower).toBeLessThan(r.mean);
    expect(r.upper).toBeGreaterThan(r.mean);
    // Wider at 99% than at 80%.
    const wide = gammaSumInterval(terms, 0.99);
    const narrow = gammaSumInterval(terms, 0.8);
    expect(wide.upper - wide.lower).toBeGreaterThan(narrow.upper - narrow.lower);
  });

  test("no miles (all weights 0) or no terms: nothing expected", () => {
    expect(gammaSumInterval([], 0.95)).toEqual({ mean: 0, lower: 0, upper: 0 });
    expect(gammaSumInterval([{ shape: 2, rate: 1, weight: 0 }], 0.95)).toEqual({
      mean: 0,
      lower: 0,
      upper: 0,
    });
  });

  test("bad input is refused", () => {
    expect(() => gammaSumInterval([{ shape: 0, rate: 1, weight: 1 }])).toThrow(/shape/);
    expect(() => gammaSumInterval([{ shape: 1, rate: -1, weight: 1 }])).toThrow(/rate/);
    expect(() => gammaSumInterval([{ shape: 1, rate: 1, weight: -1 }])).toThrow(/weight/);
    expect(() => gammaSumInterval([], 1.5)).toThrow(/confidence/);
  });
});
