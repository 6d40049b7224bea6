import type { Db } from "@/db";
import { lastOdometerRefreshSql } from "@/db/queries/last-odometer";
import { eq } from "drizzle-orm";
import { generations as generationsTable, type ImportKind } from "@/db/schema";
import type { TypedRow } from "@/lib/import";
import { FingerprintMap } from "./fingerprint-set";
import { rejectStatements, readRows, type ReadInput, type ReadResult, type RowSink } from "./read";
import { writeRunProgress, hasRunCancel } from "./run-files";
import { sqlInt, sqlLiteral, type SqlValue } from "./sql-literal";
import { STAGING } from "./stage-rows";
import type { ImportWriter } from "./writer";

/**
 * Imports repair lines, fault events and fill-ups on a local database file in ONE write
 * transaction held by a writer thread (jobs/import/writer.ts), while this thread reads and
 * checks the file: the two run on two cores at once, rows go straight into the
 * organisation's tables (no staging table, no second pass), and the import lands whole or
 * not at all — a killed process never commits. Ids of new vehicles, repair orders and repair
 * lines are given here, from the highest ids when the transaction began (nobody else can
 * write until it ends), so lines can name their order without a lookup per row.
 *
 * The other kinds (small files), and every kind on a libSQL server (which times out long
 * transactions), go through the staging tables (read.ts, apply.ts) instead.
 */
export const DIRECT_KINDS = ["repairs", "faults", "fuel"] as const satisfies ImportKind[];
export type DirectKind = (typeof DIRECT_KINDS)[number];

export function isDirectKind(kind: ImportKind): kind is DirectKind {
  return (DIRECT_KINDS as readonly string[]).includes(kind);
}

/** Integers only are written into the SQL text as ids; everything else goes through sqlLiteral. */
const int = (n: number) => sqlInt(n);

/**
 * Least time between two writes of the progress file (the progress bar polls about every
 * second). Replacing a file by rename makes the file system flush the new one first, which
 * waits behind the writer's log writes: every 250 ms cost the reading thread about half a
 * second of a million-row import.
 */
const PROGRESS_EVERY_MS = 1_000;

/** Highest ids and whether the organisation already has records, read inside the transaction. */
type Bases = { vehicles: number; orders: number; lines: number; events: number; hasOrders: number };

async function readBases(writer: ImportWriter, kind: DirectKind, org: number): Promise<Bases> {
  const events =
    kind === "repairs" ? "0" : `(select coalesce(max(id), 0) from ${EVENTS[kind].table})`;
  const [bases] = await writer.query<Bases>(
    `select (select coalesce(max(id), 0) from vehicles) as vehicles,
            (select coalesce(max(id), 0) from repair_orders) as orders,
            (select coalesce(max(id), 0) from repair_lines) as lines,
            ${events} as events,
            exists (select 1 from repair_orders where organisation_id = ${org}) as hasOrders`,
  );
  if (!bases) throw new Error("direct import: could not read the id bases");
  return bases;
}

type Generation = { id: number; make: string; model: string; yearFrom: number; yearTo: number };

/**
 * The organisation's generation covering a make, model and model year (newest first), as
 * apply.ts finds it in SQL: make and model compared without case.
 */
function generationFinder(generations: Generation[]) {
  const byModel = new Map<string, Generation[]>();
  for (const g of [...generations].sort((a, b) => b.yearFrom - a.yearFrom)) {
    const key = `${g.make.toLowerCase()}\u0001${g.model.toLowerCase()}`;
    byModel.set(key, [...(byModel.get(key) ?? []), g]);
  }
  return (make: string | null, model: string | null, year: number | null): number | null => {
    if (!make || !model || year === null) return null;
    const list = byModel.get(`${make.toLowerCase()}\u0001${model.toLowerCase()}`) ?? [];
    return list.find((g) => year >= g.yearFrom && year <= g.yearTo)?.id ?? null;
  };
}

type Cell = string | number | null;
/** A value as a bound parameter: booleans as 0/1, nothing as NULL. */
const cell = (v: SqlValue): Cell => (v === undefined ? null : typeof v === "boolean" ? +v : v);

/** Rows per piece of a RowPieces: a multiple of the writer's rows per INSERT (100). */
const PIECE_ROWS = 300;

/**
 * Rows on their way to one table, as flat arrays of at most PIECE_ROWS rows each. One array
 * for a whole chunk (42,000 values for 2,000 repair lines) is past V8's largest regular object
 * (128 KB), so it is allocated in the old generation, where storing each new string or number
 * takes the garbage collector's write-barrier slow path: filling the rows measured 2.5× slower
 * that way (1.2 s against 0.5 s for 300,000 lines).
 */
