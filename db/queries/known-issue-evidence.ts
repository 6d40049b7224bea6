import "server-only";
import { sql, type SQL } from "drizzle-orm";
import type { Db } from "@/db";
import { PLACE_FIELDS, type CellPlace, type HeatCell } from "@/lib/cell-types";
import { unitToMiles } from "@/lib/units";
import { faultNameOf, HEAT_COLUMNS, readCell, toHeatCell } from "./cell-rows";
import type { KnownIssueDetail } from "./known-issues";
import { assertCan, type OrgScope } from "./scope";

/** What a known issue is about, enough to find its repairs, cells and vehicles. */
export type IssueScope = Pick<
  KnownIssueDetail,
  "cohorts" | "dtcCodes" | "component" | "mileageFromMi" | "mileageToMi"
>;

/** Vehicles (alias v) in the issue's cohorts. */
function cohortSql(issue: IssueScope): SQL {
  if (issue.cohorts.length === 0) return sql`0`;
  return sql`(${sql.join(
    issue.cohorts.map((c) =>
      c.generationId === null
        ? sql`(v.make = ${c.make} and v.model = ${c.model})`
        : sql`(v.make = ${c.make} and v.model = ${c.model} and v.generation_id = ${c.generationId})`,
    ),
    sql` or `,
  )})`;
}

/**
 * Repair lines (alias l) that fix the issue's fault: failure lines of one of its DTCs or its
 * component, as lib/fix-held.ts and the at-risk list count them (a part replaced by the
 * schedule, or worn out, is not a repair of the fault).
 */
export function faultSql(issue: Pick<IssueScope, "dtcCodes" | "component">): SQL {
  const parts: SQL[] = [];
  if (issue.dtcCodes.length > 0) {
    parts.push(sql`exists (select 1 from visible_repair_line_codes rc where rc.repair_line_id = l.id
      and rc.dtc in (${sql.join(
        issue.dtcCodes.map((d) => sql`${d}`),
        sql`, `,
      )}))`);
  }
  if (issue.component) {
    parts.push(
      sql`l.component_id = (select id from components where slug = ${issue.component.slug})`,
    );
  }
  return parts.length ? sql`(l.kind = 'failure' and (${sql.join(parts, sql` or `)}))` : sql`0`;
}

/** A computed cell a known issue covers: where it sits, its band, its figures and its fault's name. */
export type EvidenceCell = HeatCell & CellPlace & { faultName: string };

/**
 * The live evidence of a known issue from the data as it is now: the computed cells it covers,
 * the vehicles it has affected, the vehicles at risk (same cohorts, within one band below the
 * range or inside it, not yet affected). How often its fix held: getKnownIssueFixHeld
 * (fix-held.ts), the one definition the lookup shows too.
 */
