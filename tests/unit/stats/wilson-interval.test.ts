import { describe, expect, it } from "vitest";
import { wilsonInterval } from "@/lib/stats";
import { expectAbsolutelyClose, expectLimits } from "./support";

// Rows of statistics.md §1, rounded to 4 decimals there: absolute tolerance 0.00005.
const ROUNDED_4 = 0.00005;

describe("wilsonInterval", () => {
  it.each([
    // [x, n, lower, upper, source]
    [81, 263, 0.2553, 0.3662, "published: Newcombe (1998) Table II, as asserted by an R package"],
    [15, 148, 0.0624, 0.1605, "published: Newcombe (1998) Table II"],
    [0, 20, 0.0, 0.1611, "recalled: Newcombe (1998) Table II"],
    [1, 29, 0.0061, 0.1718, "recalled: Newcombe (1998) Table II"],
  ])("%i/%i → %f – %f (%s)", (x, n, lower, upper) => {
    const result = wilsonInterval(x, n);
    expect(result.estimate).toBe(x / n);
    expectLimits(result, lower, upper, ROUNDED_4);
  });

  it("uses z = 1.959964 at 95%, not a rounded probit (statistics.md §1)", () => {
    // Upper limit for 0/n is z²/(n + z²) (closed form, computed): with z = 1.959964 and n = 20
    // that is 0.161125…; simple-statistics' probit 1.95716 would give 0.160743.
    const z = 1.959964;
    expectAbsolutelyClose(wilsonInterval(0, 20).upper, (z * z) / (20 + z * z), 1e-7, "0/20");
  });

  it("is narrower at 90% than at 99%", () => {
    const narrow = wilsonInterval(30, 100, 0.9);
    const wide = wilsonInterval(30, 100, 0.99);
    expect(narrow.lower).toBeGreaterThan(wide.lower);
    expect(narrow.upper).toBeLessThan(wide.upper);
  });

  it("zero successes: lower exactly 0; all successes: upper exactly 1", () => {
    expect(wilsonInterval(0, 5).lower).toBe(0);
    expect(wilsonInterval(5, 5).upper).toBe(1);
    // Symmetry x ↔ n − x (property of the method): limits mirror.
    const a = wilsonInterval(2, 5);
    const b = wilsonInterval(3, 5);
    expectAbsolutelyClose(a.lower, 1 - b.upper, 1e-12, "mirror");
  });

  it("huge counts: 10^6 of 10^7 agrees with the normal approximation to 1e-6 (absolute)", () => {
    // For large n the Wilson limits approach p̂ ± z·√(p̂(1−p̂)/n) (computed here, z from above).
    const p = 0.1;
    const half = 1.959964 * Math.sqrt((p * (1 - p)) / 1e7);
    const result = wilsonInterval(1e6, 1e7);
    expectLimits(result, p - half, p + half, 1e-6);
  });

  it("throws on impossible input, naming the function", () => {
    expect(() => wilsonInterval(0, 0)).toThrow("wilsonInterval: trials must be a positive integer");
    expect(() => wilsonInterval(3, 2)).toThrow("wilsonInterval: successes must not exceed trials");
    expect(() => wilsonInterval(1.5, 10)).toThrow(/^wilsonInterval: successes/);
    expect(() => wilsonInterval(-1, 10)).toThrow(/^wilsonInterval: successes/);
    expect(() => wilsonInterval(1, 10, 1)).toThrow(/^wilsonInterval: confidence/);
    expect(() => wilsonInterval(1, 10, 0)).toThrow(/^wilsonInterval: confidence/);
    expect(() => wilsonInterval(1, Number.NaN)).toThrow(/^wilsonInterval: trials/);
  });
});
