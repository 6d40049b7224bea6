import "server-only";
import { desc, eq, sql } from "drizzle-orm";
import type { Db } from "@/db";
import { columnMappings, importRejects, imports, users, type ImportKind } from "@/db/schema";
import { enqueueJob } from "@/jobs/queue";
import {
  isRunInOneTransaction,
  readRunCancel,
  readRunProgress,
  requestRunCancel,
} from "@/jobs/import/run-files";
import { recordAudit } from "./audit";
import { lastOdometerRefreshSql } from "./last-odometer";
import {
  assertCan,
  ConflictError,
  countRows,
  inOrg,
  isUniqueViolation,
  NotFoundError,
  orgWhere,
  type OrgScope,
} from "./scope";

/** What the reading step needs to know about a file, kept with the import. */
export type ImportOptions = {
  delimiter: "," | ";" | "\t";
  headers: string[];
  /** Canonical column → header name in the file (by name, so it can be remembered). */
  mapping: Record<string, string | null>;
  read: {
    dateFormat: "iso" | "mdy" | "dmy";
    decimalSeparator: "." | ",";
    distanceUnit: "mi" | "km";
    volumeUnit: "l" | "us-gal" | "imp-gal";
  };
};

const IMPORT_FIELDS = {
  id: imports.id,
  kind: imports.kind,
  fileName: imports.fileName,
  sizeBytes: imports.sizeBytes,
  sha256: imports.sha256,
  status: imports.status,
  options: imports.options,
  bytesRead: imports.bytesRead,
  rowsTotal: imports.rowsTotal,
  rowsImported: imports.rowsImported,
  rowsDuplicate: imports.rowsDuplicate,
  rowsWarning: imports.rowsWarning,
  rowsRejected: imports.rowsRejected,
  vehiclesCreated: imports.vehiclesCreated,
  error: imports.error,
  createdAt: imports.createdAt,
  startedAt: imports.startedAt,
  finishedAt: imports.finishedAt,
  cancelRequestedAt: imports.cancelRequestedAt,
  undoneAt: imports.undoneAt,
  createdByName: users.name,
};

export type ImportSummary = Awaited<ReturnType<typeof getImport>>;

/**
 * Records an uploaded file. The same content cannot be live twice in one organisation: the
 * database's unique index decides, so two simultaneous uploads of one file cannot both win.
 */
export async function createImport(
  db: Db,
  scope: OrgScope,
  input: {
    kind: ImportKind;
    fileName: string;
    storedPath: string;
    sha256: string;
    sizeBytes: number;
  },
) {
  assertCan(scope, "imports:write");
  try {
    return await db.transaction(async (tx) => {
      const [row] = await tx
        .insert(imports)
        .values(inOrg(scope, { ...input, status: "uploaded" as const, createdBy: scope.userId }))
        .returning({ id: imports.id });
      if (!row) throw new Error("createImport: insert returned no row");
      await recordAudit(tx, scope, {
        action: "import.upload",
        entity: "import",
        entityId: row.id,
        detail: { kind: input.kind, fileName: input.fileName, sizeBytes: input.sizeBytes },
      });
      return row;
    });
  } catch (e) {
    if (!isUniqueViolation(e)) throw e;
    const [existing] = await db
      .select({
        id: imports.id,
        createdAt: imports.createdAt,
        status: imports.status,
        fileName: imports.fileName,
      })
      .from(imports)
      .where(
        orgWhere(
          imports,
          scope,
          eq(imports.sha256, input.sha256),
          sql`${imports.status} not in ('failed', 'cancelled', 'undone')`,
        ),
      )
      .limit(1);
    throw new DuplicateFileError(existing ?? null);
  }
}

