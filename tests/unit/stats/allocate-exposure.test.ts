import { describe, expect, it } from "vitest";
import { allocateExposure } from "@/lib/stats";

describe("allocateExposure", () => {
  it("splits one stretch across the bands it crosses (hand-worked)", () => {
    // 8,000 → 23,000 with 10,000-mile bands: 2,000 in band 0, 10,000 in band 1, 3,000 in band 2.
    const miles = allocateExposure(
      [
        { at: "2024-01-01", odometer: 8_000 },
        { at: "2024-06-01", odometer: 23_000 },
      ],
      10_000,
    );
    expect([...miles]).toEqual([
      [0, 2_000],
      [1, 10_000],
      [2, 3_000],
    ]);
  });

  it("sorts by time whatever the input order and the time format (hand-worked)", () => {
    // Time order: 5,000 (Date) → 9,000 (ISO) → 9,000 (epoch ms) → 14,500 (ISO).
    // Stretches 5,000–9,000 (band 0: 4,000), 9,000–9,000 (none), 9,000–14,500 (band 0: 1,000,
    // band 1: 4,500). Totals: band 0 5,000, band 1 4,500 = 14,500 − 5,000.
    const readings = [
      { at: "2024-09-01T00:00:00Z", odometer: 14_500 },
      { at: new Date("2024-01-01T00:00:00Z"), odometer: 5_000 },
      { at: Date.parse("2024-05-01T00:00:00Z"), odometer: 9_000 },
      { at: "2024-03-01T00:00:00Z", odometer: 9_000 },
    ];
    const copy = JSON.stringify(readings);
    expect([...allocateExposure(readings, 10_000)]).toEqual([
      [0, 5_000],
      [1, 4_500],
    ]);
    expect(JSON.stringify(readings)).toBe(copy);
  });

  it("a stretch inside one band, and a stretch ending exactly on a boundary (hand-worked)", () => {
    expect([
      ...allocateExposure(
        [
          { at: 1, odometer: 31_000 },
          { at: 2, odometer: 32_500 },
        ],
        10_000,
      ),
    ]).toEqual([[3, 1_500]]);
    // 15,000 → 20,000 ends on the boundary: all 5,000 in band 1, nothing in band 2.
    expect([
      ...allocateExposure(
        [
          { at: 1, odometer: 15_000 },
          { at: 2, odometer: 20_000 },
        ],
        10_000,
      ),
    ]).toEqual([[1, 5_000]]);
  });

  it("many narrow bands: totals add up to the miles driven", () => {
    const miles = allocateExposure(
      [
        { at: 0, odometer: 0.5 },
        { at: 1, odometer: 10_000.25 },
      ],
      7,
    );
    const total = [...miles.values()].reduce((s, m) => s + m, 0);
    expect(Math.abs(total - 9_999.75)).toBeLessThan(1e-6);
    expect(miles.get(0)).toBeCloseTo(6.5, 10);
    expect(miles.size).toBe(1429); // bands 0 … 1428 (1428·7 = 9,996 ≤ 10,000.25 < 10,003)
  });

  it("fewer than two readings give no exposure", () => {
    expect(allocateExposure([], 10_000).size).toBe(0);
    expect(allocateExposure([{ at: 0, odometer: 5 }], 10_000).size).toBe(0);
  });

  it("throws on backwards readings, bad times and bad widths, naming the function", () => {
    expect(() =>
      allocateExposure(
        [
          { at: 1, odometer: 900 },
          { at: 2, odometer: 800 },
        ],
        100,
      ),
    ).toThrow(/^allocateExposure: odometer goes backwards/);
    expect(() => allocateExposure([{ at: "not a date", odometer: 1 }], 100)).toThrow(
      "allocateExposure: readings[0].at is not a valid time",
    );
    expect(() => allocateExposure([{ at: 1, odometer: -1 }], 100)).toThrow(
      /^allocateExposure: readings\[0\]\.odometer/,
    );
    expect(() => allocateExposure([], 0)).toThrow(/^allocateExposure: width/);
  });
});
