import { localDatabasePath, type Db } from "@/db";
import { allFaultsKey, type ComponentKind } from "@/lib/component-kinds";
import { readInThread } from "../db-thread";
import { COHORT_LABEL_SQL, cohortKey } from "./cohorts";

export type EventCount = {
  cohortKey: string;
  band: number;
  /**
   * "dtc:P0441", "component:<slug>", "all" (every failure line with a DTC or a component) or
   * "all:wear" (every wear line).
   */
  faultKey: string;
  /**
   * Which lines the count is of: failure or wear, or service (component counts only, for the
   * stocking planner's service rates: never a cell).
   */
  kind: ComponentKind;
  dtc: string | null;
  componentId: number | null;
  events: number;
  vehiclesAffected: number;
};

export type EventCounts = { counts: EventCount[]; linesWithoutOdometer: number };

/** Repairs opened in a period (ISO dates, inclusive) and/or done by one vendor. */
export type EventFilter = { from?: string; to?: string; vendor?: string };

/** The filter as SQL on repair lines `l`, with its three arguments as ?3, ?4 and ?5. */
function filterSql(filter: EventFilter): { sql: string; args: (string | null)[] } {
  if (!filter.from && !filter.to && !filter.vendor) return { sql: "", args: [] };
  return {
    sql: ` and (?3 is null or l.opened_on >= ?3) and (?4 is null or l.opened_on <= ?4)
           and (?5 is null or l.vendor = ?5 collate nocase)`,
    args: [filter.from ?? null, filter.to ?? null, filter.vendor ?? null],
  };
}

type Row = Record<string, unknown>;

const kindOf = (v: unknown): ComponentKind =>
  v === "service" ? "service" : v === "wear" ? "wear" : "failure";

const MISSING_SQL = `select count(*) as n from visible_repair_lines where organisation_id = ?1 and odometer_mi is null`;

/**
 * A component's fault key: "component:<slug>" for its failure or wear lines, "service:<slug>"
 * for its service lines (a failure component's scheduled replacements).
 */
export const componentFaultKey = (kind: ComponentKind, slug: string) =>
  `${kind === "service" ? "service" : "component"}:${slug}`;

/**
 * Repairs per cohort × mileage band × fault. An event is a failure or wear repair line
 * (lib/component-kinds.ts): for a DTC, a failure line that lists it; for a component, a line on
 * it, of the component's kind; a vehicle back for the same fault counts again (recurrences are
 * the point). Service lines are counted per component only, for the stocking planner. Lines without an odometer reading cannot be placed in a band and
 * are counted separately. Two ways to the same numbers (a test holds them equal): on a local
 * file, countEventsPerVehicle, on a second core; on a libSQL server, countEventsByCohort.
 */
export function countEvents(
  db: Db,
  organisationId: number,
  bandWidthMi: number,
  filter: EventFilter = {},
): Promise<EventCounts> {
  const file = localDatabasePath(db);
  return file
    ? countEventsPerVehicle(db, file, organisationId, bandWidthMi, filter)
    : countEventsByCohort(db, organisationId, bandWidthMi, filter);
}

/**
 * The database groups by cohort (joined from each line's vehicle) × band × fault and counts
 * distinct vehicles itself: one batch, and answers as small as the cohort table (a libSQL
 * server refuses answers over 10 MB). Groups are named by position: `label` in a GROUP BY
 * would be the generations table's column, not the cohort label, and would merge the model
 * years of vehicles without a generation.
 */
export async function countEventsByCohort(
  db: Db,
  organisationId: number,
  bandWidthMi: number,
  filter: EventFilter = {},
): Promise<EventCounts> {
  const only = filterSql(filter);
  const cohort = `v.make, v.model, ${COHORT_LABEL_SQL} as label, cast(l.odometer_mi / ?2 as integer) as band`;
  const vehicle = `join vehicles v on v.id = l.vehicle_id left join generations g on g.id = v.generation_id`;
  const args = [organisationId, bandWidthMi, ...only.args];
  const [byDtc, byComponent, all, missing] = await db.$client.batch(
    [
      {
        sql: `select ${cohort}, 'dtc:' || c.dtc as fault_key, 'failure' as kind, c.dtc, null as component_id,
                     count(*) as events, count(distinct l.vehicle_id) as affected
                from visible_repair_line_codes c
                join visible_repair_lines l on l.id = c.repair_line_id
                ${vehicle}
               where c.organisation_id = ?1 and l.odometer_mi is not null and l.kind = 'failure'${only.sql}
               group by 1, 2, 3, 4, c.dtc`,
        args,
      },
      {
        sql: `select ${cohort}, case l.kind when 'service' then 'service:' else 'component:' end || k.slug as fault_key, l.kind, null as dtc, l.component_id,
                     count(*) as events, count(distinct l.vehicle_id) as affected
                from visible_repair_lines l
                join components k on k.id = l.component_id
                ${vehicle}
               where l.organisation_id = ?1 and l.odometer_mi is not null${only.sql}
               group by 1, 2, 3, 4, l.component_id, l.kind`,
        args,
      },
      {
        sql: `select ${cohort}, case l.kind when 'failure' then 'all' else 'all:wear' end as fault_key, l.kind,
                     null as dtc, null as component_id,
                     count(*) as events, count(distinct l.vehicle_id) as affected
                from visible_repair_lines l
                ${vehicle}
               where l.organisation_id = ?1 and l.odometer_mi is not null and l.kind in ('failure', 'wear')${only.sql}
                 and (l.component_id is not null or l.dtc_codes is not null)
               group by 1, 2, 3, 4, l.kind`,
        args,
      },
      { sql: MISSING_SQL, args: [organisationId] },
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
        kind: kindOf(r.kind),
        dtc: r.dtc === null ? null : String(r.dtc),
        componentId: r.component_id === null ? null : Number(r.component_id),
        events: Number(r.events),
        vehiclesAffected: Number(r.affected),
      });
    }
  }
  return { counts, linesWithoutOdometer: Number(missing?.rows[0]?.n ?? 0) };
}