export class DuplicateFileError extends ConflictError {
  constructor(
    readonly existing: { id: number; createdAt: string; status: string; fileName: string } | null,
  ) {
    super(
      existing
        ? existing.status === "uploaded"
          ? `This file was uploaded on ${existing.createdAt.slice(0, 10)} as “${existing.fileName}” and is waiting for its columns to be mapped.`
          : `This file was already imported on ${existing.createdAt.slice(0, 10)} as “${existing.fileName}”; it is not loaded twice.`
        : "This file is already being imported.",
    );
    this.name = "DuplicateFileError";
  }
}

export async function getImport(db: Db, scope: OrgScope, importId: number) {
  assertCan(scope, "imports:read");
  const [found] = await db
    .select({ ...IMPORT_FIELDS, storedPath: imports.storedPath })
    .from(imports)
    .leftJoin(users, eq(users.id, imports.createdBy))
    .where(orgWhere(imports, scope, eq(imports.id, importId)))
    .limit(1);
  if (!found) throw new NotFoundError("No such import in this organisation.");
  const { storedPath, ...row } = found;
  // An import written in one transaction keeps its progress and a cancel request in side files
  // until it commits (jobs/import/run-files.ts).
  const live = row.status === "reading" ? readRunProgress(storedPath) : null;
  const cancel = live && !row.cancelRequestedAt ? readRunCancel(storedPath) : null;
  return {
    ...row,
    ...(live ?? {}),
    cancelRequestedAt: row.cancelRequestedAt ?? cancel?.at ?? null,
    options: (row.options ?? null) as ImportOptions | null,
  };
}

/** The stored file of an import (for the preview and the reading step). */
export async function getImportFile(db: Db, scope: OrgScope, importId: number) {
  assertCan(scope, "imports:read");
  const [row] = await db
    .select({ storedPath: imports.storedPath, kind: imports.kind, status: imports.status })
    .from(imports)
    .where(orgWhere(imports, scope, eq(imports.id, importId)))
    .limit(1);
  if (!row) throw new NotFoundError("No such import in this organisation.");
  return row;
}

export async function listImports(
  db: Db,
  scope: OrgScope,
  opts: { page: number; pageSize: number },
) {
  assertCan(scope, "imports:read");
  const rows = await db
    .select(IMPORT_FIELDS)
    .from(imports)
    .leftJoin(users, eq(users.id, imports.createdBy))
    .where(orgWhere(imports, scope))
    .orderBy(desc(imports.id))
    .limit(opts.pageSize)
    .offset((opts.page - 1) * opts.pageSize);
  return { rows, total: await countRows(db, imports, orgWhere(imports, scope)) };
}

export async function getRememberedMapping(db: Db, scope: OrgScope, kind: ImportKind) {
  assertCan(scope, "imports:read");
  const [row] = await db
    .select({ mapping: columnMappings.mapping })
    .from(columnMappings)
    .where(orgWhere(columnMappings, scope, eq(columnMappings.kind, kind)))
    .limit(1);
  return (row?.mapping ?? null) as Record<string, string | null> | null;
}

/**
 * Fixes the mapping and reading options of an uploaded file, remembers the mapping for the
 * organisation and kind, and queues the import for a worker.
 */
