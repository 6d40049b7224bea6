import { describe, expect, it } from "vitest";
import { clopperPearsonInterval } from "@/lib/stats";
import { expectLimits, expectRelativelyClose } from "./support";

describe("clopperPearsonInterval", () => {
  it.each([
    // [x, n, lower, upper, absolute tolerance, source]
    [81, 263, 0.2527, 0.3676, 0.00005, "recalled: Newcombe (1998) Table II"],
    [15, 148, 0.0578, 0.1617, 0.00005, "recalled: Newcombe (1998) Table II"],
    [0, 20, 0.0, 0.1684, 0.00005, "recalled: Newcombe (1998) Table II"],
    [1, 29, 0.0009, 0.1776, 0.00005, "recalled: Newcombe (1998) Table II"],
    [
      4,
      20,
      0.057334,
      0.436614,
      0.0000005,
      "computed (jstat, SciPy); printed in an R package example",
    ],
  ])("%i/%i → %f – %f (tolerance %f absolute; %s)", (x, n, lower, upper, tolerance) => {
    const result = clopperPearsonInterval(x, n);
    expect(result.estimate).toBe(x / n);
    expectLimits(result, lower, upper, tolerance);
  });

  it("x = 0 and x = n have closed forms: U = 1 − (α/2)^(1/n), L = (α/2)^(1/n)", () => {
    // Closed forms of the beta quantiles with one shape parameter equal to 1 (computed here).
    const n = 37;
    expect(clopperPearsonInterval(0, n).lower).toBe(0);
    expectRelativelyClose(clopperPearsonInterval(0, n).upper, 1 - 0.025 ** (1 / n), 1e-10, "U");
    expect(clopperPearsonInterval(n, n).upper).toBe(1);
    expectRelativelyClose(clopperPearsonInterval(n, n).lower, 0.025 ** (1 / n), 1e-10, "L");
    // 90%: tails of 0.05.
    expectRelativelyClose(
      clopperPearsonInterval(0, n, 0.9).upper,
      1 - 0.05 ** (1 / n),
      1e-10,
      "90%",
    );
  });

  it("contains the Wilson interval's estimate and is wider than Wilson's for 81/263", () => {
    // Newcombe (1998): Clopper–Pearson 0.2527–0.3676 vs Wilson 0.2553–0.3662.
    const cp = clopperPearsonInterval(81, 263);
    expect(cp.lower).toBeLessThan(0.2553);
    expect(cp.upper).toBeGreaterThan(0.3662);
  });

  it("huge counts: 10^6 of 10^7 within 1e-6 (absolute) of the normal approximation", () => {
    const p = 0.1;
    const half = 1.959964 * Math.sqrt((p * (1 - p)) / 1e7);
    const result = clopperPearsonInterval(1e6, 1e7);
    expectLimits(result, p - half, p + half, 1e-6);
  });

  it("throws on impossible input, naming the function", () => {
    expect(() => clopperPearsonInterval(0, 0)).toThrow(
      "clopperPearsonInterval: trials must be a positive integer",
    );
    expect(() => clopperPearsonInterval(5, 4)).toThrow(/^clopperPearsonInterval: successes/);
    expect(() => clopperPearsonInterval(1, 4, 1.2)).toThrow(/^clopperPearsonInterval: confidence/);
  });
});
