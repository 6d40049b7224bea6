import "server-only";
import { sql } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import type { OrgScope } from "./scope";

/**
 * A vehicle's last odometer reading (`vehicles.last_odometer_mi` / `last_odometer_on`) is
 * never kept by hand: it is worked out again from the records that exist, whenever they
 * change (an import applied or undone, a finding recorded). The rule: the reading with the
 * latest date wins, and of readings on that date the highest. A later but lower reading
 * therefore replaces an earlier higher one (the odometer was replaced, or the earlier one was
 * a typo), and undoing an import brings back the reading of the rows that are left.
 *
 * Readings come from repair orders, fault-code events, fill-ups and roster/manual readings, by
 * day (the first ten characters of a timestamp), read through the visible_* views: rows of an
 * import still being applied do not count until it is done.
 */

/** Which vehicles to refresh: those named, those with records of one import, or (neither) all. */
export type OdometerRefreshTarget = { vehicleIds?: readonly number[]; importId?: number };

/** Only whole positive numbers go into the SQL text. */
function id(n: number): string {
  if (!Number.isSafeInteger(n) || n < 1) throw new Error(`last odometer: ${n} is not an id`);
  return String(n);
}

/** Every dated reading of the vehicle in the UPDATE (correlated on `vehicles.id`). */
const READINGS = `
  select substr(o.opened_on, 1, 10) as day, o.odometer_mi as mi from visible_repair_orders o
   where o.vehicle_id = vehicles.id and o.odometer_mi is not null
  union all
  select substr(f.occurred_at, 1, 10), f.odometer_mi from visible_fault_events f
   where f.vehicle_id = vehicles.id and f.odometer_mi is not null
  union all
  select substr(t.filled_at, 1, 10), t.odometer_mi from visible_fuel_transactions t
   where t.vehicle_id = vehicles.id and t.odometer_mi is not null
  union all
  select substr(r.read_on, 1, 10), r.odometer_mi from visible_odometer_readings r
   where r.vehicle_id = vehicles.id and r.odometer_mi is not null`;

/** The vehicles that have records of an import. */
function vehiclesOfImport(importId: string): string {
  const views = [
    "visible_repair_orders",
    "visible_fault_events",
    "visible_fuel_transactions",
    "visible_odometer_readings",
  ];
  return views
    .map((view) => `select vehicle_id from ${view} where import_id = ${importId}`)
    .join(" union ");
}

/**
 * The UPDATE that sets the last odometer reading of an organisation's vehicles (all, some, or
 * those an import has records for) from their records, as SQL text with only integers in it,
 * so that it can run in a batch, in the import writer's transaction, or through
 * refreshLastOdometers. One set-based statement with correlated sub-selects: each vehicle's
 * readings are found through the (vehicle, date) indexes, so one vehicle costs a few index
 * lookups and a whole organisation one pass over its records. A vehicle with no readings left
 * gets none (NULL). (Two sub-selects rather than one `SET (a, b) = (…)`: plain SET is what
 * every SQLite statement parser accepts.)
 */
export function lastOdometerRefreshSql(
  organisationId: number,
  target: OdometerRefreshTarget = {},
): string {
  const org = id(organisationId);
  let which = "";
  if (target.vehicleIds !== undefined) {
    which = target.vehicleIds.length
      ? ` and vehicles.id in (${target.vehicleIds.map(id).join(",")})`
      : " and 0";
  }
  if (target.importId !== undefined) {
    which += ` and vehicles.id in (${vehiclesOfImport(id(target.importId))})`;
  }
  return `update vehicles
     set last_odometer_on = (select max(x.day) from (${READINGS}) x),
         last_odometer_mi = (select x.mi from (${READINGS}) x order by x.day desc, x.mi desc limit 1)
   where vehicles.organisation_id = ${org}${which}`;
}

/** Sets the last odometer reading of the scope's vehicles from their records (see above). */
export async function refreshLastOdometers(
  db: DbOrTx,
  scope: OrgScope,
  target: OdometerRefreshTarget = {},
): Promise<void> {
  await db.run(sql.raw(lastOdometerRefreshSql(scope.organisationId, target)));
}
