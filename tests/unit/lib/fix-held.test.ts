import { describe, expect, test } from "vitest";
import {
  describeFixHeld,
  describeWindow,
  fixHeld,
  fixHeldDetails,
  isRepairOf,
  isWindowOpen,
  type FixLine,
} from "@/lib/fix-held";
import { wilsonInterval } from "@/lib/stats";

// Sources, as labelled beside each expected value:
// - "Recurra's rule": the definition in lib/fix-held.ts (a comeback is the same vehicle back for
//   the same fault within the window: trade usage, common practice).
// - "Wilson 1927 via statistics.md": 81 of 263 → 0.2553–0.3662 at 95% (Newcombe 1998, method 3).

let nextId = 1;
function line(over: Partial<FixLine> = {}): FixLine {
  return {
    id: nextId++,
    vehicleId: 1,
    openedOn: "2024-01-01",
    odometerMi: 60_000,
    kind: "failure",
    componentSlug: null,
    codes: [],
    ...over,
  };
}

const PURGE = { component: "fuel-vapour/purge-valve", dtcs: ["P0496", "P0441"] };
const window = { days: 30, miles: 3000 };
/** The organisation's settings, with no repair left out as still open. */
const at = (confidence: number, asOf: string | null = null) => ({ window, confidence, asOf });

describe("which lines are repairs of the fault (Recurra's rule)", () => {
  test("a failure line of its component or of one of its codes; never wear or service", () => {
    expect(isRepairOf(line({ componentSlug: PURGE.component }), PURGE)).toBe(true);
    expect(isRepairOf(line({ codes: ["P0441"] }), PURGE)).toBe(true);
    expect(isRepairOf(line({ codes: ["P0300"] }), PURGE)).toBe(false);
    expect(isRepairOf(line({ componentSlug: "brakes/front-pads" }), PURGE)).toBe(false);
    expect(isRepairOf(line({ kind: "service", componentSlug: PURGE.component }), PURGE)).toBe(
      false,
    );
    expect(isRepairOf(line({ kind: "wear", codes: ["P0496"] }), PURGE)).toBe(false);
  });
});

describe("how often the fix held (Recurra's rule)", () => {
  test("visits of the fault; one followed by the fault again within the window did not hold", () => {
    const lines = [
      // Vehicle 1: two lines on one day are one visit; back 10 days later with the code: the
      // first visit did not hold, the second did.
      line({
        vehicleId: 1,
        openedOn: "2024-01-01",
        componentSlug: "fuel-vapour/filler-cap",
        codes: ["P0496"],
      }),
      line({ vehicleId: 1, openedOn: "2024-01-01", componentSlug: PURGE.component }),
      line({ vehicleId: 1, openedOn: "2024-01-11", componentSlug: PURGE.component }),
      // Vehicle 2: back 40 days later but only 1,000 mi further on: within the distance.
      line({ vehicleId: 2, openedOn: "2024-02-01", odometerMi: 10_000, codes: ["P0441"] }),
      line({ vehicleId: 2, openedOn: "2024-03-12", odometerMi: 11_000, codes: ["P0441"] }),
      // Vehicle 3: an unrelated repair a week later, and scheduled service: held.
      line({ vehicleId: 3, openedOn: "2024-03-01", componentSlug: PURGE.component }),
      line({ vehicleId: 3, openedOn: "2024-03-08", componentSlug: "brakes/front-pads" }),
      line({
        vehicleId: 3,
        openedOn: "2024-03-09",
        kind: "service",
        componentSlug: PURGE.component,
      }),
      // Vehicle 4: back after 200 days and 9,000 mi: outside both, held.
      line({ vehicleId: 4, openedOn: "2024-01-01", odometerMi: 20_000, codes: ["P0496"] }),
      line({ vehicleId: 4, openedOn: "2024-07-19", odometerMi: 29_000, codes: ["P0496"] }),
    ];
    const f = fixHeld(lines, PURGE, at(0.95))!;
    // Visits: v1 ×2, v2 ×2, v3 ×1, v4 ×2 = 7; comebacks: v1 (10 days), v2 (1,000 mi) = 2.
    expect(f).toMatchObject({ fixes: 7, comebacks: 2, held: 5, confidence: 0.95, window });
    expect(f.estimate).toBeCloseTo(5 / 7, 12);
    expect(f.lower).toBeCloseTo(wilsonInterval(5, 7, 0.95).lower, 12);
    expect(f.upper).toBeCloseTo(wilsonInterval(5, 7, 0.95).upper, 12);
    // The interval follows the confidence asked for: narrower at 90% than at 95%.
    const at90 = fixHeld(lines, PURGE, at(0.9))!;
    expect(at90.held).toBe(5);
    expect(at90.upper - at90.lower).toBeLessThan(f.upper - f.lower);
    // Nothing repaired the fault: no figure.
    expect(fixHeld(lines, { component: "x/none", dtcs: [] }, at(0.95))).toBeNull();
  });

  test("the interval is Wilson's (Wilson 1927 via statistics.md: 81/263 → 0.2553–0.3662 at 95%)", () => {
    // 81 chains of visits, each a week apart (so each visit but the last of a chain is a
    // comeback's first): 80 vehicles with 3 visits and one with 23, 263 visits, 81 held.
    const visits = (vehicleId: number, n: number) =>
      Array.from({ length: n }, (_, i) =>
        line({
          vehicleId,
          openedOn: new Date(Date.UTC(2024, 0, 1 + 7 * i)).toISOString().slice(0, 10),
          odometerMi: null,
          codes: ["P0496"],
        }),
      );
    const lines = [
      ...Array.from({ length: 80 }, (_, v) => visits(100 + v, 3)).flat(),
      ...visits(999, 23),
    ];
    const f = fixHeld(lines, PURGE, at(0.95))!;
    expect(f).toMatchObject({ fixes: 263, comebacks: 182, held: 81 });
    expect(f.lower).toBeCloseTo(0.2553, 4); // absolute tolerance 5e-5
    expect(f.upper).toBeCloseTo(0.3662, 4);
  });
});

