import { describe, expect, test } from "vitest";
import { demandKinds, planStock, withAbcClasses, type PlannerInput } from "@/lib/stocking";
import { jStat } from "../stats/support";

const COHORT = "Aurel|Kestrel|K2";

/** One cohort, one component ("brakes/front-pads"), one part per repair, 25,000 mi bands. */
function input(over: Partial<PlannerInput> = {}): PlannerInput {
  return {
    vehicles: [{ id: 1, cohortKey: COHORT, odometerMi: 10_000, milesPerDay: 50 }],
    rates: new Map([
      [`${COHORT}|0|brakes/front-pads`, { perMile: 0.001, upperPerMile: 0.002 }],
      [`${COHORT}|1|brakes/front-pads`, { perMile: 0.004, upperPerMile: 0.006 }],
    ]),
    componentsByCohort: new Map([[COHORT, ["brakes/front-pads"]]]),
    partUse: new Map([["*|brakes/front-pads", [{ partNumber: "K2-4805", perRepair: 1 }]]]),
    parts: [
      {
        partNumber: "K2-4805",
        description: "Front pads",
        component: "Brakes → Front pads",
        onHand: 3,
        unitCostCents: 4_000,
        leadTimeDays: 36,
      },
    ],
    bandWidthMi: 25_000,
    serviceLevel: 0.95,
    reviewDays: 14,
    defaultLeadDays: 7,
    cautious: false,
    confidence: 0.95,
    ...over,
  };
}

describe("planStock", () => {
  test("demand = rate × miles per day × (lead + review) × parts per repair; level from statistics.md §8", () => {
    // 0.001 repairs/mi × 50 mi/day × (36 + 14) days × 1 = 2.5; λ = 2.5 at 95% → 5 (statistics.md §8).
    const [plan] = planStock(input());
    expect(plan?.expectedDemand).toBeCloseTo(2.5, 12);
    expect(plan?.periodDays).toBe(50);
    expect(plan?.stockLevel).toBe(5);
    expect(plan?.reorder).toBe(2);
    expect(plan?.annualDemand).toBeCloseTo(0.05 * 365, 12);
    expect(plan?.annualValueCents).toBeCloseTo(0.05 * 365 * 4_000, 8);
  });

  test("expected shortfall matches the published order-up-to table (mean 1.25, stock 2 → 0.18114)", () => {
    // 0.001 × 25 mi/day × 50 days = 1.25; the table in statistics.md §8.
    const [plan] = planStock(
      input({
        vehicles: [{ id: 1, cohortKey: COHORT, odometerMi: 10_000, milesPerDay: 25 }],
        parts: [{ ...input().parts[0]!, onHand: 2 }],
      }),
    );
    expect(plan?.expectedDemand).toBeCloseTo(1.25, 12);
    expect(plan?.shortfallOnHand).toBeCloseTo(0.18114, 5);
  });

  test("the cautious option uses each rate's upper bound", () => {
    const [plan] = planStock(input({ cautious: true }));
    expect(plan?.expectedDemand).toBeCloseTo(0.002 * 50 * 50, 12);
  });

  test("a vehicle about to cross a band is planned with the band it will be in mid-period", () => {
    // 24,000 mi + 50 mi/day × 57 days / 2 = 25,425 mi: band 1 (rate 0.004).
    const [plan] = planStock(
      input({ vehicles: [{ id: 1, cohortKey: COHORT, odometerMi: 24_000, milesPerDay: 50 }] }),
    );
    expect(plan?.expectedDemand).toBeCloseTo(0.004 * 50 * 50, 12);
  });

  test("a per-cohort part mix wins over the all-cohort one; lead-time override; unknown parts", () => {
    const plans = planStock(
      input({
        overrideLeadDays: 6,
        partUse: new Map([
          [`${COHORT}|brakes/front-pads`, [{ partNumber: "K2-9999", perRepair: 2 }]],
          ["*|brakes/front-pads", [{ partNumber: "K2-4805", perRepair: 1 }]],
        ]),
      }),
    );
    const unknown = plans.find((p) => p.partNumber === "K2-9999");
    expect(unknown?.isStocked).toBe(false);
    expect(unknown?.onHand).toBe(0);
    expect(unknown?.expectedDemand).toBeCloseTo(0.001 * 50 * 20 * 2, 12);
    // The shelf part nobody needs now plans a stock of 0 and no reorder.
    const shelf = plans.find((p) => p.partNumber === "K2-4805");
    expect(shelf?.expectedDemand).toBe(0);
    expect(shelf?.stockLevel).toBe(0);
    expect(shelf?.reorder).toBe(0);
  });

  test("vehicles of a cohort without cells, or not driving, add no demand", () => {
    const [plan] = planStock(
      input({
        vehicles: [
          { id: 1, cohortKey: "Ostra|Wren|W2", odometerMi: 10_000, milesPerDay: 50 },
          { id: 2, cohortKey: COHORT, odometerMi: 10_000, milesPerDay: 0 },
        ],
      }),
    );
    expect(plan?.expectedDemand).toBe(0);
    expect(plan?.vehicles).toBe(0);
  });
});

