/**
 * The parts stocking planner's arithmetic (pure). Expected demand per part over its lead time +
 * review period = Σ over the customer base's vehicles and the components that fail on them of
 * (repairs per mile for the vehicle's cohort and mileage band × the vehicle's expected miles per
 * day × days) × parts of that number per repair (statistics.md §8). The stock level is the
 * Poisson quantile at the service level (poissonStockLevel); ABC classes by annual demand value
 * (common practice: A = the parts making the first 80% of the value, B the next 15%, C the rest;
 * Silver, Pyke & Peterson 1998, ch. 3).
 */
import { COMPONENT_KINDS, type ComponentKind } from "@/lib/component-kinds";
import { expectedShortfall, gammaSumInterval, poissonStockLevel } from "@/lib/stats";

export type PlannerVehicle = {
  id: number;
  /** "make|model|cohort label", as the computed cells name cohorts. */
  cohortKey: string;
  odometerMi: number;
  milesPerDay: number;
};

/**
 * Repairs per mile of one component in one cohort × band: point estimate, upper bound, and the
 * rate's gamma posterior (shape, rate in miles) whose mean the point estimate is — absent for
 * cells computed before posteriors were stored.
 */
export type ComponentRate = {
  /** The kind of the repair lines behind the rate (service, wear or failure). */
  kind?: ComponentKind;
  perMile: number;
  upperPerMile: number;
  posterior?: { shape: number; exposureMi: number };
};

/** How many of a part one repair of a component uses, for a cohort or for every cohort. */
export type PartUse = { partNumber: string; perRepair: number };

export type StockedPart = {
  partNumber: string;
  description: string | null;
  component: string | null;
  onHand: number;
  unitCostCents: number | null;
  leadTimeDays: number | null;
};

export type PlannerInput = {
  vehicles: PlannerVehicle[];
  /** Key "cohortKey|band|componentSlug" → rate. */
  rates: ReadonlyMap<string, ComponentRate>;
  /**
   * Components with a rate, per cohort: "cohortKey" → rate keys, a component slug or its slug
   * after a prefix ("component:<slug>", "service:<slug>": one component can have both).
   */
  componentsByCohort: ReadonlyMap<string, readonly string[]>;
  /** Key "cohortKey|componentSlug", falling back to "*|componentSlug" → parts per repair. */
  partUse: ReadonlyMap<string, readonly PartUse[]>;
  parts: StockedPart[];
  bandWidthMi: number;
  serviceLevel: number;
  /** Days between orders; added to each part's lead time. */
  reviewDays: number;
  /** Lead time for parts without one (and for all parts when `overrideLeadDays` is set). */
  defaultLeadDays: number;
  overrideLeadDays?: number;
  /** Use the upper confidence bound of each rate (the cautious option). */
  cautious: boolean;
  /** Level of the expected demand's interval (the organisation's confidence level). */
  confidence: number;
};

export type PartPlan = StockedPart & {
  periodDays: number;
  /** Expected demand over lead time + review period. */
  expectedDemand: number;
  /**
   * Its interval at `confidence` from the uncertainty of the rates (their gamma posteriors,
   * summed): null with the cautious option (the demand is then already an upper bound) or when
   * a contributing cell has no posterior.
   */
  demandLower: number | null;
  demandUpper: number | null;
  stockLevel: number;
  reorder: number;
  /** Expected units short per period with the stock on hand, and with the stock level. */
  shortfallOnHand: number;
  shortfallAtLevel: number;
  annualDemand: number;
  annualValueCents: number | null;
  abc: "A" | "B" | "C";
  isStocked: boolean;
  /** Vehicles of the customer base that contribute demand. */
  vehicles: number;
  /** Expected demand over the period by the kind of work behind it (service, wear, failure). */
  demandByKind: Record<ComponentKind, number>;
};

/** Which band an odometer reading falls in. */
const bandOf = (mi: number, width: number) => Math.floor(Math.max(0, mi) / width);

/**
 * Plans stock for every part that a repair of the base's vehicles is expected to use, and for
 * every part on the shelf (a shelf part nobody is expected to need plans a stock of 0).
 */
export function planStock(input: PlannerInput): PartPlan[] {
  const periodOf = (leadTimeDays: number | null) =>
    (input.overrideLeadDays ?? leadTimeDays ?? input.defaultLeadDays) + input.reviewDays;
  // Demand per day by part for a period length: each vehicle is planned with the band it will
  // be in halfway through the period (periods differ by part, through their lead times).
  const demandByPeriod = new Map<number, ReturnType<typeof dailyDemand>>();
  const dailyDemandFor = (periodDays: number) => {
    let d = demandByPeriod.get(periodDays);
    if (!d) demandByPeriod.set(periodDays, (d = dailyDemand(input, periodDays)));
    return d;
  };
  const defaultPeriod = periodOf(null);
  const shelf = new Map(input.parts.map((p) => [p.partNumber, p]));
  const numbers = new Set([...shelf.keys(), ...dailyDemandFor(defaultPeriod).perDay.keys()]);
  const plans: Omit<PartPlan, "abc">[] = [...numbers].map((partNumber) => {
    const part = shelf.get(partNumber) ?? {
      partNumber,
      description: null,
      component: null,
      onHand: 0,
      unitCostCents: null,
      leadTimeDays: null,
    };
    const periodDays = periodOf(part.leadTimeDays);
    const demand = dailyDemandFor(periodDays);
    const daily = demand.perDay.get(partNumber) ?? 0;
    const expectedDemand = daily * periodDays;
    const interval = input.cautious ? null : demandInterval(demand, partNumber, periodDays, input);
    const stockLevel = poissonStockLevel(expectedDemand, input.serviceLevel);
    const annualDemand = daily * 365;
    return {
      ...part,
      periodDays,
      expectedDemand,
      demandLower: interval?.lower ?? null,
      demandUpper: interval?.upper ?? null,
      stockLevel,
      reorder: Math.max(0, stockLevel - part.onHand),
      shortfallOnHand: expectedShortfall(expectedDemand, part.onHand),
      shortfallAtLevel: expectedShortfall(expectedDemand, stockLevel),
      annualDemand,
      annualValueCents: part.unitCostCents === null ? null : annualDemand * part.unitCostCents,
      isStocked: shelf.has(partNumber),
      vehicles: demand.contributors.get(partNumber)?.size ?? 0,
      demandByKind: {
        service: (demand.byKind.get(partNumber)?.service ?? 0) * periodDays,
        wear: (demand.byKind.get(partNumber)?.wear ?? 0) * periodDays,
        failure: (demand.byKind.get(partNumber)?.failure ?? 0) * periodDays,
      },
    };
  });
  return withAbcClasses(plans);
}

