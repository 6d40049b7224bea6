import { describe, expect, it } from "vitest";
import { meanCumulativeFunction, type RecurrenceHistory } from "@/lib/stats";
import { valveSeats } from "@/tests/fixtures/valve-seats";
import { expectAbsolutelyClose, expectRelativelyClose, seededInteger } from "./support";

const at = (points: ReturnType<typeof meanCumulativeFunction>, age: number) => {
  const point = points.find((p) => p.at === age);
  if (!point) throw new Error(`no MCF point at ${age}`);
  return point;
};

/**
 * Lawless–Nadeau robust variance written out as the double sum of statistics.md §6, straight
 * from the definition (units × ages), as an independent reference for the one-pass code.
 */
function referenceMcf(units: { end: number; events: { at: number; value: number }[] }[]) {
  const ages = [...new Set(units.flatMap((u) => u.events.map((e) => e.at)))].sort((a, b) => a - b);
  const atRisk = ages.map((t) => units.filter((u) => u.end >= t).length);
  const amount = (u: (typeof units)[number], t: number) =>
    u.events.filter((e) => e.at === t).reduce((s, e) => s + e.value, 0);
  const dbar = ages.map((t, k) => units.reduce((s, u) => s + amount(u, t), 0) / atRisk[k]!);
  return ages.map((t, k) => {
    let mcf = 0;
    for (let j = 0; j <= k; j++) mcf += dbar[j]!;
    let variance = 0;
    for (const u of units) {
      let inner = 0;
      for (let j = 0; j <= k; j++) {
        if (ages[j]! <= u.end) inner += (amount(u, ages[j]!) - dbar[j]!) / atRisk[j]!;
      }
      variance += inner * inner;
    }
    return { at: t, mcf, variance, atRisk: atRisk[k]! };
  });
}

