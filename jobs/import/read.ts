import { isUtf8 } from "node:buffer";
import { createReadStream } from "node:fs";
import { Transform } from "node:stream";
import { parse } from "csv-parse";
import { and, eq, sql } from "drizzle-orm";
import { isLocalFileDatabase, type Db } from "@/db";
import {
  componentAliases,
  componentKinds,
  components,
  vehicles,
  type ComponentKind,
  type ImportKind,
} from "@/db/schema";
import {
  buildComponentIndex,
  createRowReader,
  needsVehicleKey,
  type ColumnMapping,
  type ReadOptions,
  type RowIssue,
  type TypedRow,
} from "@/lib/import";
import { PermanentJobError } from "../errors";
import { importParseOptions, MAX_RECORD_CHARS, recordBatches } from "./csv-stream";
import { FingerprintSet, fingerprintValues } from "./fingerprint-set";
import { OdometerChecks } from "./odometer-checks";
import { insertStatements, type SqlValue } from "./sql-literal";
import { readingDate, STAGING, type RowContext } from "./stage-rows";

/** Rows per staging commit: large enough to be fast, small enough for a lively progress bar. */
const FLUSH_ROWS = 5_000;
/** Warnings kept for the report (all are counted). */
const MAX_STORED_WARNINGS = 50_000;

export type ReadResult = {
  rowsTotal: number;
  staged: number;
  rejected: number;
  warnings: number;
  duplicatesInFile: number;
  isCancelled: boolean;
};

export type Issue = {
  rowNumber: number;
  severity: "rejected" | "warning";
  column: string;
  reason: string;
  raw: string;
};

export type ReadInput = {
  kind: ImportKind;
  organisationId: number;
  importId: number;
  path: string;
  delimiter: string;
  headers: string[];
  mapping: ColumnMapping;
  read: ReadOptions;
  /** Called after each written chunk; false stops the import (cancel, lost lease). */
  shouldContinue: () => Promise<boolean>;
};

/** What has been read so far (the import's progress). */
export type ReadProgress = {
  bytesRead: number;
  rowsTotal: number;
  rejected: number;
  warnings: number;
  duplicatesInFile: number;
};

/**
 * Where checked rows go: the staging tables (readAndStage) or, on a local file database, the
 * organisation's tables inside one write transaction (jobs/import/direct.ts).
 */
export type RowSink = {
  /**
   * A vehicle a row names that the organisation does not have yet (the row describes it):
   * its new id, or null when the id is known only once the import is applied.
   */
  newVehicle(row: TypedRow<"repairs" | "faults" | "fuel">): number | null;
  /** A checked row: its values in the kind's STAGING column order and its vehicle. */
  add(rowNumber: number, values: SqlValue[], vehicleId: number | null): void;
  /** Rows added since the last write. */
  readonly pending: number;
  /** Rows per write (default FLUSH_ROWS). */
  readonly chunkRows?: number;
  /** Writes what was added, the issues found, and the progress. */
  write(issues: Issue[], progress: ReadProgress): Promise<void>;
};

/** A file error the user must fix (not worth a retry). */
function fileError(message: string): PermanentJobError {
  return new PermanentJobError(message);
}

/**
 * Bytes at the end of `b` that start a character whose remaining bytes are in the next chunk:
 * the length of the part made of whole characters.
 */
function wholeCharacters(b: Buffer): number {
  const n = b.length;
  for (let back = 1; back <= Math.min(4, n); back++) {
    const c = b[n - back] as number;
    if ((c & 0xc0) === 0x80) continue; // a continuation byte: look further back
    const length = c >= 0xf0 ? 4 : c >= 0xe0 ? 3 : c >= 0xc0 ? 2 : 1;
    return length > back ? n - back : n;
  }
  return n;
}

/**
 * Checks that the file is UTF-8 as it streams, so a file that turns out not to be UTF-8 further
 * down is refused, and passes the bytes on unchanged (csv-parse reads bytes: decoding to text
 * here would only be encoded again). A character cut between two chunks is checked with the
 * next one.
 */