export async function getKnownIssueEvidence(db: Db, scope: OrgScope, issue: IssueScope) {
  assertCan(scope, "known-issues:read");
  const [settings] = await db.all<{
    band_width: number;
    distance_unit: "mi" | "km";
    confidence_level: number;
  }>(sql`select band_width, distance_unit, confidence_level
           from organisations where id = ${scope.organisationId}`);
  if (!settings) throw new Error("getKnownIssueEvidence: organisation missing");
  const unit = settings.distance_unit;
  const bandWidthMi = unitToMiles(settings.band_width, unit);
  const faultKeys = [
    ...issue.dtcCodes.map((d) => `dtc:${d}`),
    ...(issue.component ? [`component:${issue.component.slug}`] : []),
  ];

  // Cells: cohort labels of the issue's cohorts as the analysis names them.
  const cohortCells =
    issue.cohorts.length === 0 || faultKeys.length === 0
      ? []
      : await db.all<Record<string, unknown>>(sql`
    select ${HEAT_COLUMNS(sql`r.confidence_level`)}, k.name as component_name,
           k.system as component_system, d.description as dtc_description
      from cell_stats c join analysis_runs r on r.id = c.run_id
      left join components k on k.id = c.component_id
      left join dtc_codes d on d.code = c.dtc
     where c.organisation_id = ${scope.organisationId}
       and c.fault_key in (${sql.join(
         faultKeys.map((k) => sql`${k}`),
         sql`, `,
       )})
       and (${sql.join(
         issue.cohorts.map((k) =>
           k.generation === null
             ? sql`(c.make = ${k.make} and c.model = ${k.model})`
             : sql`(c.make = ${k.make} and c.model = ${k.model} and c.cohort_label = ${k.generation})`,
         ),
         sql` or `,
       )})
       ${issue.mileageToMi !== null ? sql`and c.band_from_mi < ${issue.mileageToMi}` : sql``}
       ${issue.mileageFromMi !== null ? sql`and c.band_to_mi > ${issue.mileageFromMi}` : sql``}
     order by c.make, c.model, c.cohort_label, c.fault_key, c.band_index`);
  const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));
  const cells: EvidenceCell[] = cohortCells.map((r) => ({
    ...readCell(r, PLACE_FIELDS),
    ...toHeatCell(r),
    faultName: faultNameOf(r),
  }));

  // Every repair of the fault in the cohorts (any mileage): for comebacks; within the range: affected.
  const lines = await db.all<{
    id: number;
    vehicle_id: number;
    opened_on: string;
    odometer_mi: number | null;
  }>(sql`
    select l.id, l.vehicle_id, l.opened_on, l.odometer_mi
      from visible_repair_lines l join vehicles v on v.id = l.vehicle_id
     where l.organisation_id = ${scope.organisationId} and ${cohortSql(issue)} and ${faultSql(issue)}`);
  const inRange = (mi: number | null) =>
    (issue.mileageFromMi === null || (mi !== null && mi >= issue.mileageFromMi)) &&
    (issue.mileageToMi === null || (mi !== null && mi < issue.mileageToMi));
  const affectedIds = new Set(
    lines.filter((l) => inRange(num(l.odometer_mi))).map((l) => Number(l.vehicle_id)),
  );
  const cohortVehicles = await db.all<{
    id: number;
    unit_number: string | null;
    vin: string | null;
    make: string;
    model: string;
    generation: string | null;
    last_odometer_mi: number | null;
  }>(sql`
    select v.id, v.unit_number, v.vin, v.make, v.model, g.label as generation, v.last_odometer_mi
      from vehicles v left join generations g on g.id = v.generation_id
     where v.organisation_id = ${scope.organisationId} and ${cohortSql(issue)}`);
  const vehicleOf = (v: (typeof cohortVehicles)[number]) => ({
    id: Number(v.id),
    unitNumber: v.unit_number,
    vin: v.vin,
    cohort: `${v.make} ${v.model} ${v.generation ?? ""}`.trim(),
    make: v.make,
    model: v.model,
    generation: v.generation,
    lastOdometerMi: num(v.last_odometer_mi),
  });
  const affected = cohortVehicles.filter((v) => affectedIds.has(Number(v.id))).map(vehicleOf);
  const from = issue.mileageFromMi ?? 0;
  const to = issue.mileageToMi ?? Number.POSITIVE_INFINITY;
  const atRisk = cohortVehicles
    .filter((v) => !affectedIds.has(Number(v.id)))
    .map(vehicleOf)
    .filter(
      (v) =>
        v.lastOdometerMi !== null &&
        v.lastOdometerMi >= from - bandWidthMi &&
        v.lastOdometerMi < to,
    )
    .map((v) => ({
      ...v,
      /** Miles until the range starts (0 when inside it). */
      toRangeMi: Math.max(0, from - (v.lastOdometerMi ?? 0)),
    }))
    .sort((a, b) => a.toRangeMi - b.toRangeMi || (b.lastOdometerMi ?? 0) - (a.lastOdometerMi ?? 0));
  const unknownOdometer = cohortVehicles.filter(
    (v) => !affectedIds.has(Number(v.id)) && v.last_odometer_mi === null,
  ).length;

  return {
    cells,
    signals: cells.filter((c) => c.isSignal).length,
    repairs: lines.filter((l) => inRange(num(l.odometer_mi))).length,
    affected,
    atRisk,
    cohortVehicles: cohortVehicles.length,
    unknownOdometer,
    confidenceLevel: Number(settings.confidence_level),
    /** The confidence the cells' run was computed at (their intervals'). */
    cellConfidence:
      cohortCells[0] === undefined
        ? Number(settings.confidence_level)
        : Number(cohortCells[0].confidence_level),
    bandWidthMi,
  };
}
export type KnownIssueEvidence = Awaited<ReturnType<typeof getKnownIssueEvidence>>;