class RowPieces {
  private full: Cell[][] = [];
  /** The piece the current row is pushed onto. */
  current: Cell[] = [];

  constructor(private readonly width: number) {}

  /** After each whole row: starts a new piece when this one is full. */
  endRow(): void {
    if (this.current.length >= this.width * PIECE_ROWS) {
      this.full.push(this.current);
      this.current = [];
    }
  }

  /** Every piece so far (the last may be empty); starts again. */
  take(): Cell[][] {
    const pieces = this.full;
    pieces.push(this.current);
    this.full = [];
    this.current = [];
    return pieces;
  }
}

/**
 * The repair orders of a file so far, by RO number: order n (from 0) has id base + 1 + n; its
 * vehicle, odometer and line count sit in typed arrays, and RO numbers are kept only as
 * 104-bit fingerprints, which keeps a million-order file's bookkeeping to a few tens of MB.
 */
class FileOrders {
  private readonly index = new FingerprintMap();
  private vehicle = new Int32Array(1 << 14);
  private odometer = new Float64Array(1 << 14);
  private lines = new Int32Array(1 << 14);

  constructor(private readonly base: number) {}

  get size(): number {
    return this.index.size;
  }

  /**
   * The order of an RO number, and whether this line is its first: a new RO number becomes the
   * next order, with this line's vehicle and odometer.
   */
  findOrAdd(ro: string, vehicleId: number, odometer: number | null): { n: number; isNew: boolean } {
    const n = this.index.size;
    const found = this.index.getOrSet(ro, n);
    if (found !== undefined) return { n: found, isNew: false };
    if (n === this.vehicle.length) {
      const grow = <T extends Int32Array | Float64Array>(a: T): T => {
        const b = new (a.constructor as new (n: number) => T)(a.length * 2);
        b.set(a);
        return b;
      };
      this.vehicle = grow(this.vehicle);
      this.odometer = grow(this.odometer);
      this.lines = grow(this.lines);
    }
    this.vehicle[n] = vehicleId;
    this.odometer[n] = odometer ?? Number.NaN;
    return { n, isNew: true };
  }

  id(n: number): number {
    return this.base + 1 + n;
  }
  vehicleOf(n: number): number {
    return this.vehicle[n] as number;
  }
  odometerOf(n: number): number | null {
    const v = this.odometer[n] as number;
    return Number.isNaN(v) ? null : v;
  }
  /** Numbers the next line of order n (1, 2, …). */
  nextLine(n: number): number {
    const next = (this.lines[n] as number) + 1;
    this.lines[n] = next;
    return next;
  }
}

// The organisation's and the import's ids are the same in every row: they go into the
// statements as fixed values (FIXED below), not bound row by row.
const VEHICLE_COLUMNS = [
  "id",
  "vin",
  "unit_number",
  "make",
  "model",
  "model_year",
  "generation_id",
];
const ORDER_COLUMNS = [
  "id",
  "vehicle_id",
  "ro_number",
  "opened_on",
  "closed_on",
  "odometer_mi",
  "vendor",
];
// STAGING.repairs order: 0–4 vehicle, 5 ro_number, 6 opened_on, 7 closed_on, 8 odometer_mi,
// then the line's own columns (complaint … is_warranty, is_scheduled, kind), copied as they are.
const LINE_OWN_FROM = 9;
const LINE_COLUMNS = [
  "id",
  "repair_order_id",
  "vehicle_id",
  "line_no",
  "opened_on",
  "odometer_mi",
  ...STAGING.repairs.columns.slice(LINE_OWN_FROM),
];
/** The name of a column in an INSERT's VALUES list (column1, column2, …), for a condition. */
const valuesColumn = (columns: readonly string[], name: string) =>
  `column${columns.indexOf(name) + 1}`;
/** Fault and fuel rows: STAGING order after the five vehicle columns. */
const EVENT_FROM = 5;
const EVENTS: Record<"faults" | "fuel", { table: string; columns: string[] }> = {
  faults: {
    table: "fault_events",
    columns: ["vehicle_id", ...STAGING.faults.columns.slice(EVENT_FROM)],
  },
  fuel: {
    table: "fuel_transactions",
    columns: ["vehicle_id", ...STAGING.fuel.columns.slice(EVENT_FROM)],
  },
};