export async function startImport(
  db: Db,
  scope: OrgScope,
  importId: number,
  options: ImportOptions,
) {
  assertCan(scope, "imports:write");
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ id: imports.id, kind: imports.kind, status: imports.status })
      .from(imports)
      .where(orgWhere(imports, scope, eq(imports.id, importId)));
    if (!row) throw new NotFoundError("No such import in this organisation.");
    if (row.status !== "uploaded")
      throw new ConflictError(`This import is ${row.status}; it cannot be started again.`);
    const jobId = await enqueueJob(tx, {
      kind: "import",
      organisationId: scope.organisationId,
      payload: { importId },
      maxAttempts: 3,
    });
    await tx
      .update(imports)
      .set({ status: "queued", options, jobId })
      .where(orgWhere(imports, scope, eq(imports.id, importId)));
    await tx
      .insert(columnMappings)
      .values(inOrg(scope, { kind: row.kind, mapping: options.mapping }))
      .onConflictDoUpdate({
        target: [columnMappings.organisationId, columnMappings.kind],
        set: { mapping: options.mapping, updatedAt: sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))` },
      });
    await recordAudit(tx, scope, {
      action: "import.start",
      entity: "import",
      entityId: importId,
      detail: { kind: row.kind },
    });
    return { jobId };
  });
}

/** Asks the worker to stop; an import still waiting is cancelled at once. */
export async function cancelImport(db: Db, scope: OrgScope, importId: number) {
  assertCan(scope, "imports:write");
  const [running] = await db
    .select({ status: imports.status, storedPath: imports.storedPath })
    .from(imports)
    .where(orgWhere(imports, scope, eq(imports.id, importId)));
  if (running?.status === "reading" && isRunInOneTransaction(running.storedPath)) {
    // The import holds the write lock until it ends: ask it through a side file (a write here
    // would only wait for the lock). It rolls back, marks itself cancelled and records this in
    // the audit log (jobs/import/run-import.ts).
    requestRunCancel(running.storedPath, scope.userId);
    return;
  }
  await db.transaction(async (tx) => {
    const [row] = await tx
      .select({ status: imports.status })
      .from(imports)
      .where(orgWhere(imports, scope, eq(imports.id, importId)));
    if (!row) throw new NotFoundError("No such import in this organisation.");
    if (row.status === "uploaded" || row.status === "queued") {
      await tx
        .update(imports)
        .set({
          status: "cancelled",
          cancelRequestedAt: sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`,
          finishedAt: sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`,
        })
        .where(orgWhere(imports, scope, eq(imports.id, importId)));
    } else if (row.status === "reading") {
      await tx
        .update(imports)
        .set({ cancelRequestedAt: sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))` })
        .where(orgWhere(imports, scope, eq(imports.id, importId)));
    } else {
      throw new ConflictError(
        row.status === "applying"
          ? "The import is being applied and can no longer be cancelled; undo it once it is done."
          : `This import is ${row.status}; there is nothing to cancel.`,
      );
    }
    await recordAudit(tx, scope, { action: "import.cancel", entity: "import", entityId: importId });
  });
}

function undoStatements(kind: ImportKind, org: number, imp: number): string[] {
  // Vehicles this import created, unless other records now use them.
  const orphanVehicles = `delete from vehicles where organisation_id = ${org} and import_id = ${imp}
      and not exists (select 1 from repair_orders r where r.vehicle_id = vehicles.id)
      and not exists (select 1 from fault_events f where f.vehicle_id = vehicles.id)
      and not exists (select 1 from fuel_transactions t where t.vehicle_id = vehicles.id)
      and not exists (select 1 from odometer_readings o where o.vehicle_id = vehicles.id)`;
  switch (kind) {
    case "repairs":
      // Lines and their codes go with their orders (foreign keys cascade).
      return [
        `delete from repair_orders where organisation_id = ${org} and import_id = ${imp}`,
        orphanVehicles,
      ];
    case "faults":
      return [
        `delete from fault_events where organisation_id = ${org} and import_id = ${imp}`,
        orphanVehicles,
      ];
    case "fuel":
      return [
        `delete from fuel_transactions where organisation_id = ${org} and import_id = ${imp}`,
        orphanVehicles,
      ];
    case "vehicles":
      return [
        `delete from odometer_readings where organisation_id = ${org} and import_id = ${imp}`,
        orphanVehicles,
      ];
    case "parts":
      return [
        `update parts set description = json_extract(s.previous, '$.description'),
                component_id = json_extract(s.previous, '$.componentId'),
                on_hand = json_extract(s.previous, '$.onHand'),
                unit_cost_cents = json_extract(s.previous, '$.unitCostCents'),
                lead_time_days = json_extract(s.previous, '$.leadTimeDays')
           from staged_parts s
          where s.import_id = ${imp} and s.was_new = 0 and parts.id = s.part_id and parts.organisation_id = ${org}`,
        `delete from parts where organisation_id = ${org} and import_id = ${imp}`,
        `delete from staged_parts where import_id = ${imp}`,
      ];
    case "generations":
      return [
        `delete from generations where organisation_id = ${org} and import_id = ${imp}`,
        `update vehicles set generation_id = (select g.id from generations g where g.organisation_id = ${org}
                and g.make = vehicles.make collate nocase and g.model = vehicles.model collate nocase
                and vehicles.model_year between g.year_from and g.year_to order by g.year_from desc limit 1)
          where organisation_id = ${org} and generation_id is null`,
      ];
  }
}