describe("the expected demand's interval (the rates' gamma posteriors)", () => {
  // Band 0's rate as Gamma(shape 5, rate 5,000 mi): mean 0.001 a mile, the point rate above.
  const posterior = { shape: 5, exposureMi: 5_000 };
  const withPosterior = (vehicles: PlannerInput["vehicles"]) =>
    input({
      vehicles,
      rates: new Map([
        [`${COHORT}|0|brakes/front-pads`, { perMile: 0.001, upperPerMile: 0.002, posterior }],
      ]),
    });

  test("one vehicle: demand = 2,500 mi × rate, so Gamma(5, scale 0.5); quantiles from jstat", () => {
    // 50 mi/day × 50 days = 2,500 mi; 2,500 × Gamma(5, rate 5,000) = Gamma(5, scale 0.5).
    // jstat (an independent reference library) gives its 2.5% and 97.5% points.
    const [plan] = planStock(
      withPosterior([{ id: 1, cohortKey: COHORT, odometerMi: 10_000, milesPerDay: 50 }]),
    );
    expect(plan!.expectedDemand).toBeCloseTo(2.5, 12);
    expect(plan!.demandLower).toBeCloseTo(jStat.gamma.inv(0.025, 5, 0.5), 6);
    expect(plan!.demandUpper).toBeCloseTo(jStat.gamma.inv(0.975, 5, 0.5), 6);
  });

  test("two vehicles of one cell share its rate: the miles add up, the interval is not narrowed", () => {
    // One rate times 5,000 mi in all: Gamma(5, scale 1). Treating the two vehicles as
    // independent draws would give Gamma(10, scale 0.5), a narrower interval.
    const [plan] = planStock(
      withPosterior([
        { id: 1, cohortKey: COHORT, odometerMi: 10_000, milesPerDay: 50 },
        { id: 2, cohortKey: COHORT, odometerMi: 12_000, milesPerDay: 50 },
      ]),
    );
    expect(plan!.expectedDemand).toBeCloseTo(5, 12);
    expect(plan!.demandLower).toBeCloseTo(jStat.gamma.inv(0.025, 5, 1), 6);
    expect(plan!.demandUpper).toBeCloseTo(jStat.gamma.inv(0.975, 5, 1), 6);
  });

  test("no interval with the cautious option or a cell without its posterior; 0–0 for no demand", () => {
    const one = [{ id: 1, cohortKey: COHORT, odometerMi: 10_000, milesPerDay: 50 }];
    const [cautious] = planStock({ ...withPosterior(one), cautious: true });
    expect([cautious!.demandLower, cautious!.demandUpper]).toEqual([null, null]);
    // The default input's cells have no posterior.
    const [old] = planStock(input());
    expect([old!.demandLower, old!.demandUpper]).toEqual([null, null]);
    const [idle] = planStock(withPosterior([{ ...one[0]!, milesPerDay: 0 }]));
    expect([idle!.expectedDemand, idle!.demandLower, idle!.demandUpper]).toEqual([0, 0, 0]);
  });
});

describe("withAbcClasses (common practice: 80% / 95% of the yearly value)", () => {
  test("classes follow the running share of the value", () => {
    const rows = withAbcClasses([
      { id: "c", annualValueCents: 6 },
      { id: "a", annualValueCents: 70 },
      { id: "d", annualValueCents: 4 },
      { id: "b", annualValueCents: 20 },
      { id: "e", annualValueCents: null },
    ]);
    expect(rows.map((r) => `${r.id}${r.abc}`)).toEqual(["aA", "bA", "cB", "dC", "eC"]);
  });
});

describe("demandKinds: which kind of work a part's demand comes from", () => {
  test("the kinds with demand, largest first; none without demand", () => {
    expect(demandKinds({ service: 0.4, wear: 0, failure: 1.2 })).toEqual(["failure", "service"]);
    expect(demandKinds({ service: 0, wear: 2, failure: 0 })).toEqual(["wear"]);
    expect(demandKinds({ service: 0, wear: 0, failure: 0 })).toEqual([]);
    // Ties keep the order service, wear, failure.
    expect(demandKinds({ service: 1, wear: 1, failure: 1 })).toEqual([
      "service",
      "wear",
      "failure",
    ]);
  });

  test("a planned part's kinds come from the kind of the rates behind its demand", () => {
    const plan = planStock({
      vehicles: [{ id: 1, cohortKey: "A|B|1", odometerMi: 10, milesPerDay: 100 }],
      rates: new Map([
        ["A|B|1|0|component:brakes/pads", { kind: "wear", perMile: 1e-4, upperPerMile: 2e-4 }],
        ["A|B|1|0|service:brakes/pads", { kind: "service", perMile: 3e-4, upperPerMile: 4e-4 }],
      ]),
      componentsByCohort: new Map([["A|B|1", ["component:brakes/pads", "service:brakes/pads"]]]),
      partUse: new Map([["*|brakes/pads", [{ partNumber: "PAD-1", perRepair: 1 }]]]),
      parts: [],
      bandWidthMi: 25_000,
      serviceLevel: 0.95,
      reviewDays: 14,
      defaultLeadDays: 7,
      cautious: false,
      confidence: 0.9,
    });
    const [pad] = plan;
    expect(pad?.partNumber).toBe("PAD-1");
    expect(demandKinds(pad!.demandByKind)).toEqual(["service", "wear"]);
  });
});
