import diagnostics_channel from "node:diagnostics_channel";
import { performance } from "node:perf_hooks";
import { eq } from "drizzle-orm";
import { localDatabasePath, type Db } from "@/db";
import { auditLog, imports } from "@/db/schema";
import type { ImportOptions } from "@/db/queries/imports";
import { autoMapHeaders, type ColumnMapping } from "@/lib/import";
import { PermanentJobError } from "../errors";
import {
  applyStagedImport,
  clearStagedRows,
  isChunked,
  removePartialApply,
  type ApplyOptions,
} from "./apply";
import { isDirectKind, readAndWrite } from "./direct";
import { readAndStage, type ReadInput } from "./read";
import { hasRunCancel, readRunCancel, removeRunFiles, writeRunProgress } from "./run-files";
import { ImportWriter } from "./writer";

/**
 * How long each thread of a direct import was busy, published on IMPORT_THREADS_CHANNEL (Node's
 * diagnostics_channel: nothing is built for nobody) after its commit; the import benchmark
 * subscribes to it. writerBusyMs is by kind of work (table inserts, SQL, commit).
 */
export type ImportThreadsMessage = {
  importId: number;
  rows: number;
  seconds: number;
  readerBusyMs: number;
  writerBusyMs: Record<string, number>;
};
export const IMPORT_THREADS_CHANNEL = "recurra:import-threads";
const importThreadsChannel = diagnostics_channel.channel(IMPORT_THREADS_CHANNEL);

export type RunImportHooks = {
  /** False once the job's lease was lost: stop writing at the next chunk. */
  hasLease?: () => boolean;
  /** Pauses the job's lease heartbeat while the import holds the write lock (see direct.ts). */
  holdHeartbeat?: (isHeld: boolean) => void;
  log?: (msg: string) => void;
  /** Chunk size and a per-chunk check for the apply step (tests ask for small chunks). */
  apply?: ApplyOptions;
  /** Tests: take the staged path on a local database file too, as on a libSQL server. */
  isStagedOnFile?: boolean;
};

/** Header names in the stored mapping → column positions in this file. */
export function mappingToIndexes(
  headers: string[],
  byName: ImportOptions["mapping"],
): ColumnMapping {
  const out: ColumnMapping = {};
  for (const [key, name] of Object.entries(byName)) {
    if (name === null) {
      out[key] = null;
      continue;
    }
    const at = headers.indexOf(name);
    if (at < 0) throw new PermanentJobError(`The mapped column “${name}” is not in the file.`);
    out[key] = at;
  }
  return out;
}

const now = () => new Date().toISOString();

/**
 * Runs one import from its stored file: clears what an interrupted earlier attempt left,
 * reads and stages every row with progress, then applies the staged rows atomically (which
 * also marks the import done and queues the statistics recompute). Safe to run again after a
 * crash at any point: nothing is applied twice.
 */
export async function runImport(
  db: Db,
  importId: number,
  hooks: RunImportHooks = {},
): Promise<void> {
  const [imp] = await db.select().from(imports).where(eq(imports.id, importId));
  if (!imp) throw new PermanentJobError(`Import ${importId} does not exist.`);
  if (["done", "undone", "cancelled", "failed"].includes(imp.status)) return;
  const options = imp.options as ImportOptions | null;
  if (!options) throw new PermanentJobError("The import has no column mapping.");

  if (imp.status === "applying") {
    // An earlier attempt stopped while applying. Its rows are hidden from readers while the
    // import is "applying"; remove them before the status changes, then start over.
    hooks.log?.(`import ${importId}: an earlier attempt stopped while applying; reading again`);
    await removePartialApply(db, imp.kind, importId);
  }
  await clearStagedRows(db, imp.kind, importId);
  await db.$client.execute({
    sql: "delete from import_rejects where import_id = ?",
    args: [importId],
  });
  await db
    .update(imports)
    .set({
      status: "reading",
      startedAt: now(),
      bytesRead: 0,
      rowsTotal: 0,
      rowsRejected: 0,
      rowsWarning: 0,
      rowsDuplicate: 0,
      error: null,
    })
    .where(eq(imports.id, importId));

  // Columns the stored mapping leaves out are filled from the automatic match of this kind.
  const mapping = {
    ...autoMapHeaders(imp.kind, options.headers).mapping,
    ...mappingToIndexes(options.headers, options.mapping),
  };

  const input: ReadInput = {
    kind: imp.kind,
    organisationId: imp.organisationId,
    importId,
    path: imp.storedPath,
    delimiter: options.delimiter,
    headers: options.headers,
    mapping,
    read: options.read,
    shouldContinue: async () => {
      if (hooks.hasLease && !hooks.hasLease())
        throw new Error("Lost the job's lease to another worker.");
      const [row] = await db
        .select({ cancel: imports.cancelRequestedAt })
        .from(imports)
        .where(eq(imports.id, importId));
      return !row?.cancel;
    },
  };
  const file = localDatabasePath(db);
  if (file && isDirectKind(imp.kind) && !hooks.isStagedOnFile) {
    await runInOneTransaction(db, file, { ...input, kind: imp.kind }, imp.storedPath, hooks);
    return;
  }

  const readStarted = performance.now();
  const result = await readAndStage(db, input);

  if (result.isCancelled) {
    await clearStagedRows(db, imp.kind, importId);
    await db
      .update(imports)
      .set({ status: "cancelled", finishedAt: now() })
      .where(eq(imports.id, importId));
    hooks.log?.(`import ${importId} cancelled after ${result.rowsTotal} rows`);
    return;
  }
  await db.update(imports).set({ status: "applying" }).where(eq(imports.id, importId));
  const applyStarted = performance.now();
  // A small kind is applied in one batch that holds the write lock: the lease heartbeat would
  // only wait for it (and a libSQL server rolls back a write that another client waits
  // behind), so it pauses until the batch is done. The large kinds go in short chunks: the
  // heartbeat keeps the lease between them, and a lost lease stops the apply.
  const isOneBatch = !isChunked(imp.kind);
  if (isOneBatch) hooks.holdHeartbeat?.(true);
  try {
    await applyStagedImport(
      db,
      {
        kind: imp.kind,
        organisationId: imp.organisationId,
        importId,
        stagedRows: result.staged,
      },
      {
        chunkRows: hooks.apply?.chunkRows,
        beforeChunk: async (chunk) => {
          if (hooks.hasLease && !hooks.hasLease())
            throw new Error("Lost the job's lease to another worker.");
          await hooks.apply?.beforeChunk?.(chunk);
        },
      },
    );
  } finally {
    if (isOneBatch) hooks.holdHeartbeat?.(false);
  }
  const secs = (a: number, b: number) => ((b - a) / 1000).toFixed(1);
  hooks.log?.(
    `import ${importId}: read and staged ${result.rowsTotal} rows in ${secs(readStarted, applyStarted)} s, applied in ${secs(applyStarted, performance.now())} s`,
  );
}

