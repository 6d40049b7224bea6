import "server-only";
import { sql } from "drizzle-orm";
import { median } from "@/lib/at-risk";
import type { Db } from "@/db";
import type { ComponentKind } from "@/lib/component-kinds";
import { planStock, type ComponentRate, type PartUse, type PlannerVehicle } from "@/lib/stocking";
import { unitToMiles } from "@/lib/units";
import { assertCan, type OrgScope } from "./scope";

export type StockingOptions = {
  serviceLevel: number;
  /** Lead time for every part (overrides the parts list's own lead times when given). */
  leadDays?: number;
  reviewDays: number;
  /** The customer base: vehicles seen (an odometer reading) in the last N months. */
  months: number;
  cautious: boolean;
};

/** Lead time assumed for parts whose lead time the parts list does not give. */
const DEFAULT_LEAD_DAYS = 7;
/** Fewer lines than this for a component on a cohort: use the component's mix over all cohorts. */
const MIN_COHORT_LINES = 3;
/** Paces above this (miles per day, averaged over a month or more) are not believed. */
const MAX_MILES_PER_DAY = 600;

/**
 * The stocking plan of the organisation's customer base: reads the computed component cells,
 * the vehicles seen lately with their mileage per day, the parts each fix used and the parts
 * list, and hands them to the planner (lib/stocking.ts).
 */