/**
 * The interval of a part's expected demand over the period: each contributing cell's rate is
 * its gamma posterior, weighted by the miles × parts per repair it was multiplied by; the
 * weighted sum of independent gammas by gammaSumInterval (as lib/at-risk.ts does for one
 * vehicle). Null when a contributing cell has no posterior; 0–0 for a part nobody needs.
 */
function demandInterval(
  demand: ReturnType<typeof dailyDemand>,
  partNumber: string,
  periodDays: number,
  input: PlannerInput,
): { lower: number; upper: number } | null {
  const weights = demand.weightsPerDay.get(partNumber);
  if (!weights) return { lower: 0, upper: 0 };
  const terms = [];
  for (const [cellKey, perDay] of weights) {
    const posterior = input.rates.get(cellKey)?.posterior;
    if (!posterior) return null;
    terms.push({ shape: posterior.shape, rate: posterior.exposureMi, weight: perDay * periodDays });
  }
  const { lower, upper } = gammaSumInterval(terms, input.confidence);
  return { lower, upper };
}

/** Expected part uses per day across the vehicles, for a planning period of `periodDays`. */
function dailyDemand(input: PlannerInput, periodDays: number) {
  const perDay = new Map<string, number>();
  const contributors = new Map<string, Set<number>>();
  // Part → cell key → miles per day × parts per repair: what multiplies that cell's rate.
  const weightsPerDay = new Map<string, Map<string, number>>();
  const byKind = new Map<string, Record<ComponentKind, number>>();
  for (const v of input.vehicles) {
    const band = bandOf(v.odometerMi + (v.milesPerDay * periodDays) / 2, input.bandWidthMi);
    for (const slug of input.componentsByCohort.get(v.cohortKey) ?? []) {
      const cellKey = `${v.cohortKey}|${band}|${slug}`;
      const rate = input.rates.get(cellKey);
      if (!rate) continue;
      const repairsPerDay = (input.cautious ? rate.upperPerMile : rate.perMile) * v.milesPerDay;
      if (!(repairsPerDay > 0)) continue;
      const component = slug.slice(slug.indexOf(":") + 1);
      const uses =
        input.partUse.get(`${v.cohortKey}|${component}`) ??
        input.partUse.get(`*|${component}`) ??
        [];
      for (const use of uses) {
        const kinds = byKind.get(use.partNumber) ?? { service: 0, wear: 0, failure: 0 };
        kinds[rate.kind ?? "failure"] += repairsPerDay * use.perRepair;
        byKind.set(use.partNumber, kinds);
        perDay.set(
          use.partNumber,
          (perDay.get(use.partNumber) ?? 0) + repairsPerDay * use.perRepair,
        );
        const set = contributors.get(use.partNumber) ?? new Set<number>();
        set.add(v.id);
        contributors.set(use.partNumber, set);
        const weights = weightsPerDay.get(use.partNumber) ?? new Map<string, number>();
        weights.set(cellKey, (weights.get(cellKey) ?? 0) + v.milesPerDay * use.perRepair);
        weightsPerDay.set(use.partNumber, weights);
      }
    }
  }
  return { perDay, contributors, weightsPerDay, byKind };
}

/**
 * A, B, C by annual demand value: sorted by value, a part is A while the running total before it
 * is under 80% of the whole, B under 95%, C after (parts with no known cost or no demand are C).
 */
export function withAbcClasses<T extends { annualValueCents: number | null }>(
  rows: T[],
): (T & { abc: "A" | "B" | "C" })[] {
  const sorted = [...rows].sort((a, b) => (b.annualValueCents ?? 0) - (a.annualValueCents ?? 0));
  const total = sorted.reduce((s, r) => s + (r.annualValueCents ?? 0), 0);
  let before = 0;
  return sorted.map((r) => {
    const value = r.annualValueCents ?? 0;
    const share = total > 0 ? before / total : 1;
    before += value;
    const abc = value <= 0 ? "C" : share < 0.8 ? "A" : share < 0.95 ? "B" : "C";
    return { ...r, abc };
  });
}

/**
 * The kinds of work a part's demand comes from, largest share first (stable for ties: service,
 * wear, failure); none for a part with no expected demand.
 */
export function demandKinds(byKind: Readonly<Record<ComponentKind, number>>): ComponentKind[] {
  return COMPONENT_KINDS.filter((k) => byKind[k] > 0).sort((a, b) => byKind[b] - byKind[a]);
}
