import { describe, expect, it } from "vitest";
import { gammaPoissonShrinkage, type ShrinkageCell } from "@/lib/stats";
import { expectAbsolutelyClose, expectRelativelyClose, jStat, seededInteger } from "./support";

// Efron & Hastie (2016) Table 6.1: policies with x = 0…7 claims in one year (published).
const CLAIM_COUNTS = [7840, 1317, 239, 42, 14, 4, 4, 1];
const POLICIES: ShrinkageCell[] = CLAIM_COUNTS.flatMap((policies, claims) =>
  Array.from({ length: policies }, () => ({ events: claims, exposure: 1 })),
);

/** Negative binomial log-likelihood with exposure offsets, written out with jstat's gammaln. */
function referenceLogLikelihood(cells: readonly ShrinkageCell[], alpha: number, beta: number) {
  return cells.reduce(
    (sum, { events: x, exposure: t }) =>
      sum +
      jStat.gammaln(alpha + x) -
      jStat.gammaln(alpha) -
      jStat.gammaln(x + 1) +
      alpha * Math.log(beta / (beta + t)) +
      x * Math.log(t / (beta + t)),
    0,
  );
}

describe("gammaPoissonShrinkage", () => {
  const fit = gammaPoissonShrinkage(POLICIES);

  it("claims table: ν = 0.7015, σ = 0.3056 (computed; statistics.md §5; absolute 0.00005)", () => {
    expect(POLICIES).toHaveLength(9461);
    expectAbsolutelyClose(fit.alpha, 0.7015, 0.00005, "ν = alpha");
    expectAbsolutelyClose(1 / fit.beta, 0.3056, 0.00005, "σ = 1/beta");
  });

  it("claims table: E{θ|x} = .164 .398 .632 .866 1.100 1.334 1.568 (computed; absolute 0.0005)", () => {
    const row = [0.164, 0.398, 0.632, 0.866, 1.1, 1.334, 1.568];
    row.forEach((expected, x) => {
      const index = POLICIES.findIndex((cell) => cell.events === x);
      expectAbsolutelyClose(fit.cells[index]!.mean, expected, 0.0005, `x = ${x}`);
    });
    // Recalled printed row .164 .398 .633 .87 1.10 1.34 1.57: within its rounding too.
    expectAbsolutelyClose(
      fit.cells[POLICIES.findIndex((c) => c.events === 2)]!.mean,
      0.633,
      0.001,
      "x=2",
    );
  });

  it("the fit is a maximum of the likelihood (reference log-likelihood with jstat)", () => {
    const best = referenceLogLikelihood(POLICIES, fit.alpha, fit.beta);
    for (const [da, db] of [
      [1.001, 1],
      [0.999, 1],
      [1, 1.001],
      [1, 0.999],
      [1.001, 1.001],
      [0.999, 0.999],
    ] as const) {
      expect(referenceLogLikelihood(POLICIES, fit.alpha * da, fit.beta * db)).toBeLessThan(best);
    }
  });

  it("posterior limits are the gamma quantiles of Gamma(α + x, β + T) (jstat; relative 1e-6)", () => {
    const index = POLICIES.findIndex((cell) => cell.events === 3);
    const shape = fit.alpha + 3;
    const scale = 1 / (fit.beta + 1);
    expectRelativelyClose(fit.cells[index]!.lower, jStat.gamma.inv(0.025, shape, scale), 1e-6, "L");
    expectRelativelyClose(fit.cells[index]!.upper, jStat.gamma.inv(0.975, shape, scale), 1e-6, "U");
  });

  it("order and grouping do not change the fit; outputs follow the input order", () => {
    const integer = seededInteger("shrinkage-shuffle");
    const shuffled = [...POLICIES];
    for (let i = shuffled.length - 1; i > 0; i--) {
      const j = integer(0, i);
      [shuffled[i], shuffled[j]] = [shuffled[j]!, shuffled[i]!];
    }
    const again = gammaPoissonShrinkage(shuffled);
    expectRelativelyClose(again.alpha, fit.alpha, 1e-9, "alpha");
    expectRelativelyClose(again.beta, fit.beta, 1e-9, "beta");
    shuffled.forEach((cell, i) =>
      expectRelativelyClose(
        again.cells[i]!.mean,
        (fit.alpha + cell.events) / (fit.beta + 1),
        1e-9,
        "mean",
      ),
    );
  });

  it("exposure offsets: scaling every exposure by 1000 scales beta by 1000 and rates by 1/1000", () => {
    const cells = [
      { events: 3, exposure: 2.0 },
      { events: 0, exposure: 1.5 },
      { events: 12, exposure: 4.0 },
      { events: 1, exposure: 0.5 },
      { events: 7, exposure: 1.0 },
    ];
    const base = gammaPoissonShrinkage(cells);
    const scaled = gammaPoissonShrinkage(cells.map((c) => ({ ...c, exposure: c.exposure * 1000 })));
    expectRelativelyClose(scaled.alpha, base.alpha, 1e-6, "alpha");
    expectRelativelyClose(scaled.beta, base.beta * 1000, 1e-6, "beta");
    scaled.cells.forEach((cell, i) => {
      expectRelativelyClose(cell.mean, base.cells[i]!.mean / 1000, 1e-6, `mean ${i}`);
      expectRelativelyClose(cell.upper, base.cells[i]!.upper / 1000, 1e-6, `upper ${i}`);
    });
    // Shrinkage: every posterior mean lies between the cell's own rate and the pooled rate.
    const pooled = 23 / 9;
    base.cells.forEach((cell, i) => {
      const own = cells[i]!.events / cells[i]!.exposure;
      expect(cell.mean).toBeGreaterThanOrEqual(Math.min(own, pooled) - 1e-12);
      expect(cell.mean).toBeLessThanOrEqual(Math.max(own, pooled) + 1e-12);
    });
  });

  it("all zero events: Jeffreys fallback Gamma(½ + x, T), no NaN (documented degenerate case)", () => {
    const result = gammaPoissonShrinkage([
      { events: 0, exposure: 10 },
      { events: 0, exposure: 40 },
    ]);
    expect(result.alpha).toBe(0.5);
    expect(result.beta).toBe(0);
    expect(result.cells[0]!.mean).toBe(0.05);
    expect(result.cells[1]!.mean).toBe(0.0125);
    expect(result.cells[0]!.lower).toBeGreaterThanOrEqual(0);
    // Jeffreys upper limit for x = 0, T = 10: gamma quantile (jstat, scale 1/T).
    expectRelativelyClose(result.cells[0]!.upper, jStat.gamma.inv(0.975, 0.5, 0.1), 1e-6, "U");
  });

  it("one cell: Jeffreys fallback, no NaN (documented degenerate case)", () => {
    const result = gammaPoissonShrinkage([{ events: 4, exposure: 2 }]);
    expect(result.alpha).toBe(0.5);
    expect(result.beta).toBe(0);
    expect(result.cells[0]!.mean).toBe(4.5 / 2);
    expectRelativelyClose(result.cells[0]!.lower, jStat.gamma.inv(0.025, 4.5, 0.5), 1e-6, "L");
  });

  it("no spread beyond Poisson: alpha capped at Σx, every cell pooled, finite limits", () => {
    const result = gammaPoissonShrinkage([
      { events: 3, exposure: 1 },
      { events: 3, exposure: 1 },
    ]);
    expect(result.alpha).toBe(6);
    expectRelativelyClose(result.alpha / result.beta, 3, 1e-9, "prior mean = pooled rate");
    for (const cell of result.cells) {
      expectRelativelyClose(cell.mean, 3, 1e-9, "pooled");
      expect(cell.lower).toBeGreaterThan(1);
      expect(cell.upper).toBeLessThan(6);
    }
  });

  it("huge counts: 10^6 events in a cell give a finite, tight posterior", () => {
    const result = gammaPoissonShrinkage([
      { events: 1_000_000, exposure: 1e7 },
      { events: 10, exposure: 1e3 },
      { events: 200, exposure: 1e3 },
      { events: 0, exposure: 5e2 },
    ]);
    for (const value of [result.alpha, result.beta]) expect(Number.isFinite(value)).toBe(true);
    const big = result.cells[0]!;
    expectRelativelyClose(big.mean, 0.1, 1e-3, "big cell keeps its own rate");
    expect(big.upper - big.lower).toBeLessThan(0.001);
    for (const cell of result.cells) {
      for (const value of [cell.mean, cell.lower, cell.upper])
        expect(Number.isNaN(value)).toBe(false);
    }
  });

  it("throws on empty input, zero exposure and bad counts, naming the function", () => {
    expect(() => gammaPoissonShrinkage([])).toThrow(
      "gammaPoissonShrinkage: cells must be a non-empty array",
    );
    expect(() => gammaPoissonShrinkage([{ events: 1, exposure: 0 }])).toThrow(
      "gammaPoissonShrinkage: cells[0].exposure must be a finite number greater than 0",
    );
    expect(() => gammaPoissonShrinkage([{ events: -1, exposure: 1 }])).toThrow(
      /^gammaPoissonShrinkage: cells\[0\]\.events/,
    );
    expect(() => gammaPoissonShrinkage([{ events: 1, exposure: 1 }], 2)).toThrow(
      /^gammaPoissonShrinkage: confidence/,
    );
  });
});