/**
 * The database counts per vehicle × band × fault, in a reader thread on a second core while the
 * recompute works out exposure on this one. A cohort is a function of the vehicle, so these
 * per-vehicle groups (tens of thousands, not a million lines) add up here to the cohort's
 * events, and their number is the cohort's vehicles affected. That spares the database a join
 * to vehicles and generations and a distinct count for every line, and components and "all
 * faults" come from one pass over the lines.
 */
export async function countEventsPerVehicle(
  db: Db,
  file: string,
  organisationId: number,
  bandWidthMi: number,
  filter: EventFilter = {},
): Promise<EventCounts> {
  const only = filterSql(filter);
  const band = "cast(l.odometer_mi / ?2 as integer)";
  const args = [organisationId, bandWidthMi, ...only.args];
  const inThread = readInThread(file, [
    {
      sql: `select c.vehicle_id, ${band} as band, c.dtc, count(*) as n
              from visible_repair_line_codes c
              join visible_repair_lines l on l.id = c.repair_line_id
             where c.organisation_id = ?1 and l.odometer_mi is not null and l.kind = 'failure'${only.sql}
             group by c.vehicle_id, band, c.dtc`,
      args,
    },
    {
      sql: `select l.vehicle_id, ${band} as band, l.component_id, l.kind, count(*) as n
              from visible_repair_lines l
             where l.organisation_id = ?1 and l.odometer_mi is not null${only.sql}
               and (l.component_id is not null or l.dtc_codes is not null)
             group by l.vehicle_id, band, l.component_id, l.kind`,
      args,
    },
  ]);
  inThread.catch(() => {}); // awaited below
  const [vehicleRows, componentRows, missingRows] = (
    await db.$client.batch(
      [
        {
          sql: `select v.id, v.make, v.model, ${COHORT_LABEL_SQL} as label
                  from vehicles v left join generations g on g.id = v.generation_id
                 where v.organisation_id = ?1`,
          args: [organisationId],
        },
        { sql: "select id, slug from components", args: [] },
        { sql: MISSING_SQL, args: [organisationId] },
      ],
      "read",
    )
  ).map((rs) => rs.rows as Row[]) as [Row[], Row[], Row[]];
  const [dtcRows = [], lineRows = []] = await inThread;

  const cohortOf = new Map<number, string>();
  for (const v of vehicleRows) {
    cohortOf.set(Number(v.id), cohortKey(String(v.make), String(v.model), String(v.label)));
  }
  const slugOf = new Map(componentRows.map((c) => [Number(c.id), String(c.slug)]));

  type Tally = EventCount & { seen: Set<number> };
  const tallies = new Map<string, Tally>();
  const add = (
    vehicleId: number,
    bandIndex: number,
    fault: Pick<EventCount, "faultKey" | "kind" | "dtc" | "componentId">,
    n: number,
  ) => {
    const cohort = cohortOf.get(vehicleId);
    if (cohort === undefined) return;
    const key = `${cohort}|${bandIndex}|${fault.faultKey}`;
    let t = tallies.get(key);
    if (!t) {
      t = {
        cohortKey: cohort,
        band: bandIndex,
        ...fault,
        events: 0,
        vehiclesAffected: 0,
        seen: new Set(),
      };
      tallies.set(key, t);
    }
    t.events += n;
    if (!t.seen.has(vehicleId)) {
      t.seen.add(vehicleId);
      t.vehiclesAffected++;
    }
  };
  for (const r of dtcRows) {
    const dtc = String(r.dtc);
    add(
      Number(r.vehicle_id),
      Number(r.band),
      { faultKey: `dtc:${dtc}`, kind: "failure", dtc, componentId: null },
      Number(r.n),
    );
  }
  for (const r of lineRows) {
    const vehicleId = Number(r.vehicle_id);
    const bandIndex = Number(r.band);
    const n = Number(r.n);
    const kind = kindOf(r.kind);
    if (r.component_id !== null) {
      const componentId = Number(r.component_id);
      const slug = slugOf.get(componentId);
      if (slug !== undefined) {
        add(
          vehicleId,
          bandIndex,
          { faultKey: componentFaultKey(kind, slug), kind, dtc: null, componentId },
          n,
        );
      }
    }
    if (kind === "service") continue;
    add(
      vehicleId,
      bandIndex,
      { faultKey: allFaultsKey(kind), kind, dtc: null, componentId: null },
      n,
    );
  }
  const counts = [...tallies.values()].map(({ seen: _seen, ...count }) => count);
  return { counts, linesWithoutOdometer: Number(missingRows[0]?.n ?? 0) };
}
