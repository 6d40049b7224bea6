import { describe, expect, it } from "vitest";
import { poissonInterval } from "@/lib/stats";
import {
  expectAbsolutelyClose,
  expectLimits,
  expectRelativelyClose,
  poissonCdfBySum,
} from "./support";

describe("poissonInterval (Garwood)", () => {
  it.each([
    // [x, lower, upper, absolute tolerance, source] — statistics.md §2, 95% for the count
    [0, 0, 3.6889, 0.00005, "computed; 3.689 published in an R epidemiology package's docs"],
    [1, 0.02532, 5.5716, 0.00005, "computed"],
    [3, 0.6187, 8.7673, 0.00005, "computed"],
    [4, 1.0899, 10.2416, 0.00005, "computed; R survival docs print 1.089865, 10.24153"],
    [10, 4.7954, 18.39, 0.0005, "computed"],
  ])("x = %i → %f – %f (tolerance %f absolute; %s)", (x, lower, upper, tolerance) => {
    const result = poissonInterval(x);
    expect(result.rate).toBe(x);
    expectLimits(result, lower, upper, tolerance);
  });

  it("x = 4 matches R survival's printed 1.089865 – 10.24153 to 4 significant figures", () => {
    const result = poissonInterval(4);
    expectRelativelyClose(result.lower, 1.089865, 5e-5, "lower");
    expectRelativelyClose(result.upper, 10.24153, 5e-5, "upper");
  });

  it("x = 0 upper has the closed form −ln(α/2) (computed)", () => {
    expectRelativelyClose(poissonInterval(0).upper, -Math.log(0.025), 1e-12, "95%");
    expectRelativelyClose(poissonInterval(0, 1, 0.9).upper, -Math.log(0.05), 1e-12, "90%");
  });

  it("rate example: 14 events in 400 vehicle-years → 0.035, 0.019135 – 0.058724 (computed)", () => {
    const result = poissonInterval(14, 400);
    expect(result.rate).toBe(0.035);
    expectLimits(result, 0.019135, 0.058724, 5e-7);
  });

  it("NIST e-Handbook §8.4.5.1: T = 800 h, r = 2, 90% MTBF 127.07 – 2251.2 h (published)", () => {
    const result = poissonInterval(2, 800, 0.9);
    // MTBF bounds are the reciprocals of the rate bounds: 2T/χ²(0.95; 6) and 2T/χ²(0.05; 4).
    expectAbsolutelyClose(1 / result.upper, 127.07, 0.005, "MTBF lower");
    expectAbsolutelyClose(1 / result.lower, 2251.2, 0.05, "MTBF upper");
    // Published factors on the point estimate T/r = 400 h: 0.3177 and 5.6281.
    expectAbsolutelyClose(1 / result.upper / 400, 0.3177, 0.00005, "lower factor");
    expectAbsolutelyClose(1 / result.lower / 400, 5.6281, 0.00005, "upper factor");
  });

  it("1,000 – 100,000 events: each limit leaves exactly α/2 in its tail (Poisson sums, absolute 1e-9)", () => {
    // P(X ≥ x | L) = 0.025 and P(X ≤ x | U) = 0.025, with P(X ≤ k | λ) summed term by term
    // exp(j ln λ − λ − ln j!) with jStat.gammaln (computed reference, support.ts).
    for (const x of [1000, 2500, 10_000, 100_000]) {
      const { lower, upper } = poissonInterval(x);
      expectAbsolutelyClose(1 - poissonCdfBySum(x - 1, lower), 0.025, 1e-9, `lower tail at ${x}`);
      expectAbsolutelyClose(poissonCdfBySum(x, upper), 0.025, 1e-9, `upper tail at ${x}`);
    }
  });

  it("huge counts: 10^6 events close to x ± z√x (relative 1e-4)", () => {
    const x = 1e6;
    const result = poissonInterval(x, 2e6);
    expect(result.rate).toBe(0.5);
    expectRelativelyClose(result.lower * 2e6, x - 1.959964 * Math.sqrt(x), 1e-4, "lower");
    expectRelativelyClose(result.upper * 2e6, x + 1.959964 * Math.sqrt(x), 1e-4, "upper");
  });

  it("throws on zero or negative exposure and bad counts, naming the function", () => {
    expect(() => poissonInterval(3, 0)).toThrow(
      "poissonInterval: exposure must be a finite number greater than 0",
    );
    expect(() => poissonInterval(3, -10)).toThrow(/^poissonInterval: exposure/);
    expect(() => poissonInterval(3, Infinity)).toThrow(/^poissonInterval: exposure/);
    expect(() => poissonInterval(-1)).toThrow(/^poissonInterval: events/);
    expect(() => poissonInterval(2.5)).toThrow(/^poissonInterval: events/);
    expect(() => poissonInterval(2, 1, 95)).toThrow(/^poissonInterval: confidence/);
  });
});
