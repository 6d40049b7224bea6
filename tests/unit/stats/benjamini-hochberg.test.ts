import { describe, expect, it } from "vitest";
import { benjaminiHochberg } from "@/lib/stats";
import { expectAbsolutelyClose } from "./support";

// Benjamini & Hochberg (1995) §3 example: 15 p-values (published).
const PAPER = [
  0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.324, 0.4262, 0.5719,
  0.6528, 0.759, 1.0,
];
// BH-adjusted values, statistics.md §4 (computed, two libraries agree), 4 decimals.
const ADJUSTED = [
  0.0015, 0.003, 0.0095, 0.0356, 0.0603, 0.0639, 0.0639, 0.0645, 0.0765, 0.486, 0.5812, 0.7149,
  0.7532, 0.8132, 1,
];

describe("benjaminiHochberg", () => {
  it("the paper's example rejects 4 at q = 0.05, cut-off 0.0095 (published)", () => {
    const { rejected } = benjaminiHochberg(PAPER, 0.05);
    expect(rejected.filter(Boolean)).toHaveLength(4);
    expect(rejected.slice(0, 4)).toEqual([true, true, true, true]);
    expect(rejected.slice(4).some(Boolean)).toBe(false);
    // The Bonferroni rule on the same data rejects 3 (published): BH is more powerful here.
    expect(rejected.filter(Boolean).length).toBeGreaterThan(3);
  });

  it("adjusted p-values match statistics.md §4 (computed; absolute tolerance 0.00005)", () => {
    const { adjusted } = benjaminiHochberg(PAPER);
    expect(adjusted).toHaveLength(15);
    adjusted.forEach((value, i) =>
      expectAbsolutelyClose(value, ADJUSTED[i]!, 0.00005, `#${i + 1}`),
    );
  });

  it("keeps the input order: a shuffled input gives the same value for each p", () => {
    const order = [14, 3, 7, 0, 11, 5, 9, 1, 13, 2, 8, 6, 12, 4, 10];
    const shuffled = order.map((i) => PAPER[i]!);
    const { adjusted, rejected } = benjaminiHochberg(shuffled);
    order.forEach((original, position) => {
      expectAbsolutelyClose(adjusted[position]!, ADJUSTED[original]!, 0.00005, `p${original + 1}`);
      expect(rejected[position]).toBe(original < 4);
    });
  });

  it("does not modify its input", () => {
    const input = Object.freeze([0.03, 0.01, 0.02]);
    const copy = [...input];
    benjaminiHochberg(input);
    expect([...input]).toEqual(copy);
  });

  it("all p-values 1: every adjusted value 1, nothing rejected", () => {
    const { adjusted, rejected } = benjaminiHochberg([1, 1, 1, 1]);
    expect(adjusted).toEqual([1, 1, 1, 1]);
    expect(rejected).toEqual([false, false, false, false]);
  });

  it("one p-value is its own adjusted value; empty input gives empty results", () => {
    expect(benjaminiHochberg([0.04])).toEqual({ adjusted: [0.04], rejected: [true] });
    expect(benjaminiHochberg([0.06])).toEqual({ adjusted: [0.06], rejected: [false] });
    expect(benjaminiHochberg([])).toEqual({ adjusted: [], rejected: [] });
  });

  it("step-up: a later p-value under its line rescues earlier ones above theirs", () => {
    // m = 3, q = 0.05: lines 0.0167, 0.0333, 0.05. 0.04 > 0.0333 but 0.045 ≤ 0.05: all rejected.
    const { rejected, adjusted } = benjaminiHochberg([0.02, 0.04, 0.045]);
    expect(rejected).toEqual([true, true, true]);
    expectAbsolutelyClose(adjusted[0]!, 0.045, 1e-12, "min over later ranks");
  });

  it("throws on p-values outside [0, 1] or NaN, and on a bad q", () => {
    expect(() => benjaminiHochberg([0.1, Number.NaN])).toThrow(
      "benjaminiHochberg: pValues[1] must be a number between 0 and 1",
    );
    expect(() => benjaminiHochberg([1.2])).toThrow(/^benjaminiHochberg: pValues\[0\]/);
    expect(() => benjaminiHochberg([-0.1])).toThrow(/^benjaminiHochberg: pValues\[0\]/);
    expect(() => benjaminiHochberg([0.1], 0)).toThrow(/^benjaminiHochberg: q/);
  });
});