function strictUtf8(): Transform {
  let carried: Buffer | null = null;
  return new Transform({
    transform(chunk: Buffer, _enc, done) {
      const bytes = carried ? Buffer.concat([carried, chunk]) : chunk;
      const whole = wholeCharacters(bytes);
      carried = whole < bytes.length ? Buffer.from(bytes.subarray(whole)) : null;
      const part = bytes.subarray(0, whole);
      if (!isUtf8(part)) {
        done(
          fileError(
            "Part of the file is not UTF-8 text. Save it as CSV (UTF-8) and upload it again.",
          ),
        );
        return;
      }
      done(null, part);
    },
    flush(done) {
      if (carried) {
        done(fileError("The file ends in the middle of a character: it is not valid UTF-8 text."));
        return;
      }
      done();
    },
  });
}

/** Turns csv-parse errors into messages about the file. */
function describeParseError(e: unknown, rowNumber: number): Error {
  const err = e as { code?: string; message?: string; lines?: number };
  const where = `row ${rowNumber}`;
  switch (err.code) {
    case "CSV_QUOTE_NOT_CLOSED":
      return fileError(`A quoted field that starts near ${where} is never closed (a missing ").`);
    case "CSV_MAX_RECORD_SIZE":
      return fileError(
        `A row near ${where} is longer than ${MAX_RECORD_CHARS.toLocaleString("en-GB")} characters; is this really a CSV file?`,
      );
    case "CSV_INVALID_CLOSING_QUOTE":
    case "CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE":
      return fileError(
        `A quote in the middle of a field near ${where} cannot be read. Quote fields with " and double quotes inside them.`,
      );
    default:
      return e instanceof PermanentJobError
        ? e
        : fileError(`The file could not be read near ${where}: ${err.message ?? String(e)}`);
  }
}

/**
 * Writes checked rows to the staging table in committed chunks with the import's progress.
 * Nothing reaches the organisation's data here; applyStagedImport does that atomically.
 */
export function stagingSink(db: Db, input: ReadInput): RowSink {
  const layout = STAGING[input.kind];
  const hasVehicleColumn = needsVehicleKey(input.kind) && input.kind !== "vehicles";
  const stageColumns = ["organisation_id", "import_id", "row_number", ...layout.columns];
  if (hasVehicleColumn) stageColumns.push("vehicle_id");
  let rows: SqlValue[][] = [];
  return {
    newVehicle: () => null,
    add(rowNumber, values, vehicleId) {
      const staged = [input.organisationId, input.importId, rowNumber, ...values];
      if (hasVehicleColumn) staged.push(vehicleId);
      rows.push(staged);
    },
    get pending() {
      return rows.length;
    },
    async write(issues, p) {
      const statements = insertStatements(layout.table, stageColumns, rows);
      statements.push(
        ...rejectStatements(input, issues),
        `update imports set bytes_read = ${p.bytesRead}, rows_total = ${p.rowsTotal}, rows_rejected = ${p.rejected},
           rows_warning = ${p.warnings}, rows_duplicate = ${p.duplicatesInFile} where id = ${input.importId}`,
      );
      rows = [];
      if (isLocalFileDatabase(db)) {
        const tx = await db.$client.transaction("write");
        try {
          await tx.executeMultiple(statements.join(";\n"));
          await tx.commit();
        } finally {
          tx.close();
        }
      } else {
        // On a libSQL server, one atomic batch: one round trip, and no interactive transaction
        // whose write lock the server keeps for seconds if this worker dies in the middle.
        await db.$client.batch(statements, "write");
      }
    },
  };
}

/** INSERTs of an import's rejected rows and warnings into import_rejects. */
export function rejectStatements(
  input: { organisationId: number; importId: number },
  issues: Issue[],
): string[] {
  return insertStatements(
    "import_rejects",
    ["organisation_id", "import_id", "row_number", "severity", "column", "reason", "raw"],
    issues.map((i) => [
      input.organisationId,
      input.importId,
      i.rowNumber,
      i.severity,
      i.column,
      i.reason,
      i.raw,
    ]),
  );
}