/**
 * The direct path on a local database file (jobs/import/direct.ts): one write transaction for
 * the whole import, held by a writer thread. While it is open the import's progress and a
 * cancel request travel in side files (run-files.ts), and the lease heartbeat is paused: no
 * other worker can claim the job while the write lock is held, and if this process dies the
 * transaction is rolled back and the lock released with it.
 */
async function runInOneTransaction(
  db: Db,
  file: string,
  input: ReadInput & { kind: "repairs" | "faults" | "fuel" },
  storedPath: string,
  hooks: RunImportHooks,
): Promise<void> {
  const { importId } = input;
  const started = performance.now();
  const loopAtStart = performance.eventLoopUtilization();
  hooks.holdHeartbeat?.(true);
  let writer: ImportWriter | null = null;
  try {
    // The progress file exists for the whole run: it tells getImport and cancelImport that
    // this import holds (or is about to hold) the write lock.
    writeRunProgress(storedPath, {
      bytesRead: 0,
      rowsTotal: 0,
      rowsRejected: 0,
      rowsWarning: 0,
      rowsDuplicate: 0,
    });
    writer = await ImportWriter.open(file);
    const result = await readAndWrite(db, writer, {
      ...input,
      storedPath,
      shouldContinue: async () => !hasRunCancel(storedPath),
    });
    if (result.isCancelled) {
      await writer.rollback();
      writer = null;
      hooks.holdHeartbeat?.(false);
      const request = readRunCancel(storedPath);
      await db.batch([
        db
          .update(imports)
          .set({
            status: "cancelled",
            cancelRequestedAt: request?.at ?? now(),
            finishedAt: now(),
          })
          .where(eq(imports.id, importId)),
        db.insert(auditLog).values({
          organisationId: input.organisationId,
          userId: request?.userId ?? null,
          action: "import.cancel",
          entity: "import",
          entityId: String(importId),
        }),
      ]);
      hooks.log?.(`import ${importId} cancelled after ${result.rowsTotal} rows`);
      return;
    }
    writer = null; // committed
    const threads: ImportThreadsMessage = {
      importId,
      rows: result.rowsTotal,
      seconds: (performance.now() - started) / 1000,
      readerBusyMs: Math.round(performance.eventLoopUtilization(loopAtStart).active),
      writerBusyMs: result.writerBusyMs,
    };
    importThreadsChannel.publish(threads);
    hooks.log?.(
      `import ${importId}: read and wrote ${threads.rows} rows in one transaction in ${threads.seconds.toFixed(1)} s (reading thread busy ${threads.readerBusyMs} ms; writer busy, ms: ${JSON.stringify(threads.writerBusyMs)})`,
    );
  } finally {
    await writer?.rollback();
    hooks.holdHeartbeat?.(false);
    removeRunFiles(storedPath);
  }
}

/** Marks an import failed for good, with a message for the user; its file is kept. */
export async function failImport(db: Db, importId: number, reason: string): Promise<void> {
  const [imp] = await db
    .select({ kind: imports.kind, status: imports.status })
    .from(imports)
    .where(eq(imports.id, importId));
  if (!imp || imp.status === "done" || imp.status === "undone") return;
  await db
    .update(imports)
    .set({ status: "failed", error: reason.slice(0, 1000), finishedAt: now() })
    .where(eq(imports.id, importId));
  // Rows of a partial apply stay hidden once the import is "failed"; then they are removed.
  await removePartialApply(db, imp.kind, importId);
  await clearStagedRows(db, imp.kind, importId);
}
