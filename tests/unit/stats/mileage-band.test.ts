import { describe, expect, it } from "vitest";
import { mileageBand } from "@/lib/stats";

describe("mileageBand", () => {
  it.each([
    // hand-worked: band k is [k·width, (k + 1)·width)
    [0, 10_000, 0, 0, 10_000],
    [9_999.9, 10_000, 0, 0, 10_000],
    [10_000, 10_000, 1, 10_000, 20_000],
    [47_250, 10_000, 4, 40_000, 50_000],
    [123_456, 25_000, 4, 100_000, 125_000],
  ])("%f with width %f → band %i [%f, %f)", (odometer, width, index, from, to) => {
    expect(mileageBand(odometer, width)).toEqual({ index, from, to });
  });

  it("the band returned always holds the reading (from ≤ odometer < to), despite rounding", () => {
    // 0.3 / 0.1 = 2.9999999999999996 and 3 × 0.1 = 0.30000000000000004 in floating point: the
    // reading 0.3 lies in [0.2, 0.30000000000000004), band 2, and must be reported so.
    expect(mileageBand(0.3, 0.1)).toEqual({ index: 2, from: 0.2, to: 0.30000000000000004 });
    for (const width of [0.1, 0.3, 7, 1_000, 2_500.5, 10_000]) {
      for (let k = 0; k < 400; k++) {
        const odometer = k * width * 0.37 + (k % 7) * 1e-9;
        const band = mileageBand(odometer, width);
        expect(band.from <= odometer && odometer < band.to, `${odometer} / ${width}`).toBe(true);
        expect(band.from).toBe(band.index * width);
      }
    }
  });

  it("throws on impossible input, naming the function", () => {
    expect(() => mileageBand(-1, 10)).toThrow(/^mileageBand: odometer/);
    expect(() => mileageBand(5, 0)).toThrow(
      "mileageBand: width must be a finite number greater than 0",
    );
  });
});