/** Reads and checks every row, and stages the good ones (see stagingSink). */
export function readAndStage(db: Db, input: ReadInput): Promise<ReadResult> {
  return readRows(db, input, stagingSink(db, input));
}

/**
 * Reads an import's file as a stream (never the whole file in memory), checks every row and
 * hands the good ones to `sink`, which writes them in chunks with the import's progress.
 */
export async function readRows(db: Db, input: ReadInput, sink: RowSink): Promise<ReadResult> {
  const { kind } = input;
  const layout = STAGING[kind];
  const reader = createRowReader(kind, input.headers, input.mapping, input.read);

  const [componentRows, aliasRows, vehicleRows] = await Promise.all([
    db
      .select({
        id: components.id,
        slug: components.slug,
        system: components.system,
        name: components.name,
        kind: sql<ComponentKind>`coalesce(${componentKinds.kind}, ${components.kind})`,
      })
      .from(components)
      .leftJoin(
        componentKinds,
        and(
          eq(componentKinds.componentId, components.id),
          eq(componentKinds.organisationId, input.organisationId),
        ),
      ),
    db
      .select({ alias: componentAliases.alias, componentId: componentAliases.componentId })
      .from(componentAliases)
      .where(eq(componentAliases.organisationId, input.organisationId)),
    needsVehicleKey(kind)
      ? db
          .select({
            id: vehicles.id,
            vin: vehicles.vin,
            unitNumber: vehicles.unitNumber,
            lastMi: vehicles.lastOdometerMi,
            lastOn: vehicles.lastOdometerOn,
          })
          .from(vehicles)
          .where(eq(vehicles.organisationId, input.organisationId))
      : Promise.resolve([]),
  ]);
  const kinds = new Map(componentRows.map((c) => [c.id, c.kind]));
  const context: RowContext = {
    componentOf: buildComponentIndex(
      componentRows,
      new Map(aliasRows.map((a) => [a.alias, a.componentId])),
    ),
    kindOf: (id) => kinds.get(id),
  };
  // Known vehicles by VIN and unit number; rows naming a new vehicle add it (if they describe it).
  const knownVins = new Map<string, number | null>();
  const knownUnits = new Map<string, number | null>();
  // Seeded with each vehicle's stored last reading (the latest-dated one); the file's own
  // readings are added as they are read (what is remembered, and its bound: odometer-checks.ts).
  const odometer = new OdometerChecks();
  for (const v of vehicleRows) {
    if (v.vin) knownVins.set(v.vin, v.id);
    if (v.unitNumber) knownUnits.set(v.unitNumber, v.id);
    odometer.seed(v.vin ?? `#${v.unitNumber}`, v.lastOn, v.lastMi);
    if (v.vin && v.unitNumber) odometer.seed(`#${v.unitNumber}`, v.lastOn, v.lastMi);
  }

  let rowNumber = 1; // the header is row 1, as in a spreadsheet
  let rowsTotal = 0;
  let staged = 0;
  let rejected = 0;
  let warnings = 0;
  let storedWarnings = 0;
  let duplicatesInFile = 0;
  let bytesRead = 0;
  const seen = new FingerprintSet();
  let pendingIssues: Issue[] = [];
  const chunkRows = sink.chunkRows ?? FLUSH_ROWS;
  // Kinds whose rows name a vehicle that must already exist or be described by the row.
  const hasVehicleColumn = needsVehicleKey(kind) && kind !== "vehicles";

  const flush = async (): Promise<boolean> => {
    staged += sink.pending;
    const issues = pendingIssues;
    pendingIssues = [];
    await sink.write(issues, { bytesRead, rowsTotal, rejected, warnings, duplicatesInFile });
    return input.shouldContinue();
  };

  const rawOf = (record: string[]) =>
    record.join(input.delimiter === "\t" ? "\t" : input.delimiter).slice(0, 500);
  const addIssues = (
    record: string[],
    severity: Issue["severity"],
    issues: readonly RowIssue[],
  ) => {
    for (const issue of issues) {
      pendingIssues.push({
        rowNumber,
        severity,
        column: issue.column,
        reason: issue.message,
        raw: rawOf(record),
      });
    }
  };

  const source = createReadStream(input.path);
  source.on("data", (chunk) => {
    bytesRead += chunk.length;
  });
  const utf8 = strictUtf8();
  const parser = source.pipe(utf8).pipe(parse(importParseOptions(input.delimiter)));
  const onError = (e: unknown) => parser.destroy(e instanceof Error ? e : new Error(String(e)));
  // pipe() does not pass errors on: the file's and the UTF-8 check's end the parser's loop.
  source.on("error", onError);
  utf8.on("error", onError);

  let isHeader = true;
  try {
    for await (const batch of recordBatches(parser))
      for (const record of batch) {
        if (isHeader) {
          isHeader = false;
          const header = record.map((h) => h.trim());
          if (header.join("\u0001") !== input.headers.map((h) => h.trim()).join("\u0001")) {
            throw fileError(
              "The file's header row is not the one that was mapped. Upload the file again.",
            );
          }
          continue;
        }
        rowNumber++;
        if (record.length === 1 && record[0]?.trim() === "") continue; // a blank line
        const result = reader(record, rowNumber);
        if (!result.ok) {
          if (result.issues.length === 1 && result.issues[0]?.message === "The row is empty.")
            continue;
          rowsTotal++;
          rejected++;
          addIssues(record, "rejected", result.issues);
        } else {
          rowsTotal++;
          const row = result.row as TypedRow<ImportKind>;
          const rowWarnings: RowIssue[] = [...result.warnings];
          let isOk = true;
          let vehicleId: number | null = null;
          if (hasVehicleColumn) {
            const r = row as TypedRow<"repairs">;
            const isKnown =
              (r.vin !== null && knownVins.has(r.vin)) ||
              (r.unitNumber !== null && knownUnits.has(r.unitNumber));
            vehicleId =
              (r.vin !== null ? knownVins.get(r.vin) : undefined) ??
              (r.unitNumber !== null ? knownUnits.get(r.unitNumber) : undefined) ??
              null;
            if (!isKnown) {
              if (r.make && r.model && r.modelYear) {
                // Added by this import (the sink gives its id, or null until it is applied).
                vehicleId = sink.newVehicle(r);
                if (r.vin) knownVins.set(r.vin, vehicleId);
                if (r.unitNumber) knownUnits.set(r.unitNumber, vehicleId);
              } else {
                isOk = false;
                rejected++;
                addIssues(record, "rejected", [
                  {
                    column: r.vin ? "vin" : "unit_number",
                    message: `unknown vehicle ${r.vin ?? r.unitNumber}, and the row has no make, model and model year to add it`,
                  },
                ]);
              }
            }
            const on = isOk ? readingDate(kind, row) : null;
            if (on && r.odometerMi !== null) {
              const problem = odometer.check(r.vin ?? `#${r.unitNumber}`, on, r.odometerMi);
              if (problem) rowWarnings.push({ column: "odometer", message: problem });
            }
          }
          if (isOk) {
            const values = layout.toValues(row as never, context);
            if (kind === "repairs") {
              if (!seen.add(fingerprintValues(values))) {
                isOk = false;
                duplicatesInFile++;
              }
            }
            if (isOk) sink.add(rowNumber, values, vehicleId);
          }
          if (isOk) {
            if (rowWarnings.length) {
              warnings++;
              if (storedWarnings < MAX_STORED_WARNINGS) {
                storedWarnings++;
                addIssues(record, "warning", rowWarnings);
              }
            }
          }
        }
        if (sink.pending >= chunkRows || pendingIssues.length >= FLUSH_ROWS) {
          if (!(await flush())) {
            parser.destroy();
            return { rowsTotal, staged, rejected, warnings, duplicatesInFile, isCancelled: true };
          }
        }
      }
  } catch (e) {
    throw describeParseError(e, rowNumber);
  }
  if (isHeader) throw fileError("The file is empty: it has no header row.");
  const shouldGoOn = await flush();
  if (rowsTotal === 0) throw fileError("The file has a header row but no data rows.");
  return { rowsTotal, staged, rejected, warnings, duplicatesInFile, isCancelled: !shouldGoOn };
}
