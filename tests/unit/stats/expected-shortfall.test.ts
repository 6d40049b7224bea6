import { describe, expect, it } from "vitest";
import { expectedShortfall } from "@/lib/stats";
import { expectAbsolutelyClose, expectRelativelyClose, jStat } from "./support";

describe("expectedShortfall", () => {
  it("order-up-to table at mean 1.25: 1.25000, 0.53650, 0.18114, 0.04961, 0.01134 (published; absolute 0.000005)", () => {
    [1.25, 0.5365, 0.18114, 0.04961, 0.01134].forEach((expected, s) =>
      expectAbsolutelyClose(expectedShortfall(1.25, s), expected, 0.000005, `s = ${s}`),
    );
  });

  it("satisfies E[(D−s)⁺] − E[(s−D)⁺] = mean − s, the second term summed with jstat", () => {
    for (const mean of [0.2, 1.25, 7, 30]) {
      for (const s of [0, 1, 3, 8, 20, 45, 70]) {
        let excess = 0;
        for (let k = 0; k < s; k++) excess += (s - k) * jStat.poisson.pdf(k, mean);
        expectAbsolutelyClose(expectedShortfall(mean, s), mean - s + excess, 1e-9, `${mean}, ${s}`);
      }
    }
  });

  it("keeps relative precision far in the tail: mean 2, stock 30 ≈ P(D = 31)·(1 + …)", () => {
    // Σ_{k>30} (k − 30)·P(D = k): first term P(D = 31) from jstat, later terms shrink by ~2/32.
    let expected = 0;
    for (let k = 31; k < 60; k++) expected += (k - 30) * jStat.poisson.pdf(k, 2);
    expectRelativelyClose(expectedShortfall(2, 30), expected, 1e-6, "tail");
    expect(expectedShortfall(2, 30)).toBeGreaterThan(0);
  });

  it("zero demand gives 0; stock 0 gives the mean; huge means work", () => {
    expect(expectedShortfall(0, 3)).toBe(0);
    expect(expectedShortfall(4.2, 0)).toBe(4.2);
    // Mean 10^6 at s = mean: √(mean/(2π)) = 398.94 (normal approximation, computed).
    expectRelativelyClose(expectedShortfall(1e6, 1e6), 398.94, 1e-3, "normal approx");
  });

  it("throws on impossible input, naming the function", () => {
    expect(() => expectedShortfall(-1, 1)).toThrow(/^expectedShortfall: mean/);
    expect(() => expectedShortfall(1, 1.5)).toThrow(
      "expectedShortfall: stock must be a non-negative integer",
    );
  });
});
