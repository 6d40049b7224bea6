import type { InStatement } from "@libsql/client";
import { isLocalFileDatabase, type Db } from "@/db";
import { lastOdometerRefreshSql } from "@/db/queries/last-odometer";
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

/** The statements that apply one small kind, and how many rows of this import ended up in the data. */
type Plan = { statements: string[]; importedSql: string };

function plan(kind: Exclude<ImportKind, ChunkedKind>, org: number, imp: number): Plan {
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
          clear,
        ],
        importedSql: `(select count(*) from vehicles where import_id = ${imp})`,
      };
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
          `insert into generations (organisation_id, make, model, label, year_from, year_to, powertrain, import_id)
             select ${org}, s.make, s.model, s.label, s.year_from, s.year_to, s.powertrain, ${imp}
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

/** The kinds that can be large: applied in committed chunks, hidden until the last one. */
const CHUNKED_KINDS = ["repairs", "faults", "fuel"] as const;
type ChunkedKind = (typeof CHUNKED_KINDS)[number];
export const isChunked = (kind: ImportKind): kind is ChunkedKind =>
  (CHUNKED_KINDS as readonly string[]).includes(kind);

/** The table a chunked kind's rows land in (lines and codes go with repair orders). */
const TARGET: Record<ChunkedKind, string> = {
  repairs: "repair_orders",
  faults: "fault_events",
  fuel: "fuel_transactions",
};

/**
 * Staged rows per committed chunk. On a libSQL server one chunk of repair lines takes about
 * 1–2 s to apply, well inside the few seconds after which the server rolls back a write that
 * another client waits behind.
 */
export const APPLY_CHUNK_ROWS = 20_000;

export type ApplyOptions = {
  /** Staged rows per chunk (APPLY_CHUNK_ROWS unless a test asks for small chunks). */
  chunkRows?: number;
  /** Called before each chunk; throwing stops the apply (a lost lease; a test's crash). */
  beforeChunk?: (chunk: number) => void | Promise<void>;
};

/** A range of staged rows: RO numbers (lo, hi] for repairs, row ids (lo, hi] for events. */
type Range = { lo: string | number | null; hi: string | number | null };

/** `column > lo and column <= hi` for the bounds that are set, with their arguments. */
function within(column: string, r: Range): { sql: string; args: (string | number)[] } {
  const parts: string[] = [];
  const args: (string | number)[] = [];
  if (r.lo !== null) {
    parts.push(`${column} > ?`);
    args.push(r.lo);
  }
  if (r.hi !== null) {
    parts.push(`${column} <= ?`);
    args.push(r.hi);
  }
  return { sql: parts.map((p) => ` and ${p}`).join(""), args };
}

/**
 * The statements that apply one chunk, and which of them inserts the rows that count as
 * imported. A repair order's lines all fall in the chunk of its RO number, so line numbers
 * and DTC rows are made whole in one chunk.
 */
function chunkStatements(
  kind: ChunkedKind,
  org: number,
  imp: number,
  r: Range,
): { statements: InStatement[]; counted: number } {
  const staged = STAGED[kind];
  if (kind === "repairs") {
    const s = within("s.ro_number", r);
    const bare = within("ro_number", r);
    const o = within("o.ro_number", r);
    return {
      statements: [
        {
          sql: `insert into repair_orders (organisation_id, vehicle_id, ro_number, opened_on, closed_on, odometer_mi, vendor, import_id)
             select ${org}, ${vehicleOf(org, "s")}, s.ro_number, s.opened_on, s.closed_on, s.odometer_mi, s.vendor, ${imp}
               from ${staged} s
              where s.id in (select min(id) from ${staged} where import_id = ${imp}${bare.sql} group by ro_number)
                and not exists (select 1 from repair_orders o where o.organisation_id = ${org} and o.ro_number = s.ro_number)`,
          args: bare.args,
        },
        {
          sql: `insert into repair_lines (organisation_id, repair_order_id, vehicle_id, line_no, opened_on, odometer_mi,
                complaint, cause, correction, dtc_codes, component_id, symptom, labor_hours, parts_cost_cents,
                labor_cost_cents, part_numbers, technician, vendor, is_warranty, is_scheduled, kind, import_id)
             select ${org}, o.id, o.vehicle_id, row_number() over (partition by o.id order by s.id), s.opened_on,
                    coalesce(s.odometer_mi, o.odometer_mi), s.complaint, s.cause, s.correction, s.dtc_codes,
                    s.component_id, s.symptom, s.labor_hours, s.parts_cost_cents, s.labor_cost_cents,
                    s.part_numbers, s.technician, s.vendor, s.is_warranty, s.is_scheduled, s.kind, ${imp}
               from ${staged} s
               -- CROSS JOIN keeps the staged rows outside, so each finds its order through the
               -- (organisation, RO number) index instead of scanning the staged table per order.
               cross join repair_orders o on o.organisation_id = ${org} and o.ro_number = s.ro_number
              where s.import_id = ${imp}${s.sql} and o.import_id = ${imp}`,
          args: s.args,
        },
        // DTCs are checked against SAE J2012 while reading ([0-9A-Z] only), so the
        // space-separated list can be turned into a JSON array by plain replacement.
        {
          sql: `insert into repair_line_codes (organisation_id, repair_line_id, vehicle_id, dtc, import_id)
             select ${org}, l.id, l.vehicle_id, j.value, ${imp}
               from repair_orders o
               join repair_lines l on l.repair_order_id = o.id
               join json_each('["' || replace(l.dtc_codes, ' ', '","') || '"]') j
              where o.organisation_id = ${org}${o.sql} and o.import_id = ${imp}
                and l.dtc_codes is not null and l.dtc_codes <> ''`,
          args: o.args,
        },
      ],
      counted: 1,
    };
  }
  const isFault = kind === "faults";
  const table = TARGET[kind];
  const cols = isFault
    ? "occurred_at, odometer_mi, dtc, mil_on, status"
    : "filled_at, odometer_mi, volume_l, price_total_cents, station";
  const sCols = cols
    .split(", ")
    .map((c) => `s.${c}`)
    .join(", ");
  const ids = within("s.id", r);
  return {
    statements: [
      // The unique (vehicle, moment[, code]) index turns a repeat into a skipped row; chunks
      // go in row order, so the first of two equal rows in the file wins.
      {
        sql: `insert into ${table} (organisation_id, vehicle_id, ${cols}, import_id)
             select ${org}, ${vehicleOf(org, "s")}, ${sCols}, ${imp}
               from ${staged} s where s.import_id = ${imp}${ids.sql} order by s.id
             on conflict do nothing`,
        args: ids.args,
      },
    ],
    counted: 0,
  };
}

/** Where the chunk that starts after `lo` ends: null when it runs to the last staged row. */
async function chunkEnd(
  db: Db,
  kind: ChunkedKind,
  imp: number,
  lo: Range["lo"],
  chunkRows: number,
): Promise<Range["hi"]> {
  const key = kind === "repairs" ? "ro_number" : "id";
  const after = within(key, { lo, hi: null });
  const rs = await db.$client.execute({
    sql: `select ${key} as k from ${STAGED[kind]} where import_id = ${imp}${after.sql}
           order by ${key} limit 1 offset ?`,
    args: [...after.args, chunkRows - 1],
  });
  const k = rs.rows[0]?.k;
  return typeof k === "string" || typeof k === "number" ? k : null;
}

/** Rows per delete while removing a partial apply or staged rows. */
const DELETE_CHUNK_ROWS = 5_000;

/** Deletes `from table where import_id = imp` a few thousand rows at a time (short writes). */
async function deleteInChunks(db: Db, table: string, imp: number): Promise<void> {
  for (;;) {
    const rs = await db.$client.execute(
      `delete from ${table} where rowid in
         (select rowid from ${table} where import_id = ${imp} limit ${DELETE_CHUNK_ROWS})`,
    );
    if (rs.rowsAffected < DELETE_CHUNK_ROWS) return;
  }
}

/**
 * Removes what an apply that did not finish left in the data (its rows are hidden meanwhile:
 * the import is still "applying", or "failed"). Repair lines and their codes go with their
 * orders (foreign keys cascade). Vehicles the import created stay: the next attempt finds
 * them, and they still carry the import's id for its counts and for undo.
 */
export async function removePartialApply(db: Db, kind: ImportKind, importId: number) {
  if (isChunked(kind)) await deleteInChunks(db, TARGET[kind], int(importId));
}

/**
 * Moves an import's staged rows into the data and marks the import done.
 *
 * Small kinds (vehicles, parts, generations) go in ONE atomic batch. The large kinds
 * (repairs, fault codes, fill-ups) go in committed chunks of `chunkRows` staged rows: a single
 * write of a million rows holds the write lock for a minute, and a libSQL server rolls such a
 * write back as soon as another client waits for the lock. The rows of an import that is
 * still applying are hidden from every reader (db/schema/visible.ts), so the import still
 * appears whole or not at all: the last batch marks it done — with its counts and the queued
 * statistics recompute — and only then are its rows seen. A crash between chunks leaves the
 * import "applying"; the retry removes the partial rows first (removePartialApply).
 */
export async function applyStagedImport(
  db: Db,
  input: { kind: ImportKind; organisationId: number; importId: number; stagedRows: number },
  options: ApplyOptions = {},
): Promise<void> {
  const org = int(input.organisationId);
  const imp = int(input.importId);
  const staged = Math.max(0, Math.trunc(input.stagedRows));
  // Large applies sort and index a lot: a bigger page cache for this connection makes them
  // several times faster; the soft heap limit keeps SQLite's sorters from growing past it.
  // A libSQL server refuses these PRAGMAs (it is configured on the server instead).
  const pragmas = isLocalFileDatabase(db)
    ? ["pragma cache_size = -32768", "pragma soft_heap_limit = 100000000"]
    : [];
  const recompute: InStatement = {
    sql: `insert into jobs (organisation_id, kind, payload, status, run_after, max_attempts)
          values (?, 'recompute', ?, 'queued', ?, 3)`,
    args: [org, JSON.stringify({ organisationId: org }), Date.now()],
  };
  const markDone = (importedSql: string) =>
    `update imports set status = 'done', finished_at = strftime('%Y-%m-%dT%H:%M:%fZ', 'now'),
            rows_imported = ${importedSql},
            rows_duplicate = rows_duplicate + max(0, ${staged} - ${importedSql}),
            vehicles_created = (select count(*) from vehicles where import_id = ${imp})
      where id = ${imp} and status = 'applying'`;

  const kind = input.kind;
  if (!isChunked(kind)) {
    const { statements, importedSql } = plan(kind, org, imp);
    // After the import is marked done: its rows are hidden from the views until then.
    const odometers = kind === "vehicles" ? [lastOdometerRefreshSql(org, { importId: imp })] : [];
    await db.$client.batch(
      [...pragmas, ...statements, markDone(importedSql), ...odometers, recompute],
      "write",
    );
    return;
  }

  const chunkRows = Math.max(1, Math.trunc(options.chunkRows ?? APPLY_CHUNK_ROWS));
  await db.$client.batch([...pragmas, createVehicles(org, imp, STAGED[kind])], "write");
  let imported = 0;
  let lo: Range["lo"] = null;
  for (let chunk = 0; ; chunk++) {
    await options.beforeChunk?.(chunk);
    const hi = await chunkEnd(db, kind, imp, lo, chunkRows);
    const { statements, counted } = chunkStatements(kind, org, imp, { lo, hi });
    const results = await db.$client.batch([...pragmas, ...statements], "write");
    imported += results[pragmas.length + counted]?.rowsAffected ?? 0;
    if (hi === null) break;
    lo = hi;
  }
  await db.$client.batch(
    [
      ...pragmas,
      markDone(String(imported)),
      // After the import is marked done: until then the views hide its rows.
      lastOdometerRefreshSql(org, { importId: imp }),
      recompute,
    ],
    "write",
  );
  // The staged rows are no longer needed; removed in short writes after the import is done.
  await deleteInChunks(db, STAGED[kind], imp);
}

/** Removes the staged rows an interrupted import left behind (before a retry, or on failure). */
export async function clearStagedRows(db: Db, kind: ImportKind, importId: number): Promise<void> {
  await db.$client.execute(`delete from ${STAGED[kind]} where import_id = ${int(importId)}`);
}
