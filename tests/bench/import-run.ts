/**
 * One benchmark import in its own process (so its peak memory is its own): a fresh database,
 * one organisation, then the product's pipeline exactly as an upload takes it — store the file,
 * inspect it, start the import, let a worker run the job. Prints one JSON line.
 */
import diagnostics_channel from "node:diagnostics_channel";
import { createReadStream, readFileSync } from "node:fs";
import { basename } from "node:path";
import { parse } from "csv-parse";
import { getDatabase } from "@/db";
import { migrateDatabase } from "@/db/migrate";
import { getImport, startImport } from "@/db/queries/imports";
import { createOrganisation } from "@/db/queries/system";
import { loadReferenceData } from "@/db/seed/reference";
import { importParseOptions, recordBatches } from "@/jobs/import/csv-stream";
import { mappingByName } from "@/jobs/import/inspect";
import { IMPORT_THREADS_CHANNEL, type ImportThreadsMessage } from "@/jobs/import/run-import";
import { receiveUpload } from "@/jobs/import/upload";
import { startWorker } from "@/jobs/worker";

const file = process.argv[2];
if (!file) throw new Error("usage: import-run.ts <file.csv> [--parse-only]");

if (process.argv[3] === "--parse-only") {
  // csv-parse alone on the same file, with the import's options: the least a reading thread
  // built on it can take, before any check or write.
  const started = performance.now();
  let records = 0;
  const parser = createReadStream(file).pipe(parse(importParseOptions(",")));
  for await (const batch of recordBatches(parser)) records += batch.length;
  const seconds = (performance.now() - started) / 1000;
  process.stdout.write(`${JSON.stringify({ records, seconds })}\n`);
  process.exit(0);
}
const { db, client } = await getDatabase();
await migrateDatabase(db);
await loadReferenceData(db);
const org = await createOrganisation(db, {
  slug: "bench",
  name: "Benchmark",
  kind: "shop",
  distanceUnit: "mi",
});
await client.execute({
  sql: "update organisations set upload_limit_mb = 2000 where id = ?",
  args: [org.id],
});
const scope = { organisationId: org.id, userId: null, role: "admin" as const };

const started = performance.now();
const { importId, inspection } = await receiveUpload(db, scope, {
  kind: "repairs",
  fileName: basename(file),
  source: createReadStream(file),
});
const { jobId } = await startImport(db, scope, importId, {
  delimiter: inspection.delimiter,
  headers: inspection.headers,
  mapping: mappingByName(inspection.headers, inspection.mapping),
  read: inspection.read,
});
// How long each thread was busy, as the import publishes it (jobs/import/run-import.ts).
let busy: { readerMs: number; writerMs: number } | null = null;
diagnostics_channel.subscribe(IMPORT_THREADS_CHANNEL, (message) => {
  const m = message as ImportThreadsMessage;
  const writerMs = Object.values(m.writerBusyMs).reduce((x, y) => x + y, 0);
  busy = { readerMs: m.readerBusyMs, writerMs };
});
await startWorker({
  db,
  jobId,
  isOneShot: true,
  log: (m) => process.stderr.write(`${m}\n`),
});
const seconds = (performance.now() - started) / 1000;
const result = await getImport(db, scope, importId);
// VmHWM: the process's peak resident set size, as the kernel counted it.
const hwm = /VmHWM:\s+(\d+) kB/.exec(readFileSync("/proc/self/status", "utf8"));
process.stdout.write(
  `${JSON.stringify({
    status: result.status,
    rows: result.rowsTotal,
    imported: result.rowsImported,
    rejected: result.rowsRejected,
    seconds,
    peakRssMb: hwm ? Number(hwm[1]) / 1024 : null,
    busy,
  })}\n`,
);
client.close();