describe("meanCumulativeFunction", () => {
  it("Meeker & Escobar Table 16.2 toy data (data published; values computed)", () => {
    const points = meanCumulativeFunction([
      { end: 12, events: [5, 8] },
      { end: 16, events: [] },
      { end: 20, events: [1, 8, 16] },
    ]);
    expect(points.map((p) => p.at)).toEqual([1, 5, 8, 16]);
    const mcf = [0.3333, 0.6667, 1.3333, 1.8333];
    const variance = [0.07407, 0.07407, 0.2963, 0.75463];
    points.forEach((p, i) => {
      expectAbsolutelyClose(p.mcf, mcf[i]!, 0.00005, `MCF at ${p.at}`);
      expectAbsolutelyClose(p.variance, variance[i]!, 0.000005, `variance at ${p.at}`);
    });
    expect(points.map((p) => p.atRisk)).toEqual([3, 3, 3, 2]);
  });

  describe("valve-seat data, Nelson (1995) / Meeker & Escobar Table C.8 (data published)", () => {
    const units = valveSeats.map((e) => ({ end: e.end, events: e.replacements }));
    const points = meanCumulativeFunction(units);

    it("fixture: 41 engines, 48 replacements (published)", () => {
      expect(valveSeats).toHaveLength(41);
      expect(valveSeats.reduce((s, e) => s + e.replacements.length, 0)).toBe(48);
    });

    it("MCF and at-risk counts at nine ages (computed; absolute 0.00005)", () => {
      const ages = [61, 139, 377, 404, 573, 581, 604, 646, 653];
      const mcf = [0.0244, 0.2195, 0.6585, 0.6835, 0.9585, 0.9849, 1.0597, 1.3205, 1.5427];
      const atRisk = [41, 41, 41, 40, 40, 38, 22, 13, 9];
      ages.forEach((age, i) => {
        const point = at(points, age);
        expectAbsolutelyClose(point.mcf, mcf[i]!, 0.00005, `MCF at ${age}`);
        expect(point.atRisk, `at risk at ${age}`).toBe(atRisk[i]);
      });
    });

    it("day 653: SE 0.3117, log-scale 95% limits 1.0383 – 2.2921 (computed)", () => {
      const point = at(points, 653);
      expectAbsolutelyClose(Math.sqrt(point.variance), 0.3117, 0.00005, "SE");
      expectAbsolutelyClose(point.lower, 1.0383, 0.00005, "lower");
      expectAbsolutelyClose(point.upper, 2.2921, 0.00005, "upper");
    });

    it("agrees with the direct double-sum variance at every age (relative 1e-9)", () => {
      const reference = referenceMcf(
        units.map((u) => ({ end: u.end, events: u.events.map((t) => ({ at: t, value: 1 })) })),
      );
      expect(points).toHaveLength(reference.length);
      points.forEach((p, i) => {
        expectRelativelyClose(p.mcf, reference[i]!.mcf, 1e-12, `MCF at ${p.at}`);
        expectRelativelyClose(p.variance, reference[i]!.variance, 1e-9, `variance at ${p.at}`);
      });
    });
  });

  it("Nelson (1988) artificial cost data: cost MCF at ten ages (computed; absolute 0.00005)", () => {
    const units: RecurrenceHistory[] = [
      {
        end: 42,
        events: [
          { at: 19, value: 2 },
          { at: 39, value: 2 },
        ],
      },
      {
        end: 33,
        events: [
          { at: 8, value: 2 },
          { at: 14, value: 1 },
          { at: 26, value: 1 },
        ],
      },
      { end: 29, events: [{ at: 18, value: 3 }] },
      {
        end: 20,
        events: [
          { at: 2, value: 1 },
          { at: 8, value: 1 },
          { at: 16, value: 2 },
        ],
      },
      { end: 16, events: [] },
      {
        end: 12,
        events: [
          { at: 5, value: 3 },
          { at: 12, value: 1 },
        ],
      },
    ];
    const points = meanCumulativeFunction(units);
    const ages = [2, 5, 8, 12, 14, 16, 18, 19, 26, 39];
    const mcf = [0.1667, 0.6667, 1.1667, 1.3333, 1.5333, 1.9333, 2.6833, 3.1833, 3.5167, 5.5167];
    expect(points.map((p) => p.at)).toEqual(ages);
    points.forEach((p, i) => expectAbsolutelyClose(p.mcf, mcf[i]!, 0.00005, `cost MCF at ${p.at}`));
    // System 6 ends at 12 and still counts at 12 (n = 6); at 14 it no longer does (n = 5).
    expect(at(points, 12).atRisk).toBe(6);
    expect(at(points, 14).atRisk).toBe(5);
  });

  it("robust variance matches the double sum on seeded random cost histories (relative 1e-9)", () => {
    const integer = seededInteger("mcf-random");
    const units = Array.from({ length: 60 }, () => {
      const end = integer(5, 400);
      const count = integer(0, 6);
      return {
        end,
        events: Array.from({ length: count }, () => ({
          at: integer(0, end),
          value: integer(0, 900),
        })),
      };
    });
    const points = meanCumulativeFunction(units);
    const reference = referenceMcf(units);
    expect(points).toHaveLength(reference.length);
    points.forEach((p, i) => {
      expect(p.at).toBe(reference[i]!.at);
      expect(p.atRisk).toBe(reference[i]!.atRisk);
      expectRelativelyClose(p.mcf, reference[i]!.mcf, 1e-12, `MCF at ${p.at}`);
      expectRelativelyClose(p.variance, reference[i]!.variance, 1e-9, `variance at ${p.at}`);
    });
  });

  it("no events gives no points; zero-valued costs give M = 0 with limits [0, 0]", () => {
    expect(meanCumulativeFunction([])).toEqual([]);
    expect(meanCumulativeFunction([{ end: 10, events: [] }])).toEqual([]);
    const [point] = meanCumulativeFunction([{ end: 10, events: [{ at: 3, value: 0 }] }]);
    expect(point).toEqual({ at: 3, mcf: 0, variance: 0, lower: 0, upper: 0, atRisk: 1 });
  });

  it("huge counts: 10^6 events over 10^4 units in well under a few seconds", () => {
    const integer = seededInteger("mcf-huge");
    const units = Array.from({ length: 10_000 }, () => ({
      end: 1000,
      events: Array.from({ length: 100 }, () => integer(0, 1000)),
    }));
    const started = performance.now();
    const points = meanCumulativeFunction(units);
    expect(performance.now() - started).toBeLessThan(10_000);
    const last = points[points.length - 1]!;
    expectAbsolutelyClose(last.mcf, 100, 1e-9, "every unit has 100 events by age 1000");
    expect(Number.isFinite(last.upper)).toBe(true);
  });

  it("does not modify its input", () => {
    const units = [Object.freeze({ end: 5, events: Object.freeze([3, 1, 2]) })];
    expect(() => meanCumulativeFunction(units)).not.toThrow();
    expect([...units[0]!.events]).toEqual([3, 1, 2]);
  });

  it("throws on impossible histories, naming the function", () => {
    expect(() => meanCumulativeFunction([{ end: 5, events: [6] }])).toThrow(
      "meanCumulativeFunction: units[0].events[0] is after the end of that unit's history",
    );
    expect(() => meanCumulativeFunction([{ end: -1, events: [] }])).toThrow(
      /^meanCumulativeFunction: units\[0\]\.end/,
    );
    expect(() => meanCumulativeFunction([{ end: 5, events: [{ at: 1, value: -3 }] }])).toThrow(
      /^meanCumulativeFunction: units\[0\]\.events\[0\]\.value/,
    );
    expect(() => meanCumulativeFunction([{ end: 5, events: [Number.NaN] }])).toThrow(
      /^meanCumulativeFunction: units\[0\]\.events\[0\] age/,
    );
  });
});
