import "server-only";
import { sql } from "drizzle-orm";
import type { Db } from "@/db";
import {
  expectedFailures,
  expectedFailuresInterval,
  median,
  milesByBand,
  type BandPosterior,
} from "@/lib/at-risk";
import { faultName } from "@/lib/plain-words";
import { unitToMiles } from "@/lib/units";
import { getKnownIssueEvidence } from "./known-issue-evidence";
import { getKnownIssue, listKnownIssues } from "./known-issues";
import { assertCan, type OrgScope } from "./scope";

export type AtRiskRow = {
  vehicleId: number;
  unitNumber: string | null;
  vin: string | null;
  cohort: string;
  odometerMi: number;
  /** Why: a confirmed known issue, or a computed signal (cohort × band × fault). */
  source:
    | { kind: "known-issue"; id: number; title: string }
    | {
        kind: "signal";
        faultKey: string;
        /** The fault by name: "P0496 — …" or "Power distribution → Body ground strap". */
        label: string;
      };
  rangeFromMi: number | null;
  rangeToMi: number | null;
  /** Miles until the range starts (0 inside it). */
  toRangeMi: number;
  /** Expected failures of this fault over the next `nextMiles`. */
  expected: number;
  /**
   * Its interval at the organisation's confidence level, from the bands' gamma posteriors
   * (lib/at-risk.ts expectedFailuresInterval); null when the cells predate stored posteriors.
   */
  expectedLower: number | null;
  expectedUpper: number | null;
  /** A proactive fix: parts + typical hours at the organisation's median labour rate. */
  fixCostCents: number | null;
};

/** One "make|model|label|faultKey": its rate per mile by band, and the rates' posteriors. */
type CohortFaultRates = { rates: Map<number, number>; posteriors: Map<number, BandPosterior> };

/** Rates per mile by band for each "make|model|label|faultKey", from the computed cells. */
async function ratesByCohortFault(db: Db, scope: OrgScope) {
  const rows = await db.all<{
    k: string;
    band_index: number;
    rate: number | null;
    shape: number | null;
    exposure: number | null;
  }>(sql`
    select make || '|' || model || '|' || cohort_label || '|' || fault_key as k, band_index,
           coalesce(shrunk_rate_per_10k, rate_per_10k) as rate,
           posterior_shape as shape, posterior_exposure_mi as exposure
      from cell_stats where organisation_id = ${scope.organisationId} and fault_key <> 'all'`);
  const out = new Map<string, CohortFaultRates>();
  for (const r of rows) {
    const m = out.get(r.k) ?? { rates: new Map(), posteriors: new Map() };
    m.rates.set(Number(r.band_index), Number(r.rate ?? 0) / 10_000);
    if (r.shape !== null && r.exposure !== null && r.shape > 0 && r.exposure > 0) {
      m.posteriors.set(Number(r.band_index), {
        shape: Number(r.shape),
        exposureMi: Number(r.exposure),
      });
    }
    out.set(r.k, m);
  }
  return out;
}

const NO_RATES: CohortFaultRates = { rates: new Map(), posteriors: new Map() };

/**
 * The expected failures of a vehicle over the next miles and their interval at the
 * organisation's confidence. No interval when a band the vehicle drives through has a rate but
 * no posterior (cells computed before posteriors were stored): the next recompute gives one.
 */
function expectedWithInterval(
  odometerMi: number,
  nextMiles: number,
  bandWidthMi: number,
  cohortFault: CohortFaultRates,
  confidence: number,
): Pick<AtRiskRow, "expected" | "expectedLower" | "expectedUpper"> {
  const miles = milesByBand(odometerMi, nextMiles, bandWidthMi);
  const expected = expectedFailures(miles, cohortFault.rates);
  const isComplete = miles.every(
    ([band]) => !(cohortFault.rates.get(band) ?? 0) || cohortFault.posteriors.has(band),
  );
  if (!isComplete) return { expected, expectedLower: null, expectedUpper: null };
  const interval = expectedFailuresInterval(miles, cohortFault.posteriors, confidence);
  return { expected, expectedLower: interval.lower, expectedUpper: interval.upper };
}