/** The sink that hands checked rows to the writer as rows of the organisation's tables. */
function directSink(
  writer: ImportWriter,
  kind: DirectKind,
  org: number,
  imp: number,
  bases: Bases,
  generationOf: ReturnType<typeof generationFinder>,
  /** After each chunk is with the writer: the reading's progress so far. */
  onWrite: (progress: Parameters<RowSink["write"]>[1]) => void,
): RowSink {
  let nextVehicle = bases.vehicles;
  let nextLine = bases.lines;
  const orders = new FileOrders(bases.orders);
  const vehicleRows = new RowPieces(VEHICLE_COLUMNS.length);
  const orderRows = new RowPieces(ORDER_COLUMNS.length);
  const lineRows = new RowPieces(LINE_COLUMNS.length);
  const eventRows = new RowPieces(kind === "repairs" ? 0 : EVENTS[kind].columns.length);
  let firstLineOfChunk = nextLine + 1;
  let pending = 0;
  // With no repair orders in the organisation before this import (which holds the write lock),
  // none can be a duplicate of one already loaded: the existence checks are skipped.
  const checkExisting = bases.hasOrders !== 0;
  // An RO number already in the organisation's data is not loaded again, nor its lines.
  const orderWhere = checkExisting
    ? `not exists (select 1 from repair_orders o where o.organisation_id = ${org} and o.ro_number = ${valuesColumn(ORDER_COLUMNS, "ro_number")})`
    : undefined;
  const lineWhere = checkExisting
    ? `exists (select 1 from repair_orders o where o.id = ${valuesColumn(LINE_COLUMNS, "repair_order_id")} and o.import_id = ${imp})`
    : undefined;
  const fixed: [string, number][] = [
    ["organisation_id", org],
    ["import_id", imp],
  ];

  const sendChunk = () => {
    for (const piece of vehicleRows.take()) {
      writer.insert("vehicles", VEHICLE_COLUMNS, piece, { fixed });
    }
    if (kind === "repairs") {
      for (const piece of orderRows.take()) {
        writer.insert("repair_orders", ORDER_COLUMNS, piece, { fixed, where: orderWhere });
      }
      for (const piece of lineRows.take()) {
        writer.insert("repair_lines", LINE_COLUMNS, piece, { fixed, where: lineWhere });
      }
      if (nextLine >= firstLineOfChunk) {
        // DTCs are checked against SAE J2012 while reading ([0-9A-Z] only), so the
        // space-separated list becomes a JSON array by plain replacement.
        writer.run(
          `insert into repair_line_codes (organisation_id, repair_line_id, vehicle_id, dtc, import_id)
             select ${org}, l.id, l.vehicle_id, j.value, l.import_id
               from repair_lines l
               join json_each('["' || replace(l.dtc_codes, ' ', '","') || '"]') j
              where l.id between ${int(firstLineOfChunk)} and ${int(nextLine)}
                and l.dtc_codes is not null and l.dtc_codes <> ''`,
        );
      }
    } else {
      // The unique (vehicle, moment[, code]) index turns a repeat into a skipped row; the
      // first of two equal rows in the file wins.
      const { table, columns } = EVENTS[kind];
      for (const piece of eventRows.take()) {
        writer.insert(table, columns, piece, { fixed, onConflict: true });
      }
    }
    firstLineOfChunk = nextLine + 1;
  };

  return {
    newVehicle(r: TypedRow<"repairs" | "faults" | "fuel">) {
      const id = ++nextVehicle;
      vehicleRows.current.push(
        id,
        cell(r.vin),
        cell(r.unitNumber),
        cell(r.make),
        cell(r.model),
        cell(r.modelYear),
        generationOf(r.make, r.model, r.modelYear),
      );
      vehicleRows.endRow();
      return id;
    },
    add(_rowNumber, v, vehicleId) {
      if (vehicleId === null) throw new Error("direct import: a row without its vehicle");
      pending++;
      if (kind === "repairs") {
        // v is in STAGING.repairs order: 5 ro_number, 6 opened_on, 7 closed_on, 8 odometer_mi,
        // 9 complaint … 20 vendor, 21 is_warranty, 22 is_scheduled, 23 kind.
        const ro = v[5] as string;
        const { n: order, isNew } = orders.findOrAdd(ro, vehicleId, v[8] as number | null);
        if (isNew) {
          // The first line of an RO number in the file gives the order's vehicle, date and odometer.
          orderRows.current.push(
            orders.id(order),
            vehicleId,
            ro,
            cell(v[6]),
            cell(v[7]),
            cell(v[8]),
            cell(v[20]),
          );
          orderRows.endRow();
        }
        const line = lineRows.current;
        line.push(
          ++nextLine,
          orders.id(order),
          orders.vehicleOf(order),
          orders.nextLine(order),
          cell(v[6]),
          cell(v[8]) ?? orders.odometerOf(order),
        );
        for (let i = LINE_OWN_FROM; i < v.length; i++) line.push(cell(v[i]));
        lineRows.endRow();
      } else {
        const event = eventRows.current;
        event.push(vehicleId);
        for (let i = EVENT_FROM; i < v.length; i++) event.push(cell(v[i]));
        eventRows.endRow();
      }
    },
    // Small chunks keep the writer busy from the start and its backlog short at the end.
    chunkRows: 2_000,
    get pending() {
      return pending;
    },
    async write(issues, progress) {
      pending = 0;
      sendChunk();
      const rejects = rejectStatements({ organisationId: org, importId: imp }, issues);
      if (rejects.length) writer.run(rejects.join(";\n"));
      await writer.endChunk();
      onWrite(progress);
    },
  };
}