/** Removes exactly the rows an import added (and restores what it changed), atomically. */
export async function undoImport(db: Db, scope: OrgScope, importId: number) {
  assertCan(scope, "imports:write");
  const row = await getImport(db, scope, importId);
  if (row.status !== "done") {
    throw new ConflictError(`Only a finished import can be undone; this one is ${row.status}.`);
  }
  const org = scope.organisationId;
  // The vehicles whose readings the import brought, found before its rows go (the rows of a
  // done import no longer change); their last readings are worked out again from what is left.
  const touched = await db.$client.execute({
    sql: `select vehicle_id from visible_repair_orders where organisation_id = ?1 and import_id = ?2
          union select vehicle_id from visible_fault_events where organisation_id = ?1 and import_id = ?2
          union select vehicle_id from visible_fuel_transactions where organisation_id = ?1 and import_id = ?2
          union select vehicle_id from visible_odometer_readings where organisation_id = ?1 and import_id = ?2`,
    args: [org, importId],
  });
  const vehicleIds = touched.rows.map((r) => Number(r.vehicle_id));
  const odometers: string[] = [];
  for (let i = 0; i < vehicleIds.length; i += 1_000) {
    odometers.push(lastOdometerRefreshSql(org, { vehicleIds: vehicleIds.slice(i, i + 1_000) }));
  }
  await db.$client.batch(
    [
      ...undoStatements(row.kind, org, importId),
      ...odometers,
      {
        sql: `update imports set status = 'undone', undone_at = strftime('%Y-%m-%dT%H:%M:%fZ','now'), undone_by = ?
               where id = ? and organisation_id = ? and status = 'done'`,
        args: [scope.userId, importId, org],
      },
      {
        sql: `insert into jobs (organisation_id, kind, payload, status, run_after, max_attempts) values (?, 'recompute', ?, 'queued', ?, 3)`,
        args: [org, JSON.stringify({ organisationId: org }), Date.now()],
      },
      {
        sql: `insert into audit_log (organisation_id, user_id, action, entity, entity_id, detail) values (?, ?, 'import.undo', 'import', ?, ?)`,
        args: [
          org,
          scope.userId,
          String(importId),
          JSON.stringify({ kind: row.kind, rowsImported: row.rowsImported }),
        ],
      },
    ],
    "write",
  );
}

export async function listImportRejects(
  db: Db,
  scope: OrgScope,
  importId: number,
  opts: { page: number; pageSize: number; severity?: "rejected" | "warning" },
) {
  assertCan(scope, "imports:read");
  await getImport(db, scope, importId);
  const where = orgWhere(
    importRejects,
    scope,
    eq(importRejects.importId, importId),
    opts.severity ? eq(importRejects.severity, opts.severity) : undefined,
  );
  const rows = await db
    .select({
      rowNumber: importRejects.rowNumber,
      severity: importRejects.severity,
      column: importRejects.column,
      reason: importRejects.reason,
      raw: importRejects.raw,
    })
    .from(importRejects)
    .where(where)
    .orderBy(importRejects.rowNumber, importRejects.id)
    .limit(opts.pageSize)
    .offset((opts.page - 1) * opts.pageSize);
  return { rows, total: await countRows(db, importRejects, where) };
}
