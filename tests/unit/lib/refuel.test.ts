import seedrandom from "seedrandom";
import { describe, expect, test } from "vitest";
import { measureSinceFillUp, medianRefuelInterval, sinceFillUpHistogram } from "@/lib/refuel";
import { refuelWindowTest, type OdometerEvent } from "@/lib/stats";

describe("measureSinceFillUp", () => {
  test("miles since the last fill-up at or before the event, and the interval it fell in", () => {
    const fills = [
      { vehicle: "A", odometer: 1000 },
      { vehicle: "A", odometer: 1400 },
      { vehicle: "A", odometer: 1700 },
    ];
    const m = measureSinceFillUp(
      [
        { vehicle: "A", odometer: 1010 }, // 10 after 1000, interval 400
        { vehicle: "A", odometer: 1400 }, // at the pump: 0 after 1400, interval 300
        { vehicle: "A", odometer: 1750 }, // after the last: median gap (350)
        { vehicle: "A", odometer: 2900 }, // more than 1,000 mi on: no fuel data
        { vehicle: "A", odometer: 900 }, // before any fill-up: no fuel data
        { vehicle: "B", odometer: 500 }, // no fill-ups at all
      ],
      fills,
    );
    expect(m).toEqual([
      { sinceMi: 10, intervalMi: 400 },
      { sinceMi: 0, intervalMi: 300 },
      { sinceMi: 50, intervalMi: 350 },
      { sinceMi: null, intervalMi: null },
      { sinceMi: null, intervalMi: null },
      { sinceMi: null, intervalMi: null },
    ]);
    expect(medianRefuelInterval([1000, 1400, 1700, 1700])).toBe(350);
    expect(medianRefuelInterval([1000])).toBeNull();
  });

  test("agrees with refuelWindowTest on random fleets (same O, E and no-fuel-data count)", () => {
    const rng = seedrandom("refuel-agreement");
    for (let run = 0; run < 20; run++) {
      const fills: OdometerEvent[] = [];
      const events: OdometerEvent[] = [];
      for (let v = 0; v < 6; v++) {
        let odo = rng() * 2000;
        const n = Math.floor(rng() * 8);
        for (let i = 0; i < n; i++) {
          fills.push({ vehicle: v, odometer: Math.round(odo) });
          odo += 150 + rng() * 400;
        }
        for (let i = 0; i < 5; i++) events.push({ vehicle: v, odometer: rng() * 6000 });
      }
      const window = 5 + rng() * 40;
      const measures = measureSinceFillUp(events, fills);
      const test = refuelWindowTest(events, fills, window);
      const usable = measures.filter((m) => m.sinceMi !== null && m.intervalMi !== null);
      expect(events.length - usable.length).toBe(test.noFuelData);
      expect(usable.filter((m) => m.sinceMi! <= window).length).toBe(test.observed);
      const expected = usable.reduce((s, m) => s + Math.min(1, window / m.intervalMi!), 0);
      expect(expected).toBeCloseTo(test.expected, 9);
    }
  });
});

describe("sinceFillUpHistogram", () => {
  test("counts events per bin and spreads each event's chance over its interval", () => {
    const bins = sinceFillUpHistogram(
      [
        { sinceMi: 3, intervalMi: 100 },
        { sinceMi: 7, intervalMi: 100 },
        { sinceMi: 450, intervalMi: 500 },
        { sinceMi: null, intervalMi: null },
      ],
      5,
      20,
    );
    expect(bins.map((b) => [b.fromMi, b.toMi, b.observed])).toEqual([
      [0, 5, 1],
      [5, 10, 1],
      [10, 15, 0],
      [15, 20, 0],
      [20, null, 1],
    ]);
    // Two events with interval 100: 5/100 each per 5-mi bin; one with 500: 5/500.
    expect(bins[0]!.chance).toBeCloseTo(0.05 + 0.05 + 0.01, 12);
    // All of each measured event's chance lands somewhere: the total is the measured count.
    expect(bins.reduce((s, b) => s + b.chance, 0)).toBeCloseTo(3, 12);
    expect(bins.reduce((s, b) => s + b.observed, 0)).toBe(3);
  });
});
