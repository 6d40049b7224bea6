import { describe, expect, it } from "vitest";
import { cleanOdometerReadings } from "@/lib/stats";

const day = (n: number) => new Date(Date.UTC(2024, 0, 1 + n));

describe("cleanOdometerReadings", () => {
  it("keeps a plausible history untouched and sorted by time", () => {
    const readings = [
      { at: day(30), odometer: 11_000 },
      { at: day(0), odometer: 10_000 },
      { at: day(60), odometer: 12_500 },
    ];
    const { kept, ignored } = cleanOdometerReadings(readings);
    expect(ignored).toBe(0);
    expect(kept.map((r) => r.odometer)).toEqual([10_000, 11_000, 12_500]);
    expect(kept[0]).toBe(readings[1]); // the caller's objects, not copies
  });

  it("drops a reading that goes backwards (the later one)", () => {
    const { kept, ignored } = cleanOdometerReadings([
      { at: day(0), odometer: 45_000 },
      { at: day(10), odometer: 44_000 },
      { at: day(20), odometer: 46_000 },
    ]);
    expect(ignored).toBe(1);
    expect(kept.map((r) => r.odometer)).toEqual([45_000, 46_000]);
  });

  it("drops a wrong high reading instead of every correct reading after it", () => {
    // 90,000 two days after 45,000 implies 22,500 mi/day; the readings after it are fine.
    const { kept, ignored } = cleanOdometerReadings([
      { at: day(0), odometer: 45_000 },
      { at: day(2), odometer: 90_000 },
      { at: day(10), odometer: 45_800 },
      { at: day(20), odometer: 46_900 },
    ]);
    expect(ignored).toBe(1);
    expect(kept.map((r) => r.odometer)).toEqual([45_000, 45_800, 46_900]);
  });

  it("1,500 mi/day: 3,000 miles in 2 days is kept, 3,001 is not; same-day gaps count as a day", () => {
    const ok = cleanOdometerReadings([
      { at: day(0), odometer: 1_000 },
      { at: day(2), odometer: 4_000 },
    ]);
    expect(ok.ignored).toBe(0);
    const fast = cleanOdometerReadings([
      { at: day(0), odometer: 1_000 },
      { at: day(2), odometer: 4_001 },
    ]);
    expect(fast.ignored).toBe(1);
    // Two readings dated the same day (no time of day): zero elapsed time, counted as one day.
    const sameDay = cleanOdometerReadings([
      { at: "2024-01-01", odometer: 20_000 },
      { at: "2024-01-01", odometer: 20_060 },
    ]);
    expect(sameDay.ignored).toBe(0);
  });

  it("an order-of-magnitude jump (a digit typed twice) is dropped even when slow enough", () => {
    // 45,000 → 450,000 over a year is ~1,110 mi/day (under 1,500) but ×10 from ≥ 1,000.
    const { kept, ignored } = cleanOdometerReadings([
      { at: day(0), odometer: 45_000 },
      { at: day(365), odometer: 450_000 },
    ]);
    expect(ignored).toBe(1);
    expect(kept.map((r) => r.odometer)).toEqual([45_000]);
    // A new vehicle growing ×10 from under 1,000 miles is normal.
    expect(
      cleanOdometerReadings([
        { at: day(0), odometer: 50 },
        { at: day(30), odometer: 2_000 },
      ]).ignored,
    ).toBe(0);
  });

  it("drops invalid times and odometers, and counts them", () => {
    const { kept, ignored } = cleanOdometerReadings([
      { at: "garbage", odometer: 100 },
      { at: day(0), odometer: Number.NaN },
      { at: day(1), odometer: -4 },
      { at: day(2), odometer: 300 },
    ]);
    expect(ignored).toBe(3);
    expect(kept.map((r) => r.odometer)).toEqual([300]);
  });

  it("empty input; input not modified", () => {
    expect(cleanOdometerReadings([])).toEqual({ kept: [], ignored: 0 });
    const readings = Object.freeze([
      Object.freeze({ at: day(5), odometer: 9 }),
      Object.freeze({ at: day(1), odometer: 5 }),
    ]);
    cleanOdometerReadings(readings);
    expect(readings.map((r) => r.odometer)).toEqual([9, 5]);
    expect(() => cleanOdometerReadings("x" as never)).toThrow(
      "cleanOdometerReadings: readings must be an array",
    );
  });
});
