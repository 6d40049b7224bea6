import "server-only";
import { sql, type SQL } from "drizzle-orm";
import type { Db } from "@/db";
import {
  fixHeld,
  type FixFault,
  type FixHeld,
  type FixHeldSettings,
  type FixLine,
} from "@/lib/fix-held";
import { unitToMiles } from "@/lib/units";
import type { KnownIssueDetail } from "./known-issues";
import { assertCan, NotFoundError, type OrgScope } from "./scope";

/** A cohort: a make and model, and one generation of it (null: every generation). */
export type FixCohort = { make: string; model: string; generationId: number | null };

/**
 * The organisation's comeback window (in miles), confidence and latest repair on record, as
 * fixHeld takes them (the comebacks screen reads the same).
 */
export async function getFixHeldSettings(db: Db, scope: OrgScope): Promise<FixHeldSettings> {
  assertCan(scope, "patterns:read");
  const [s] = await db.all<{
    distance_unit: "mi" | "km";
    comeback_days: number;
    comeback_distance: number;
    confidence_level: number;
    as_of: string | null;
  }>(sql`select o.distance_unit, o.comeback_days, o.comeback_distance, o.confidence_level,
                (select max(opened_on) from visible_repair_lines
                  where organisation_id = ${scope.organisationId}) as as_of
           from organisations o where o.id = ${scope.organisationId}`);
  if (!s) throw new NotFoundError("No such organisation.");
  return {
    window: {
      days: Number(s.comeback_days),
      miles: unitToMiles(Number(s.comeback_distance), s.distance_unit),
    },
    confidence: Number(s.confidence_level),
    asOf: s.as_of === null ? null : String(s.as_of),
  };
}

/** Vehicles (alias v) of these cohorts ("all": every vehicle of the organisation). */
function cohortsSql(cohorts: readonly FixCohort[] | "all"): SQL {
  if (cohorts === "all") return sql`1`;
  if (cohorts.length === 0) return sql`0`;
  return sql`(${sql.join(
    cohorts.map((c) =>
      c.generationId === null
        ? sql`(v.make = ${c.make} and v.model = ${c.model})`
        : sql`(v.make = ${c.make} and v.model = ${c.model} and v.generation_id = ${c.generationId})`,
    ),
    sql` or `,
  )})`;
}

/** Lines (alias l) of the fault's component or of one of its DTCs (fixHeld checks again). */
function faultLinesSql(fault: FixFault): SQL {
  const parts: SQL[] = [];
  if (fault.component)
    parts.push(sql`l.component_id = (select id from components where slug = ${fault.component})`);
  if (fault.dtcs.length > 0)
    parts.push(sql`exists (select 1 from visible_repair_line_codes rc where rc.repair_line_id = l.id
      and rc.dtc in (${sql.join(
        fault.dtcs.map((d) => sql`${d}`),
        sql`, `,
      )}))`);
  return parts.length ? sql`(${sql.join(parts, sql` or `)})` : sql`0`;
}

/**
 * The failure lines of a fault in these cohorts, as fixHeld reads them (it checks the fault
 * again).
 */
export async function listFixLines(
  db: Db,
  scope: OrgScope,
  target: { cohorts: readonly FixCohort[] | "all"; fault: FixFault },
): Promise<FixLine[]> {
  assertCan(scope, "patterns:read");
  const rows = await db.all<Record<string, unknown>>(sql`
    select l.id, l.vehicle_id, l.opened_on, l.odometer_mi, l.kind, k.slug as component,
           (select group_concat(rc.dtc, ' ') from visible_repair_line_codes rc where rc.repair_line_id = l.id) as codes
      from visible_repair_lines l
      join vehicles v on v.id = l.vehicle_id
      left join components k on k.id = l.component_id
     where l.organisation_id = ${scope.organisationId} and v.organisation_id = ${scope.organisationId}
       and l.kind = 'failure' and ${cohortsSql(target.cohorts)} and ${faultLinesSql(target.fault)}`);
  return rows.map((r) => ({
    id: Number(r.id),
    vehicleId: Number(r.vehicle_id),
    openedOn: String(r.opened_on),
    odometerMi: r.odometer_mi === null ? null : Number(r.odometer_mi),
    kind: r.kind as FixLine["kind"],
    componentSlug: r.component === null ? null : String(r.component),
    codes: r.codes ? String(r.codes).split(" ") : [],
  }));
}

/**
 * How often the fix of a fault held in these cohorts (lib/fix-held.ts: one definition), with the
 * organisation's comeback window, confidence and latest repair. Null when nothing repaired it.
 */
export async function getFixHeld(
  db: Db,
  scope: OrgScope,
  target: { cohorts: readonly FixCohort[] | "all"; fault: FixFault },
): Promise<FixHeld | null> {
  assertCan(scope, "patterns:read");
  const [settings, lines] = await Promise.all([
    getFixHeldSettings(db, scope),
    listFixLines(db, scope, target),
  ]);
  return fixHeld(lines, target.fault, settings);
}

/** How often a known issue's fix held: its fault, in its cohorts. The figure its page shows. */
export async function getKnownIssueFixHeld(
  db: Db,
  scope: OrgScope,
  issue: Pick<KnownIssueDetail, "cohorts" | "component" | "dtcCodes">,
): Promise<FixHeld | null> {
  return getFixHeld(db, scope, {
    cohorts: issue.cohorts,
    fault: { component: issue.component?.slug ?? null, dtcs: issue.dtcCodes },
  });
}