export type DirectResult = ReadResult & {
  imported: number;
  vehiclesCreated: number;
  /** Where the writer thread's time went, in ms (for the import's log). */
  writerBusyMs: Record<string, number>;
};

/**
 * Reads, checks and writes a whole import in the writer's transaction, then (unless it was
 * cancelled) marks it done, queues the statistics recompute and commits — all in that one
 * transaction. The caller rolls back on a throw or a cancel.
 */
export async function readAndWrite(
  db: Db,
  writer: ImportWriter,
  input: ReadInput & { kind: DirectKind; storedPath: string },
): Promise<DirectResult> {
  const org = int(input.organisationId);
  const imp = int(input.importId);
  const bases = await readBases(writer, input.kind, org);
  const generations = await db
    .select({
      id: generationsTable.id,
      make: generationsTable.make,
      model: generationsTable.model,
      yearFrom: generationsTable.yearFrom,
      yearTo: generationsTable.yearTo,
    })
    .from(generationsTable)
    .where(eq(generationsTable.organisationId, org));
  let progressWrittenAt = 0;
  let last = { bytesRead: 0, rowsTotal: 0, rejected: 0, warnings: 0, duplicatesInFile: 0 };
  const sink = directSink(
    writer,
    input.kind,
    org,
    imp,
    bases,
    generationFinder(generations),
    (p) => {
      last = p;
      // The progress bar polls every second or so: a file a chunk (about 500 of them in a
      // million rows) cost more than half a second of the reading thread's time.
      const now = performance.now();
      if (now - progressWrittenAt < PROGRESS_EVERY_MS) return;
      progressWrittenAt = now;
      writeRunProgress(input.storedPath, {
        bytesRead: p.bytesRead,
        rowsTotal: p.rowsTotal,
        rowsRejected: p.rejected,
        rowsWarning: p.warnings,
        rowsDuplicate: p.duplicatesInFile,
      });
    },
  );
  // Reference data and vehicles are read on this thread's own connection: they are committed
  // data, and nobody can change them while the writer holds the lock.
  const result = await readRows(db, input, sink);
  if (result.isCancelled || hasRunCancel(input.storedPath)) {
    return { ...result, isCancelled: true, imported: 0, vehiclesCreated: 0, writerBusyMs: {} };
  }
  // Rows of this import: every id above the bases (nobody else could write meanwhile).
  const importedSql =
    input.kind === "repairs"
      ? `select count(*) from repair_lines where id > ${int(bases.lines)}`
      : `select count(*) from ${EVENTS[input.kind].table} where id > ${int(bases.events)}`;
  const finalSql = [
    `with n as materialized (${importedSql})
     update imports set status = 'done', finished_at = strftime('%Y-%m-%dT%H:%M:%fZ', 'now'),
            bytes_read = ${int(last.bytesRead)}, rows_total = ${int(result.rowsTotal)},
            rows_rejected = ${int(result.rejected)}, rows_warning = ${int(result.warnings)},
            rows_imported = (select * from n),
            rows_duplicate = ${int(result.duplicatesInFile)} + max(0, ${int(result.staged)} - (select * from n)),
            vehicles_created = (select count(*) from vehicles where id > ${int(bases.vehicles)})
      where id = ${imp} and status = 'reading'`,
    // In the same transaction: the touched vehicles' last readings, from their records.
    lastOdometerRefreshSql(org, { importId: imp }),
    `insert into jobs (organisation_id, kind, payload, status, run_after, max_attempts)
       values (${org}, 'recompute', ${sqlLiteral(JSON.stringify({ organisationId: org }))}, 'queued', ${Date.now()}, 3)`,
  ].join(";\n");
  const {
    rows: [counts],
    busyMs,
  } = await writer.commit(
    finalSql,
    `select rows_imported as imported, vehicles_created as vehiclesCreated, status from imports where id = ${imp}`,
  );
  return {
    ...result,
    imported: Number(counts?.imported ?? 0),
    vehiclesCreated: Number(counts?.vehiclesCreated ?? 0),
    writerBusyMs: busyMs,
  };
}
