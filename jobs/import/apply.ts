import type { InStatement } from "@libsql/client";
import { isLocalFileDatabase, type Db } from "@/db";
import type { ImportKind } from "@/db/schema";
import { sqlInt } from "./sql-literal";

/**
 * The second half of an import: staged rows move into the organisation's data in ONE atomic
 * batch of INSERT … SELECT statements, so an import lands whole or not at all, and the work is
 * done by the database engine rather than row by row in JavaScript. Duplicates (an RO number
 * already present; a fault code or fill-up already recorded for that vehicle and moment; a
 * vehicle already on the roster) are skipped and counted.
 */

/** Integers only are written into the SQL text (ids ≥ 1); user-supplied values stay in the tables. */
const int = (n: number) => sqlInt(n, 1);

const STAGED: Record<ImportKind, string> = {
  vehicles: "staged_vehicles",
  repairs: "staged_repairs",
  faults: "staged_faults",
  fuel: "staged_fuel",
  parts: "staged_parts",
  generations: "staged_generations",
};

/** The organisation's generation covering a make, model and model year (newest first). */
function generationOf(org: number, s: string): string {
  return `(select g.id from generations g where g.organisation_id = ${org}
      and g.make = ${s}.make collate nocase and g.model = ${s}.model collate nocase
      and ${s}.model_year between g.year_from and g.year_to order by g.year_from desc limit 1)`;
}

/** The vehicle a staged row names: resolved while reading, else by VIN, then unit number. */
function vehicleOf(org: number, s: string): string {
  return `coalesce(${s}.vehicle_id,
      (select v.id from vehicles v where v.organisation_id = ${org} and v.vin = ${s}.vin),
      (select v.id from vehicles v where v.organisation_id = ${org} and v.unit_number = ${s}.unit_number))`;
}

/** Creates the vehicles that rows name but the organisation does not have yet (first row wins). */
function createVehicles(org: number, imp: number, staged: string, extra = ""): string {
  const cols = extra ? `, engine, transmission, in_service_date, odometer_unit` : "";
  const vals = extra
    ? `, s.engine, s.transmission, s.in_service_date, coalesce(s.odometer_unit, 'mi')`
    : "";
  return `insert into vehicles (organisation_id, vin, unit_number, make, model, model_year${cols}, generation_id, import_id)
    select ${org}, s.vin, s.unit_number, s.make, s.model, s.model_year${vals}, ${generationOf(org, "s")}, ${imp}
      from ${staged} s
     where s.id in (select min(id) from ${staged}
                     where import_id = ${imp} and make is not null and model is not null and model_year is not null
                     group by coalesce(vin, '#' || unit_number))
       and not exists (select 1 from vehicles v where v.organisation_id = ${org}
                          and (v.vin = s.vin or v.unit_number = s.unit_number))`;
}

/** Keeps each touched vehicle's latest odometer reading current. */
function touchOdometers(table: string, dateColumn: string, imp: number): string {
  return `update vehicles set last_odometer_mi = x.odometer_mi, last_odometer_on = x.read_on
      from (select vehicle_id, max(odometer_mi) as odometer_mi, max(substr(${dateColumn}, 1, 10)) as read_on
              from ${table} where import_id = ${imp} and odometer_mi is not null group by vehicle_id) x
     where vehicles.id = x.vehicle_id
       and (vehicles.last_odometer_mi is null or x.odometer_mi > vehicles.last_odometer_mi)`;
}

/** The statements that apply one kind, and how many rows of this import ended up in the data. */
type Plan = { statements: string[]; importedSql: string };