/**
 * The at-risk watch-list: vehicles in cohorts with a confirmed known issue or a signal whose
 * latest odometer is inside its mileage range or within one band before it, and not yet
 * repaired for it; with the expected failures over the next miles and the cost of fixing first.
 */
export async function getAtRiskVehicles(db: Db, scope: OrgScope, opts: { nextMiles: number }) {
  assertCan(scope, "campaigns:manage");
  const [org] = await db.all<{
    band_width: number;
    distance_unit: "mi" | "km";
    confidence_level: number;
  }>(sql`
    select band_width, distance_unit, confidence_level from organisations
     where id = ${scope.organisationId}`);
  if (!org) throw new Error("getAtRiskVehicles: organisation missing");
  const bandWidthMi = unitToMiles(org.band_width, org.distance_unit);
  const confidence = Number(org.confidence_level);
  const rates = await ratesByCohortFault(db, scope);
  // The organisation's labour rate: the median of labour cost per hour on its repair lines.
  const labour = await db.all<{ per_hour: number }>(sql`
    select labor_cost_cents * 1.0 / labor_hours as per_hour from visible_repair_lines
     where organisation_id = ${scope.organisationId} and labor_hours > 0 and labor_cost_cents > 0`);
  const labourPerHourCents = median(labour.map((l) => Number(l.per_hour)));
  const rows: AtRiskRow[] = [];
  const seen = new Set<string>();

  for (const item of await listKnownIssues(db, scope, { state: "confirmed" })) {
    const issue = await getKnownIssue(db, scope, item.id);
    if (!issue) continue;
    const evidence = await getKnownIssueEvidence(db, scope, issue);
    const faultKey = issue.component
      ? `component:${issue.component.slug}`
      : `dtc:${issue.dtcCodes[0]}`;
    // Parts at list cost when the parts list prices them all, else the average parts cost of
    // past repairs of its component; plus its typical hours at the median labour rate.
    const listed = issue.parts.reduce(
      (s, p) => (s === null || p.unitCostCents === null ? null : s + p.unitCostCents * p.quantity),
      issue.parts.length > 0 ? 0 : (null as number | null),
    );
    const [past] = issue.component
      ? await db.all<{ avg: number | null }>(sql`
          select avg(l.parts_cost_cents) as avg from visible_repair_lines l
           where l.organisation_id = ${scope.organisationId} and l.parts_cost_cents is not null
             and l.component_id = (select id from components where slug = ${issue.component.slug})`)
      : [];
    const partsCents =
      listed ?? (past?.avg === null || past?.avg === undefined ? null : Number(past.avg));
    const fixCostCents =
      partsCents === null && issue.typicalHours === null
        ? null
        : (partsCents ?? 0) + (issue.typicalHours ?? 0) * labourPerHourCents;
    for (const v of evidence.atRisk) {
      const byBand = rates.get(`${v.make}|${v.model}|${v.generation}|${faultKey}`) ?? NO_RATES;
      seen.add(`${v.id}|${faultKey}`);
      rows.push({
        vehicleId: v.id,
        unitNumber: v.unitNumber,
        vin: v.vin,
        cohort: v.cohort,
        odometerMi: v.lastOdometerMi ?? 0,
        source: { kind: "known-issue", id: issue.id, title: issue.title },
        rangeFromMi: issue.mileageFromMi,
        rangeToMi: issue.mileageToMi,
        toRangeMi: v.toRangeMi,
        ...expectedWithInterval(
          v.lastOdometerMi ?? 0,
          opts.nextMiles,
          bandWidthMi,
          byBand,
          confidence,
        ),
        fixCostCents: fixCostCents === null ? null : Math.round(fixCostCents),
      });
    }
  }

  // Signals: vehicles of the cohort inside the band or within one band before it, never
  // repaired for the fault inside the band. One small query per signal cell (indexed), rather
  // than one join that recomputes the fault's cost for every vehicle row.
  const signalCells = await db.all<{
    make: string;
    model: string;
    label: string;
    fault_key: string;
    component_id: number | null;
    dtc: string | null;
    band_from_mi: number;
    band_to_mi: number;
    dtc_description: string | null;
    component_system: string | null;
    component_name: string | null;
  }>(sql`
    select c.make, c.model, c.cohort_label as label, c.fault_key, c.component_id, c.dtc,
           c.band_from_mi, c.band_to_mi, d.description as dtc_description,
           k.system as component_system, k.name as component_name
      from cell_stats c
      left join dtc_codes d on d.code = c.dtc
      left join components k on k.id = c.component_id
     where c.organisation_id = ${scope.organisationId} and c.is_signal = 1 and c.kind = 'failure'
       and c.fault_key <> 'all'`);
  for (const c of signalCells) {
    // The cell's own lines: failure lines of its component or DTC (never scheduled service).
    const fixes = (line: string) =>
      c.component_id !== null
        ? sql.raw(`${line}.kind = 'failure' and ${line}.component_id = ${Number(c.component_id)}`)
        : sql`${sql.raw(line)}.kind = 'failure' and exists (select 1 from visible_repair_line_codes rc where rc.repair_line_id = ${sql.raw(`${line}.id`)} and rc.dtc = ${c.dtc})`;
    const cohort = sql`v.make = ${c.make} and v.model = ${c.model}
      and coalesce((select label from generations g where g.id = v.generation_id), cast(v.model_year as text)) = ${c.label}`;
    const [cost] = await db.all<{ avg: number | null }>(sql`
      select avg(coalesce(l.parts_cost_cents, 0) + coalesce(l.labor_cost_cents, 0)) as avg
        from visible_repair_lines l join vehicles v on v.id = l.vehicle_id
       where l.organisation_id = ${scope.organisationId} and ${cohort} and ${fixes("l")}`);
    const vehiclesAtRisk = await db.all<{
      id: number;
      unit_number: string | null;
      vin: string | null;
      odometer: number;
    }>(sql`
      select v.id, v.unit_number, v.vin, v.last_odometer_mi as odometer from vehicles v
       where v.organisation_id = ${scope.organisationId} and ${cohort}
         and v.last_odometer_mi >= ${c.band_from_mi - bandWidthMi} and v.last_odometer_mi < ${c.band_to_mi}
         and not exists (select 1 from visible_repair_lines l where l.vehicle_id = v.id
               and l.odometer_mi >= ${c.band_from_mi} and l.odometer_mi < ${c.band_to_mi} and ${fixes("l")})`);
    const byBand = rates.get(`${c.make}|${c.model}|${c.label}|${c.fault_key}`) ?? NO_RATES;
    for (const r of vehiclesAtRisk) {
      if (seen.has(`${r.id}|${c.fault_key}`)) continue;
      seen.add(`${r.id}|${c.fault_key}`);
      rows.push({
        vehicleId: Number(r.id),
        unitNumber: r.unit_number,
        vin: r.vin,
        cohort: `${c.make} ${c.model} ${c.label}`,
        odometerMi: Number(r.odometer),
        source: {
          kind: "signal",
          faultKey: c.fault_key,
          label: faultName({
            dtc: c.dtc,
            dtcDescription: c.dtc_description,
            componentSystem: c.component_system,
            componentName: c.component_name,
            faultKey: c.fault_key,
          }),
        },
        rangeFromMi: Number(c.band_from_mi),
        rangeToMi: Number(c.band_to_mi),
        toRangeMi: Math.max(0, Number(c.band_from_mi) - Number(r.odometer)),
        ...expectedWithInterval(
          Number(r.odometer),
          opts.nextMiles,
          bandWidthMi,
          byBand,
          confidence,
        ),
        fixCostCents:
          cost?.avg === null || cost?.avg === undefined ? null : Math.round(Number(cost.avg)),
      });
    }
  }
  rows.sort((a, b) => b.expected - a.expected || a.toRangeMi - b.toRangeMi);
  return {
    rows,
    labourPerHourCents: Math.round(labourPerHourCents),
    bandWidthMi,
    confidence,
  };
}
