import { describe, expect, test } from "vitest";
import { analyseComebacks, correctionAction, fixOf, type ComebackLine } from "@/lib/comeback-rates";
import { wilsonInterval } from "@/lib/stats";

// Recurra's default window (product.md, "Comeback"): 30 days or 3,000 mi, either is enough.
const WINDOW = { days: 30, miles: 3000 };
const PURGE = { slug: "fuel-vapour/purge-valve", system: "Fuel vapour", name: "Purge valve" };
const PADS = { slug: "brakes/front-pads", system: "Brakes", name: "Front pads" };

let nextId = 1;
function line(
  vehicleId: number,
  openedOn: string,
  odometerMi: number | null,
  fault: { dtcs?: string[]; component?: ComebackLine["component"] },
  extra: Partial<ComebackLine> = {},
): ComebackLine {
  const id = nextId++;
  return {
    id,
    repairOrderId: id,
    roNumber: `RO-${id}`,
    vehicleId,
    openedOn,
    odometerMi,
    dtcs: fault.dtcs ?? [],
    component: fault.component ?? null,
    complaint: null,
    cause: null,
    correction: "Replaced part",
    technician: "Ada",
    vendor: null,
    ...extra,
  };
}

describe("analyseComebacks on hand-built timelines", () => {
  test("lines of one vehicle on the same day are one visit, not a comeback", () => {
    const a = analyseComebacks(
      [
        line(1, "2025-03-01", 10_000, { component: PURGE }),
        line(1, "2025-03-01", 10_000, { component: PURGE }),
      ],
      WINDOW,
    );
    expect(a.pairs).toEqual([]);
    expect(a.comebacks).toBe(0);
    expect(a.byFault[0]).toMatchObject({ repairs: 1, comebacks: 0 });
  });

  test("window edge on days: 30 days later is a comeback, 31 is not (odometer far apart)", () => {
    const inside = analyseComebacks(
      [
        line(1, "2025-03-01", 10_000, { component: PURGE }),
        line(1, "2025-03-31", 20_000, { component: PURGE }),
      ],
      WINDOW,
    );
    expect(inside.pairs).toHaveLength(1);
    expect(inside.pairs[0]).toMatchObject({ days: 30, miles: 10_000 });
    const outside = analyseComebacks(
      [
        line(1, "2025-03-01", 10_000, { component: PURGE }),
        line(1, "2025-04-01", 20_000, { component: PURGE }),
      ],
      WINDOW,
    );
    expect(outside.pairs).toHaveLength(0);
  });

  test("window edge on miles: 3,000 mi later is a comeback, 3,001 is not (months apart)", () => {
    const inside = analyseComebacks(
      [
        line(1, "2025-01-01", 10_000, { dtcs: ["P0496"] }),
        line(1, "2025-06-01", 13_000, { dtcs: ["P0496"] }),
      ],
      WINDOW,
    );
    expect(inside.pairs).toHaveLength(1);
    expect(inside.pairs[0]?.faults).toEqual(["P0496"]);
    const outside = analyseComebacks(
      [
        line(1, "2025-01-01", 10_000, { dtcs: ["P0496"] }),
        line(1, "2025-06-01", 13_001, { dtcs: ["P0496"] }),
      ],
      WINDOW,
    );
    expect(outside.pairs).toHaveLength(0);
  });

  test("odometer-only window: a return long after but few miles on is a comeback", () => {
    const a = analyseComebacks(
      [
        line(1, "2024-01-10", 50_000, { component: PURGE }),
        line(1, "2024-09-10", 50_800, { component: PURGE }),
      ],
      WINDOW,
    );
    expect(a.pairs).toHaveLength(1);
    expect(a.pairs[0]!.days).toBeGreaterThan(30);
    expect(a.pairs[0]!.miles).toBe(800);
    // Without odometer readings only the days decide: not a comeback.
    const noOdo = analyseComebacks(
      [
        line(1, "2024-01-10", null, { component: PURGE }),
        line(1, "2024-09-10", null, { component: PURGE }),
      ],
      WINDOW,
    );
    expect(noOdo.pairs).toHaveLength(0);
  });

  test("a different fault is not a comeback; another vehicle's return is not either", () => {
    const a = analyseComebacks(
      [
        line(1, "2025-03-01", 10_000, { component: PURGE, dtcs: ["P0496"] }),
        line(1, "2025-03-05", 10_200, { component: PADS }),
        line(1, "2025-03-08", 10_300, { dtcs: ["P0300"] }),
        line(2, "2025-03-06", 40_000, { component: PURGE, dtcs: ["P0496"] }),
      ],
      WINDOW,
    );
    expect(a.pairs).toEqual([]);
    expect(a.comebacks).toBe(0);
    expect(a.repairs).toBe(4);
  });

  test("a return for the same DTC and component is one comeback naming both faults", () => {
    const a = analyseComebacks(
      [
        line(1, "2025-03-01", 10_000, { component: PURGE, dtcs: ["P0496"] }),
        line(1, "2025-03-12", 10_400, { component: PURGE, dtcs: ["P0496"] }),
      ],
      WINDOW,
    );
    expect(a.pairs).toHaveLength(1);
    expect(a.pairs[0]!.faults.sort()).toEqual(["Fuel vapour → Purge valve", "P0496"]);
    expect(a.pairs[0]!.first.roNumber).not.toBe(a.pairs[0]!.again.roNumber);
    // The second visit did not come back: 1 of 2 repairs.
    expect(a.overall).toMatchObject({ repairs: 2, comebacks: 1 });
  });

  test("rates per technician, vendor and fix carry the Wilson interval (Wilson 1927)", () => {
    const lines: ComebackLine[] = [];
    // Ada: 4 purge-valve repairs, 1 comes back (vehicle 1), on vehicles 1..4.
    lines.push(line(1, "2025-01-01", 1000, { component: PURGE }, { technician: "Ada" }));
    lines.push(line(1, "2025-01-10", 1100, { component: PURGE }, { technician: "Ben" }));
    for (const v of [2, 3, 4])
      lines.push(line(v, "2025-01-01", 1000, { component: PURGE }, { technician: "Ada" }));
    // Ben's vehicle-1 repair held; Ben also did two pad jobs that held, one at a vendor.
    lines.push(line(5, "2025-01-01", 1000, { component: PADS }, { technician: "Ben" }));
    lines.push(
      line(
        6,
        "2025-01-01",
        1000,
        { component: PADS },
        { technician: "Ben", vendor: "Quay Garage" },
      ),
    );
    const a = analyseComebacks(lines, WINDOW);
    const ada = a.byTechnician.find((r) => r.key === "Ada")!;
    expect(ada).toMatchObject({ repairs: 4, comebacks: 1 });
    const w = wilsonInterval(1, 4);
    expect(ada.rate).toBeCloseTo(0.25, 12);
    expect(ada.lower).toBeCloseTo(w.lower, 12);
    expect(ada.upper).toBeCloseTo(w.upper, 12);
    // Worked by hand from Wilson's score formula (Wilson 1927, JASA 22:209–212; statistics.md
    // §1) with z = 1.95996: 1 of 4 gives 0.0456–0.6994; absolute tolerance 0.0005.
    expect(ada.lower).toBeCloseTo(0.0456, 3);
    expect(ada.upper).toBeCloseTo(0.6994, 3);
    expect(a.byTechnician.find((r) => r.key === "Ben")).toMatchObject({
      repairs: 3,
      comebacks: 0,
    });
    expect(a.byVendor.find((r) => r.key === "Quay Garage")).toMatchObject({ repairs: 1 });
    expect(a.byVendor.find((r) => r.key === "Vendor not recorded")).toMatchObject({
      repairs: 6,
      comebacks: 1,
    });
    const coaching = a.byTechnicianJob.find(
      (r) => r.technician === "Ada" && r.jobType === "Fuel vapour",
    );
    expect(coaching).toMatchObject({ repairs: 4, comebacks: 1 });
    expect(a.byFix.find((r) => r.key === "fuel-vapour/purge-valve|replace")).toMatchObject({
      repairs: 5,
      comebacks: 1,
    });
  });

  test("intervals at the organisation's confidence; DTCs named with their descriptions", () => {
    const lines = [
      line(1, "2025-01-01", 1000, { dtcs: ["P0496"] }),
      line(1, "2025-01-10", 1100, { dtcs: ["P0496"] }),
      line(2, "2025-01-01", 1000, { dtcs: ["P0496"] }),
      line(3, "2025-01-01", 1000, { component: PURGE }),
    ];
    const a = analyseComebacks(lines, WINDOW, null, {
      confidence: 0.8,
      dtcDescriptions: new Map([["P0496", "Purge flow while the valve should be shut"]]),
    });
    const w = wilsonInterval(1, 3, 0.8);
    expect(a.overall).toMatchObject({ repairs: 4, comebacks: 1 });
    const p0496 = a.byFault.find((r) => r.key === "dtc:P0496")!;
    expect(p0496.label).toBe("P0496 — Purge flow while the valve should be shut");
    expect(p0496.lower).toBeCloseTo(w.lower, 12);
    expect(p0496.upper).toBeCloseTo(w.upper, 12);
    // 80% is narrower than the default 95%.
    const at95 = analyseComebacks(lines, WINDOW).byFault.find((r) => r.key === "dtc:P0496")!;
    expect(at95.label).toBe("P0496");
    expect(p0496.upper! - p0496.lower!).toBeLessThan(at95.upper! - at95.lower!);
    expect(a.pairs[0]!.faults).toEqual(["P0496 — Purge flow while the valve should be shut"]);
    expect(a.byFault.find((r) => r.key === "component:fuel-vapour/purge-valve")!.label).toBe(
      "Fuel vapour → Purge valve",
    );
  });

  test("repairs whose window is still open are left out of the rates and counted", () => {
    const a = analyseComebacks(
      [
        line(1, "2025-01-01", 1000, { component: PURGE }),
        line(2, "2025-06-20", 1000, { component: PURGE }),
        line(3, "2025-06-30", 1000, { component: PURGE }),
        line(4, "2025-06-30", 1000, {}),
      ],
      WINDOW,
      "2025-06-30",
    );
    expect(a.stillOpen).toBe(2);
    expect(a.noFault).toBe(1);
    expect(a.repairs).toBe(1);
  });
});

describe("the fix of a repair line", () => {
  test("the first action named in the correction decides", () => {
    expect(correctionAction("Replaced purge valve, cleared codes, road tested")).toBe("replace");
    expect(correctionAction("Fitted new purge valve and hose clips")).toBe("replace");
    expect(correctionAction("Cleared codes, road tested 10 miles OK")).toBe(
      "clear codes / no fault found",
    );
    expect(correctionAction("Cleaned throttle body, idle relearn")).toBe("clean");
    expect(correctionAction("Oil service, inspected underbody")).toBe("service");
    expect(correctionAction("Road test only")).toBe("other");
    expect(correctionAction(null)).toBe("not recorded");
  });

  test("component + action; codes only when no component", () => {
    expect(fixOf(line(1, "2025-01-01", 1, { component: PURGE })).label).toBe(
      "Fuel vapour → Purge valve: replace",
    );
    expect(
      fixOf(line(1, "2025-01-01", 1, { dtcs: ["P0496"] }, { correction: "Cleared codes" })).label,
    ).toBe("Codes only (no component): clear codes / no fault found");
  });
});
