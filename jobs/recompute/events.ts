import type { Db } from "@/db";
import { COHORT_LABEL_SQL, cohortKey } from "./cohorts";

export type EventCount = {
  cohortKey: string;
  band: number;
  /** "dtc:P0441", "component:<slug>" or "all" (every repair line with a DTC or a component). */
  faultKey: string;
  dtc: string | null;
  componentId: number | null;
  events: number;
  vehiclesAffected: number;
};

export type EventCounts = { counts: EventCount[]; linesWithoutOdometer: number };

/**
 * Repairs per cohort × mileage band × fault, counted by the database (GROUP BY), not row by row
 * in JavaScript. An event is a repair line: for a DTC, a line that lists it; for a component, a
 * line on it; a vehicle back for the same fault counts again (recurrences are the point). Lines
 * without an odometer reading cannot be placed in a band and are counted separately.
 */
export async function countEvents(
  db: Db,
  organisationId: number,
  bandWidthMi: number,
): Promise<EventCounts> {
  const cohort = `v.make, v.model, ${COHORT_LABEL_SQL} as label, cast(l.odometer_mi / ?2 as integer) as band`;
  const vehicle = (line: string) =>
    `join vehicles v on v.id = ${line}.vehicle_id left join generations g on g.id = v.generation_id`;
  const [byDtc, byComponent, all, missing] = await db.$client.batch(
    [
      {
        sql: `select ${cohort}, 'dtc:' || c.dtc as fault_key, c.dtc, null as component_id,
                     count(*) as events, count(distinct l.vehicle_id) as affected
                from repair_line_codes c
                join repair_lines l on l.id = c.repair_line_id
                ${vehicle("l")}
               where c.organisation_id = ?1 and l.odometer_mi is not null
               group by v.make, v.model, label, band, c.dtc`,
        args: [organisationId, bandWidthMi],
      },
      {
        sql: `select ${cohort}, 'component:' || k.slug as fault_key, null as dtc, l.component_id,
                     count(*) as events, count(distinct l.vehicle_id) as affected
                from repair_lines l
                join components k on k.id = l.component_id
                ${vehicle("l")}
               where l.organisation_id = ?1 and l.odometer_mi is not null
               group by v.make, v.model, label, band, l.component_id`,
        args: [organisationId, bandWidthMi],
      },
      {
        sql: `select ${cohort}, 'all' as fault_key, null as dtc, null as component_id,
                     count(*) as events, count(distinct l.vehicle_id) as affected
                from repair_lines l
                ${vehicle("l")}
               where l.organisation_id = ?1 and l.odometer_mi is not null
                 and (l.component_id is not null or l.dtc_codes is not null)
               group by v.make, v.model, label, band`,
        args: [organisationId, bandWidthMi],
      },
      {
        sql: `select count(*) as n from repair_lines where organisation_id = ?1 and odometer_mi is null`,
        args: [organisationId],
      },
    ],
    "read",
  );
  const counts: EventCount[] = [];
  for (const rs of [byDtc, byComponent, all]) {
    for (const r of rs?.rows ?? []) {
      counts.push({
        cohortKey: cohortKey(String(r.make), String(r.model), String(r.label)),
        band: Number(r.band),
        faultKey: String(r.fault_key),
        dtc: r.dtc === null ? null : String(r.dtc),
        componentId: r.component_id === null ? null : Number(r.component_id),
        events: Number(r.events),
        vehiclesAffected: Number(r.affected),
      });
    }
  }
  return { counts, linesWithoutOdometer: Number(missing?.rows[0]?.n ?? 0) };
}