export function plan(kind: ImportKind, org: number, imp: number): Plan {
  const staged = STAGED[kind];
  const clear = `delete from ${staged} where import_id = ${imp}`;
  switch (kind) {
    case "vehicles":
      return {
        statements: [
          createVehicles(org, imp, staged, "all"),
          `insert into odometer_readings (organisation_id, vehicle_id, read_on, odometer_mi, source, import_id)
             select ${org}, ${vehicleOf(org, "s")}, date('now'), s.odometer_mi, 'roster', ${imp}
               from ${staged} s where s.import_id = ${imp} and s.odometer_mi is not null`,
          touchOdometers("odometer_readings", "read_on", imp),
          clear,
        ],
        importedSql: `(select count(*) from vehicles where import_id = ${imp})`,
      };
    case "repairs":
      return {
        statements: [
          createVehicles(org, imp, staged),
          `insert into repair_orders (organisation_id, vehicle_id, ro_number, opened_on, closed_on, odometer_mi, vendor, import_id)
             select ${org}, ${vehicleOf(org, "s")}, s.ro_number, s.opened_on, s.closed_on, s.odometer_mi, s.vendor, ${imp}
               from ${staged} s
              where s.id in (select min(id) from ${staged} where import_id = ${imp} group by ro_number)
                and not exists (select 1 from repair_orders o where o.organisation_id = ${org} and o.ro_number = s.ro_number)`,
          `insert into repair_lines (organisation_id, repair_order_id, vehicle_id, line_no, opened_on, odometer_mi,
                complaint, cause, correction, dtc_codes, component_id, symptom, labor_hours, parts_cost_cents,
                labor_cost_cents, part_numbers, technician, vendor, is_warranty, import_id)
             select ${org}, o.id, o.vehicle_id, row_number() over (partition by o.id order by s.id), s.opened_on,
                    coalesce(s.odometer_mi, o.odometer_mi), s.complaint, s.cause, s.correction, s.dtc_codes,
                    s.component_id, s.symptom, s.labor_hours, s.parts_cost_cents, s.labor_cost_cents,
                    s.part_numbers, s.technician, s.vendor, s.is_warranty, ${imp}
               from ${staged} s
               -- CROSS JOIN keeps the staged rows outside, so each finds its order through the
               -- (organisation, RO number) index instead of scanning the staged table per order.
               cross join repair_orders o on o.organisation_id = ${org} and o.ro_number = s.ro_number
              where s.import_id = ${imp} and o.import_id = ${imp}`,
          // DTCs are checked against SAE J2012 while reading ([0-9A-Z] only), so the space-separated
          // list can be turned into a JSON array by plain replacement.
          `insert into repair_line_codes (organisation_id, repair_line_id, vehicle_id, dtc)
             select ${org}, l.id, l.vehicle_id, j.value
               from repair_orders o
               join repair_lines l on l.repair_order_id = o.id
               join json_each('["' || replace(l.dtc_codes, ' ', '","') || '"]') j
              where o.import_id = ${imp} and l.dtc_codes is not null and l.dtc_codes <> ''`,
          touchOdometers("repair_orders", "opened_on", imp),
          clear,
        ],
        importedSql: `(select count(*) from repair_lines where import_id = ${imp})`,
      };
    case "faults":
    case "fuel": {
      const isFault = kind === "faults";
      const table = isFault ? "fault_events" : "fuel_transactions";
      const cols = isFault
        ? "occurred_at, odometer_mi, dtc, mil_on, status"
        : "filled_at, odometer_mi, volume_l, price_total_cents, station";
      const sCols = cols
        .split(", ")
        .map((c) => `s.${c}`)
        .join(", ");
      return {
        statements: [
          createVehicles(org, imp, staged),
          // The unique (vehicle, moment[, code]) index turns a repeat into a skipped row.
          `insert into ${table} (organisation_id, vehicle_id, ${cols}, import_id)
             select ${org}, ${vehicleOf(org, "s")}, ${sCols}, ${imp}
               from ${staged} s where s.import_id = ${imp} order by s.id
             on conflict do nothing`,
          touchOdometers(table, isFault ? "occurred_at" : "filled_at", imp),
          clear,
        ],
        importedSql: `(select count(*) from ${table} where import_id = ${imp})`,
      };
    }
    case "parts":
      return {
        statements: [
          // The last row of a part number wins; earlier ones count as duplicates.
          `update ${staged} set part_id = p.id, was_new = 0,
                  previous = json_object('description', p.description, 'componentId', p.component_id,
                    'onHand', p.on_hand, 'unitCostCents', p.unit_cost_cents, 'leadTimeDays', p.lead_time_days)
             from parts p
            where ${staged}.import_id = ${imp} and p.organisation_id = ${org} and p.part_number = ${staged}.part_number
              and ${staged}.id in (select max(id) from ${staged} where import_id = ${imp} group by part_number)`,
          `update ${staged} set was_new = 1
            where import_id = ${imp} and part_id is null
              and id in (select max(id) from ${staged} where import_id = ${imp} group by part_number)`,
          `insert into parts (organisation_id, part_number, description, component_id, on_hand, unit_cost_cents, lead_time_days, import_id)
             select ${org}, part_number, description, component_id, coalesce(on_hand, 0), unit_cost_cents, lead_time_days, ${imp}
               from ${staged} where import_id = ${imp} and was_new = 1`,
          `update parts set description = s.description, component_id = coalesce(s.component_id, parts.component_id),
                  on_hand = coalesce(s.on_hand, parts.on_hand), unit_cost_cents = coalesce(s.unit_cost_cents, parts.unit_cost_cents),
                  lead_time_days = coalesce(s.lead_time_days, parts.lead_time_days)
             from ${staged} s where s.import_id = ${imp} and s.was_new = 0 and parts.id = s.part_id`,
        ],
        importedSql: `(select count(*) from ${staged} where import_id = ${imp} and was_new is not null)`,
      };
    case "generations":
      return {
        statements: [
          `insert into generations (organisation_id, make, model, label, year_from, year_to, import_id)
             select ${org}, s.make, s.model, s.label, s.year_from, s.year_to, ${imp}
               from ${staged} s
              where s.id in (select min(id) from ${staged} where import_id = ${imp} group by make, model, label)
                and not exists (select 1 from generations g where g.organisation_id = ${org}
                                  and g.make = s.make collate nocase and g.model = s.model collate nocase
                                  and g.label = s.label collate nocase)`,
          `update vehicles set generation_id = ${generationOf(org, "vehicles")}
            where organisation_id = ${org} and generation_id is null`,
          clear,
        ],
        importedSql: `(select count(*) from generations where import_id = ${imp})`,
      };
  }
}

