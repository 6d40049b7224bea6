import { describe, expect, it } from "vitest";
import { refuelWindowTest, type OdometerEvent } from "@/lib/stats";
import {
  expectAbsolutelyClose,
  expectRelativelyClose,
  jStat,
  report,
  seededUniform,
} from "./support";

/** P(S ≥ k) for a sum of independent Bernoulli(pᵢ), by enumerating all 2ⁿ outcomes (small n). */
function enumeratedUpperTail(chances: number[], k: number): number {
  let tail = 0;
  for (let mask = 0; mask < 1 << chances.length; mask++) {
    let probability = 1;
    let hits = 0;
    chances.forEach((p, i) => {
      const hit = (mask >> i) & 1;
      hits += hit;
      probability *= hit ? p : 1 - p;
    });
    if (hits >= k) tail += probability;
  }
  return tail;
}

describe("refuelWindowTest", () => {
  it("hand-worked case: O = 3, E = 0.268889, p = 0.00108, 2 events without fuel data", () => {
    const fillUps: OdometerEvent[] = [
      { vehicle: "A", odometer: 1400 },
      { vehicle: "A", odometer: 1000 },
      { vehicle: "A", odometer: 1800 },
      { vehicle: "B", odometer: 0 },
      { vehicle: "B", odometer: 200 },
      { vehicle: "B", odometer: 450 },
    ];
    const events: OdometerEvent[] = [
      // A 1010: last fill-up 1000, next 1400 → interval 400, d = 10 ≤ 20: in window; π = 20/400 = 0.05
      { vehicle: "A", odometer: 1010 },
      // A 1500: last 1400, next 1800 → interval 400, d = 100: outside; π = 0.05
      { vehicle: "A", odometer: 1500 },
      // B 215: last 200, next 450 → interval 250, d = 15: in window; π = 20/250 = 0.08
      { vehicle: "B", odometer: 215 },
      // B 460: last 450, no later fill-up → B's median gap median(200, 250) = 225 (> d = 10);
      // in window; π = 20/225 = 0.088889
      { vehicle: "B", odometer: 460 },
      // B 2000: last fill-up 450 is 1,550 miles back (> 1,000): no fuel data
      { vehicle: "B", odometer: 2000 },
      // C has no fill-ups at all: no fuel data
      { vehicle: "C", odometer: 500 },
    ];
    const result = refuelWindowTest(events, fillUps);
    // O = 3; E = 0.05 + 0.05 + 0.08 + 0.088889 = 0.268889
    expect(result.observed).toBe(3);
    expectAbsolutelyClose(result.expected, 0.05 + 0.05 + 0.08 + 20 / 225, 1e-12, "E");
    expect(result.noFuelData).toBe(2);
    // P(S ≥ 3) by hand: all four 0.0000177778 + exactly three 0.0010622222 = 0.00108
    expectAbsolutelyClose(result.pValue, 0.00108, 1e-12, "p by hand");
    expectRelativelyClose(
      result.pValue,
      enumeratedUpperTail([0.05, 0.05, 0.08, 20 / 225], 3),
      1e-12,
      "p enumerated",
    );
    expectRelativelyClose(result.ratio, 3 / (0.18 + 20 / 225), 1e-12, "ratio");
    // Garwood 95% for 3 events: 0.6187 – 8.7673 (statistics.md §2, computed), divided by E.
    expectAbsolutelyClose(result.lower * result.expected, 0.6187, 0.00005, "lower × E");
    expectAbsolutelyClose(result.upper * result.expected, 8.7673, 0.00005, "upper × E");
  });

  it("a fill-up at the event's odometer counts as the last one (d = 0); a window wider than the interval gives π = 1", () => {
    const fillUps = [
      { vehicle: 7, odometer: 100 },
      { vehicle: 7, odometer: 130 },
      { vehicle: 7, odometer: 400 },
    ];
    // Event at 130: last 130, next 400 → d = 0 in window, π = 20/270.
    const exact = refuelWindowTest([{ vehicle: 7, odometer: 130 }], fillUps);
    expect(exact.observed).toBe(1);
    expectAbsolutelyClose(exact.expected, 20 / 270, 1e-12, "E");
    // Event at 150: d = 20 exactly, on the window's edge: in (d ≤ W); at 150.5 it is out.
    expect(refuelWindowTest([{ vehicle: 7, odometer: 150 }], fillUps).observed).toBe(1);
    expect(refuelWindowTest([{ vehicle: 7, odometer: 150.5 }], fillUps).observed).toBe(0);
    // W = 50 and an event at 110 between fill-ups 30 miles apart: π = min(1, 50/30) = 1.
    const wide = refuelWindowTest([{ vehicle: 7, odometer: 110 }], fillUps, 50);
    expect(wide.expected).toBe(1);
    expect(wide.observed).toBe(1);
    expect(wide.pValue).toBe(1);
  });

  it("no later fill-up and more miles since the last one than the median gap: the interval is those miles", () => {
    // Fill-ups 0, 200, 450: median gap 225. Event at 700: d = 250 > 225, so I = 250 and
    // π = 20/250 = 0.08 (not 20/225 = 0.0889): the interval cannot be shorter than d.
    const fillUps = [0, 200, 450].map((odometer) => ({ vehicle: "B", odometer }));
    const result = refuelWindowTest([{ vehicle: "B", odometer: 700 }], fillUps);
    expectAbsolutelyClose(result.expected, 0.08, 1e-12, "E");
    expect(result.observed).toBe(0);
  });

  it("vehicle ids are compared strictly: 7 and '7' are different vehicles", () => {
    const result = refuelWindowTest(
      [{ vehicle: "7", odometer: 110 }],
      [{ vehicle: 7, odometer: 100 }],
    );
    expect(result.noFuelData).toBe(1);
  });

  it("no later fill-up and a single fill-up: the fleet's median gap is used; none anywhere → no fuel data", () => {
    const fillUps = [
      { vehicle: "D", odometer: 100 },
      { vehicle: "E", odometer: 0 },
      { vehicle: "E", odometer: 300 },
      { vehicle: "E", odometer: 800 },
    ];
    // D 150: last 100, no later one, D has no gaps → fleet median of (300, 500) = 400; π = 0.05.
    const result = refuelWindowTest([{ vehicle: "D", odometer: 150 }], fillUps);
    expectAbsolutelyClose(result.expected, 0.05, 1e-12, "E");
    expect(result.observed).toBe(0);
    expect(result.pValue).toBe(1);

    const nothing = refuelWindowTest(
      [{ vehicle: "D", odometer: 150 }],
      [{ vehicle: "D", odometer: 100 }],
    );
    expect(nothing.noFuelData).toBe(1);
    expect(nothing.observed).toBe(0);
    expect(nothing.expected).toBe(0);
    expect(nothing.ratio).toBeNaN();
    expect(nothing.pValue).toBe(1);
  });

  it("zero events: nothing observed, p = 1, no NaN in the counts", () => {
    const result = refuelWindowTest([], [{ vehicle: "A", odometer: 1 }]);
    expect(result).toMatchObject({ observed: 0, expected: 0, noFuelData: 0, pValue: 1, lower: 0 });
  });

  it("above 20,000 events it falls back to the binomial with the mean chance, agreeing with the exact path", () => {
    // Equal chances make the Poisson-binomial a binomial: the exact path (20,000 events) and
    // the binomial path (20,001) must both match jstat's binomial upper tail.
    const fillUps = [
      { vehicle: "V", odometer: 0 },
      { vehicle: "V", odometer: 400 },
    ];
    const build = (n: number, inWindow: number) =>
      Array.from({ length: n }, (_, i) => ({ vehicle: "V", odometer: i < inWindow ? 10 : 200 }));
    for (const n of [20_000, 20_001]) {
      const observed = 1060;
      const result = refuelWindowTest(build(n, observed), fillUps);
      expect(result.observed).toBe(observed);
      expectRelativelyClose(result.expected, n * 0.05, 1e-9, "E");
      const reference = 1 - jStat.binomial.cdf(observed - 1, n, 0.05);
      expectAbsolutelyClose(result.pValue, reference, 1e-8, `p at n = ${n}`);
    }
  });

  describe("seeded simulations (200 fleets of 40 vehicles, 5 events each, W = 20)", () => {
    /** One fleet: fill-ups every 200–500 miles; events uniform over the odometer, or clustered. */
    function simulateFleet(uniform: () => number, clusterShare: number) {
      const fillUps: OdometerEvent[] = [];
      const events: OdometerEvent[] = [];
      for (let v = 0; v < 40; v++) {
        const odometers = [Math.floor(uniform() * 5000)];
        for (let i = 0; i < 30; i++) odometers.push(odometers[i]! + 200 + uniform() * 300);
        for (const odometer of odometers) fillUps.push({ vehicle: v, odometer });
        const first = odometers[0]!;
        const last = odometers[odometers.length - 1]!;
        for (let e = 0; e < 5; e++) {
          if (uniform() < clusterShare) {
            const fillUp = odometers[Math.floor(uniform() * (odometers.length - 1))]!;
            events.push({ vehicle: v, odometer: fillUp + uniform() * 20 });
          } else {
            events.push({ vehicle: v, odometer: first + uniform() * (last - first) });
          }
        }
      }
      return refuelWindowTest(events, fillUps);
    }

    it("no link (stalls uniform over the refuelling interval): p roughly uniform, O/E ≈ 1", () => {
      const uniform = seededUniform("refuel-null");
      const results = Array.from({ length: 200 }, () => simulateFleet(uniform, 0));
      const pValues = results.map((r) => r.pValue);
      const share = (limit: number) => pValues.filter((p) => p <= limit).length / pValues.length;
      const observed = results.reduce((s, r) => s + r.observed, 0);
      const expected = results.reduce((s, r) => s + r.expected, 0);
      report(
        `refuelWindowTest null: share p ≤ 0.05 = ${share(0.05)}, ≤ 0.25 = ${share(0.25)}, ` +
          `≤ 0.5 = ${share(0.5)}, ≤ 0.75 = ${share(0.75)}; pooled O/E = ${(observed / expected).toFixed(4)}`,
      );
      // A one-sided exact test of a discrete count is slightly conservative: P(p ≤ a) ≤ a, near a.
      expect(share(0.05)).toBeLessThanOrEqual(0.08);
      expect(share(0.25)).toBeGreaterThan(0.12);
      expect(share(0.25)).toBeLessThan(0.33);
      expect(share(0.5)).toBeGreaterThan(0.33);
      expect(share(0.5)).toBeLessThan(0.6);
      expect(share(0.75)).toBeGreaterThan(0.58);
      expect(share(0.75)).toBeLessThan(0.85);
      expectAbsolutelyClose(observed / expected, 1, 0.05, "pooled O/E");
      expect(results.every((r) => r.noFuelData === 0)).toBe(true);
    });

    it("stalls clustered within the window (30% of events): tiny p-value, ratio well above 1", () => {
      const uniform = seededUniform("refuel-cluster");
      const results = Array.from({ length: 20 }, () => simulateFleet(uniform, 0.3));
      const worstP = Math.max(...results.map((r) => r.pValue));
      const smallestLower = Math.min(...results.map((r) => r.lower));
      report(
        `refuelWindowTest clustered: largest p = ${worstP.toExponential(2)}, smallest lower = ${smallestLower.toFixed(2)}`,
      );
      expect(worstP).toBeLessThan(1e-10);
      expect(smallestLower).toBeGreaterThan(2);
    });
  });

  it("does not modify its inputs", () => {
    const fillUps = Object.freeze([
      Object.freeze({ vehicle: "A", odometer: 400 }),
      Object.freeze({ vehicle: "A", odometer: 0 }),
    ]);
    const events = Object.freeze([Object.freeze({ vehicle: "A", odometer: 5 })]);
    expect(() => refuelWindowTest(events, fillUps)).not.toThrow();
    expect(fillUps.map((f) => f.odometer)).toEqual([400, 0]);
  });

  it("throws on impossible input, naming the function", () => {
    expect(() => refuelWindowTest([], [], 0)).toThrow(
      "refuelWindowTest: windowMiles must be a finite number greater than 0",
    );
    expect(() => refuelWindowTest([{ vehicle: "A", odometer: -5 }], [])).toThrow(
      /^refuelWindowTest: events\[0\]\.odometer/,
    );
    expect(() => refuelWindowTest([], [{ vehicle: "A", odometer: Number.NaN }])).toThrow(
      /^refuelWindowTest: fillUps\[0\]\.odometer/,
    );
  });
});