describe("a repair too recent to tell (Recurra's rule, as on the comebacks screen)", () => {
  test("repairs less than the window's days before the latest on record are left out and counted", () => {
    const lines = [
      // Held: 2024-01-01, nothing after it.
      line({ vehicleId: 1, openedOn: "2024-01-01", codes: ["P0496"] }),
      // A comeback pair whose first visit (2024-05-20) is 12 days before the latest repair: both
      // visits are still open, so neither the repair nor its comeback is counted.
      line({ vehicleId: 2, openedOn: "2024-05-20", codes: ["P0496"] }),
      line({ vehicleId: 2, openedOn: "2024-05-25", codes: ["P0496"] }),
      // A repair on 2024-05-01 (31 days before the latest): its window has passed; it came back
      // on 2024-05-28 (27 days later), so it did not hold.
      line({ vehicleId: 3, openedOn: "2024-05-01", codes: ["P0441"] }),
      line({ vehicleId: 3, openedOn: "2024-05-28", codes: ["P0441"] }),
      // The latest repair on record, of another fault.
      line({ vehicleId: 4, openedOn: "2024-06-01", componentSlug: "brakes/front-pads" }),
    ];
    const f = fixHeld(lines, PURGE, at(0.95, "2024-06-01"))!;
    // Passed: v1 2024-01-01, v3 2024-05-01 = 2 (v3 came back); open: v2 ×2, v3 2024-05-28 = 3.
    expect(f).toMatchObject({ fixes: 2, held: 1, comebacks: 1, stillOpen: 3 });
    // Without a latest day, nothing is left out (3 pairs' first visits, 2 came back).
    expect(fixHeld(lines, PURGE, at(0.95))).toMatchObject({ fixes: 5, comebacks: 2, stillOpen: 0 });
    // Exactly 30 days before the latest: its window ends on the latest day, so it has passed.
    expect(isWindowOpen("2024-05-03", "2024-06-01", 30)).toBe(true);
    expect(isWindowOpen("2024-05-02", "2024-06-01", 30)).toBe(false);

    expect(isWindowOpen("2020-01-01", null, 30)).toBe(false);
    // Every repair still open: a figure with no repairs counted, said as "too early".
    const early = fixHeld(lines.slice(1, 3), PURGE, at(0.95, "2024-06-01"))!;
    expect(early).toMatchObject({ fixes: 0, stillOpen: 2 });
    expect(describeFixHeld(early, "mi")).toBe(
      "Too early to tell: all 2 repairs of this fault are within 30 days of the latest on record.",
    );
    expect(describeFixHeld(f, "mi")).toMatch(
      /^The fix held in 1 of 2 repairs \(50%\), .*; 1 came back within 30 days or 3,000 mi\. 3 more repairs are too recent to tell \(within 30 days of the latest on record\)\.$/,
    );
  });
});

describe("the figure in words", () => {
  test("held of repairs, the share, its likely range and the comebacks with their window", () => {
    const f = {
      fixes: 263,
      stillOpen: 0,
      held: 81,
      comebacks: 182,
      // Wilson 1927 via statistics.md: 81/263 → 0.2553–0.3662 at 95%.
      estimate: 81 / 263,
      lower: 0.2553,
      upper: 0.3662,
      confidence: 0.95,
      window,
    };
    expect(describeFixHeld(f, "mi")).toBe(
      "The fix held in 81 of 263 repairs (31%), likely between 26% and 37%; 182 came back within 30 days or 3,000 mi.",
    );
    expect(describeFixHeld(null, "mi")).toBe("No repairs of this fault on record yet.");
    // 1 mi = 1.609344 km (NIST SP 811): 3,000 mi is 4,828 km.
    expect(describeWindow(window, "km")).toBe("30 days or 4,828 km");
    const details = Object.fromEntries(fixHeldDetails(f, "mi"));
    expect(details["95% interval"]).toBe("25.5% to 36.6%");
    expect(details.Method).toBe("Wilson score interval (Wilson 1927)");
  });
});
