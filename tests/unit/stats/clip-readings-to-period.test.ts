import { describe, expect, it } from "vitest";
import { allocateExposure, clipReadingsToPeriod } from "@/lib/stats";

const t = (iso: string) => Date.parse(`${iso}T00:00:00Z`);

describe("clipReadingsToPeriod", () => {
  const readings = [
    { at: "2024-01-01T00:00:00Z", odometer: 10_000 },
    { at: "2024-01-11T00:00:00Z", odometer: 11_000 },
    { at: "2024-01-31T00:00:00Z", odometer: 15_000 },
  ];

  it("interpolates at both ends, linearly in time (hand-worked)", () => {
    // 2024-01-06 is half-way through 01-01 → 01-11: 10,000 + 1,000 × 5/10 = 10,500.
    // 2024-01-21 is half-way through 01-11 → 01-31: 11,000 + 4,000 × 10/20 = 13,000.
    expect(clipReadingsToPeriod(readings, t("2024-01-06"), t("2024-01-21"))).toEqual([
      { at: t("2024-01-06"), odometer: 10_500 },
      { at: t("2024-01-11"), odometer: 11_000 },
      { at: t("2024-01-21"), odometer: 13_000 },
    ]);
  });

  it("adds no miles outside what was observed, and keeps everything with no limits", () => {
    expect(clipReadingsToPeriod(readings, t("2023-06-01"), t("2023-12-31"))).toEqual([]);
    expect(clipReadingsToPeriod(readings, t("2024-02-01"), null)).toEqual([]);
    expect(clipReadingsToPeriod(readings, null, null).map((r) => r.odometer)).toEqual([
      10_000, 11_000, 15_000,
    ]);
    // A period starting before the first reading starts at the first reading.
    expect(clipReadingsToPeriod(readings, t("2023-01-01"), t("2024-01-11"))).toEqual([
      { at: t("2024-01-01"), odometer: 10_000 },
      { at: t("2024-01-11"), odometer: 11_000 },
    ]);
  });

  it("periods that tile the time add up to the whole exposure in every band", () => {
    const width = 2_000;
    const whole = allocateExposure(readings, width);
    const first = allocateExposure(clipReadingsToPeriod(readings, null, t("2024-01-17")), width);
    const second = allocateExposure(clipReadingsToPeriod(readings, t("2024-01-17"), null), width);
    for (const [band, miles] of whole) {
      expect((first.get(band) ?? 0) + (second.get(band) ?? 0)).toBeCloseTo(miles, 9);
    }
  });

  it("refuses a period that ends before it starts, and invalid readings", () => {
    expect(() => clipReadingsToPeriod(readings, t("2024-02-01"), t("2024-01-01"))).toThrow(
      /from is after to/,
    );
    expect(() => clipReadingsToPeriod([{ at: "nope", odometer: 1 }], null, null)).toThrow(
      /not a valid time/,
    );
  });
});
