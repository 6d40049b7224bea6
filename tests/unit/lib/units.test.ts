import { describe, expect, test } from "vitest";
import { convertDistanceSetting, milesToUnit, unitToMiles } from "@/lib/units";

// The factor 1 mi = 1.609344 km is exact (NIST SP 811, appendix B.8).
describe("distance units", () => {
  test("miles and kilometres convert with the exact factor", () => {
    expect(milesToUnit(1, "km")).toBe(1.609344);
    expect(unitToMiles(1.609344, "km")).toBeCloseTo(1, 12);
    expect(milesToUnit(123, "mi")).toBe(123);
  });

  test("a distance setting converts to a round number and back to where it started", () => {
    // Recurra's default band: 25,000 mi, shown as 40,000 km (40,233.6 km to two figures).
    expect(convertDistanceSetting(25_000, "mi", "km")).toBe(40_000);
    expect(convertDistanceSetting(40_000, "km", "mi")).toBe(25_000);
    expect(convertDistanceSetting(20, "mi", "km")).toBe(32);
    expect(convertDistanceSetting(32, "km", "mi")).toBe(20);
    expect(convertDistanceSetting(3_000, "mi", "km")).toBe(4_800);
    expect(convertDistanceSetting(0, "mi", "km")).toBe(0);
    expect(convertDistanceSetting(12_345, "km", "km")).toBe(12_345);
  });
});