/**
 * Moves an import's staged rows into the data and marks the import done, all in one atomic
 * batch: a crash before it commits leaves nothing applied and the import can run again; after
 * it commits the import is done and its counts are set. The recompute of the organisation's
 * statistics is queued in the same batch.
 */
export async function applyStagedImport(
  db: Db,
  input: { kind: ImportKind; organisationId: number; importId: number; stagedRows: number },
): Promise<void> {
  const org = int(input.organisationId);
  const imp = int(input.importId);
  const staged = Math.max(0, Math.trunc(input.stagedRows));
  const { statements, importedSql } = plan(input.kind, org, imp);
  const now = Date.now();
  await db.$client.batch(
    [
      // Large applies sort and index a lot: a bigger page cache for this connection makes them
      // several times faster; the soft heap limit keeps SQLite's sorters from growing past it.
      // A libSQL server refuses these PRAGMAs (it is configured on the server instead).
      ...(isLocalFileDatabase(db)
        ? ["pragma cache_size = -32768", "pragma soft_heap_limit = 100000000"]
        : []),
      ...statements,
      `update imports set status = 'done', finished_at = strftime('%Y-%m-%dT%H:%M:%fZ', 'now'),
              rows_imported = ${importedSql},
              rows_duplicate = rows_duplicate + max(0, ${staged} - ${importedSql}),
              vehicles_created = (select count(*) from vehicles where import_id = ${imp})
        where id = ${imp} and status = 'applying'`,
      {
        sql: `insert into jobs (organisation_id, kind, payload, status, run_after, max_attempts)
              values (?, 'recompute', ?, 'queued', ?, 3)`,
        args: [org, JSON.stringify({ organisationId: org }), now],
      },
    ] satisfies InStatement[],
    "write",
  );
}

/** Removes the staged rows an interrupted import left behind (before a retry, or on failure). */
export async function clearStagedRows(db: Db, kind: ImportKind, importId: number): Promise<void> {
  await db.$client.execute(`delete from ${STAGED[kind]} where import_id = ${int(importId)}`);
}