export async function getStockingPlan(db: Db, scope: OrgScope, opts: StockingOptions) {
  assertCan(scope, "stocking:read");
  const [org] = await db.all<{
    band_width: number;
    distance_unit: "mi" | "km";
    confidence_level: number;
    as_of: string | null;
  }>(sql`
    select o.band_width, o.distance_unit, o.confidence_level,
           (select max(last_odometer_on) from vehicles where organisation_id = ${scope.organisationId}) as as_of
      from organisations o where o.id = ${scope.organisationId}`);
  if (!org) throw new Error("getStockingPlan: organisation missing");
  const bandWidthMi = unitToMiles(org.band_width, org.distance_unit);
  const asOf = org.as_of ?? new Date().toISOString().slice(0, 10);

  const rows = await db.all<{
    id: number;
    cohort: string;
    odometer: number;
    first_on: string | null;
    last_on: string | null;
    first_mi: number | null;
    last_mi: number | null;
  }>(sql`
    with readings as (
      select vehicle_id, opened_on as day, odometer_mi from visible_repair_orders
       where organisation_id = ${scope.organisationId} and odometer_mi is not null
      union all
      select vehicle_id, substr(occurred_at, 1, 10), odometer_mi from visible_fault_events
       where organisation_id = ${scope.organisationId} and odometer_mi is not null
      union all
      select vehicle_id, substr(filled_at, 1, 10), odometer_mi from visible_fuel_transactions
       where organisation_id = ${scope.organisationId} and odometer_mi is not null
      union all
      select vehicle_id, read_on, odometer_mi from visible_odometer_readings
       where organisation_id = ${scope.organisationId}
    ),
    spans as (
      select vehicle_id, min(day) as first_on, max(day) as last_on,
             min(odometer_mi) as first_mi, max(odometer_mi) as last_mi
        from readings group by vehicle_id
    )
    select v.id, v.make || '|' || v.model || '|' || coalesce(g.label, cast(v.model_year as text)) as cohort,
           v.last_odometer_mi as odometer, s.first_on, s.last_on, s.first_mi, s.last_mi
      from vehicles v
      left join generations g on g.id = v.generation_id
      left join spans s on s.vehicle_id = v.id
     where v.organisation_id = ${scope.organisationId} and v.last_odometer_mi is not null
       and v.last_odometer_on >= date(${asOf}, ${`-${opts.months} months`})`);
  // Miles per day from each vehicle's own dated readings (repairs, fault events, fill-ups, roster;
  // a span of 30 days or more), else the median
  // of its cohort, else of the whole base.
  const own = new Map<number, number>();
  for (const r of rows) {
    if (!r.first_on || !r.last_on || r.first_mi === null || r.last_mi === null) continue;
    const days = (Date.parse(r.last_on) - Date.parse(r.first_on)) / 86_400_000;
    const perDay = (r.last_mi - r.first_mi) / days;
    // A span of a month or more, and a plausible pace (an odometer typo can fake 10,000 mi/day).
    if (days >= 30 && perDay >= 0 && perDay <= MAX_MILES_PER_DAY) own.set(Number(r.id), perDay);
  }
  const byCohort = new Map<string, number[]>();
  for (const r of rows) {
    const mpd = own.get(Number(r.id));
    if (mpd !== undefined) byCohort.set(r.cohort, [...(byCohort.get(r.cohort) ?? []), mpd]);
  }
  const overall = median([...own.values()]);
  const vehicles: PlannerVehicle[] = rows.map((r) => ({
    id: Number(r.id),
    cohortKey: r.cohort,
    odometerMi: Number(r.odometer),
    milesPerDay:
      own.get(Number(r.id)) ?? (byCohort.has(r.cohort) ? median(byCohort.get(r.cohort)!) : overall),
  }));

  // Component cells (failure and wear) and service rates: the shrunk rate (steady for sparse
  // cells), the rate's upper bound, and the gamma posterior the shrunk rate is the mean of. A
  // failure component replaced by the schedule has both; its demand is their sum.
  const cells = await db.all<{
    cohort: string;
    band_index: number;
    kind: ComponentKind;
    /** The rate's key: "component:<slug>" (failure or wear) or "service:<slug>". */
    slug: string;
    shrunk: number | null;
    rate: number | null;
    upper: number | null;
    shape: number | null;
    exposure: number | null;
  }>(sql`
    select make || '|' || model || '|' || cohort_label as cohort, band_index, kind,
           fault_key as slug, shrunk_rate_per_10k as shrunk,
           rate_per_10k as rate, rate_upper as upper, posterior_shape as shape, posterior_exposure_mi as exposure
      from cell_stats
     where organisation_id = ${scope.organisationId} and fault_key like 'component:%'
    union all
    select make || '|' || model || '|' || cohort_label, band_index, kind,
           fault_key, shrunk_rate_per_10k, rate_per_10k, rate_upper,
           posterior_shape, posterior_exposure_mi
      from service_rates
     where organisation_id = ${scope.organisationId}`);
  const rates = new Map<string, ComponentRate>();
  const componentsByCohort = new Map<string, string[]>();
  for (const c of cells) {
    const point = c.shrunk ?? c.rate ?? 0;
    rates.set(`${c.cohort}|${c.band_index}|${c.slug}`, {
      kind: c.kind,
      perMile: point / 10_000,
      upperPerMile: Math.max(point, c.upper ?? point) / 10_000,
      posterior:
        c.shrunk !== null &&
        c.shape !== null &&
        c.exposure !== null &&
        c.shape > 0 &&
        c.exposure > 0
          ? { shape: Number(c.shape), exposureMi: Number(c.exposure) }
          : undefined,
    });
    const list = componentsByCohort.get(c.cohort) ?? [];
    if (!list.includes(c.slug)) list.push(c.slug);
    componentsByCohort.set(c.cohort, list);
  }

  // Parts per repair, from the part numbers written on the repair lines of each component.
  const uses = await db.all<{
    cohort: string;
    slug: string;
    part_numbers: string | null;
    n: number;
  }>(sql`
    select v.make || '|' || v.model || '|' || coalesce(g.label, cast(v.model_year as text)) as cohort,
           k.slug, l.part_numbers, count(*) as n
      from visible_repair_lines l
      join vehicles v on v.id = l.vehicle_id
      left join generations g on g.id = v.generation_id
      join components k on k.id = l.component_id
     where l.organisation_id = ${scope.organisationId}
     group by 1, 2, 3`);
  const partUse = new Map<string, PartUse[]>();
  const tally = new Map<string, { lines: number; parts: Map<string, number> }>();
  for (const u of uses) {
    for (const key of [`${u.cohort}|${u.slug}`, `*|${u.slug}`]) {
      const t = tally.get(key) ?? { lines: 0, parts: new Map<string, number>() };
      t.lines += Number(u.n);
      for (const p of (u.part_numbers ?? "").split(/[\s;,]+/).filter(Boolean)) {
        t.parts.set(p, (t.parts.get(p) ?? 0) + Number(u.n));
      }
      tally.set(key, t);
    }
  }
  for (const [key, t] of tally) {
    if (!key.startsWith("*|") && t.lines < MIN_COHORT_LINES) continue;
    partUse.set(
      key,
      [...t.parts].map(([partNumber, n]) => ({ partNumber, perRepair: n / t.lines })),
    );
  }

  const parts = await db.all<{
    part_number: string;
    description: string;
    component: string | null;
    on_hand: number;
    unit_cost_cents: number | null;
    lead_time_days: number | null;
  }>(sql`
    select p.part_number, p.description, k.system || ' → ' || k.name as component, p.on_hand,
           p.unit_cost_cents, p.lead_time_days
      from parts p left join components k on k.id = p.component_id
     where p.organisation_id = ${scope.organisationId}`);

  const plan = planStock({
    vehicles,
    rates,
    componentsByCohort,
    partUse,
    parts: parts.map((p) => ({
      partNumber: p.part_number,
      description: p.description,
      component: p.component,
      onHand: Number(p.on_hand),
      unitCostCents: p.unit_cost_cents === null ? null : Number(p.unit_cost_cents),
      leadTimeDays: p.lead_time_days === null ? null : Number(p.lead_time_days),
    })),
    bandWidthMi,
    serviceLevel: opts.serviceLevel,
    reviewDays: opts.reviewDays,
    defaultLeadDays: DEFAULT_LEAD_DAYS,
    overrideLeadDays: opts.leadDays,
    cautious: opts.cautious,
    confidence: Number(org.confidence_level),
  });
  return {
    asOf,
    vehicles: vehicles.length,
    vehiclesWithOwnMileage: own.size,
    defaultLeadDays: DEFAULT_LEAD_DAYS,
    options: opts,
    confidence: Number(org.confidence_level),
    parts: plan,
  };
}
export type StockingPlan = Awaited<ReturnType<typeof getStockingPlan>>;
