import { spawn, type ChildProcess } from "node:child_process";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { openDatabase, type Db } from "@/db";
import { getImport, startImport } from "@/db/queries/imports";
import type { OrgScope } from "@/db/queries/scope";
import { migrateDatabase } from "@/db/migrate";
import { mappingByName } from "@/jobs/import/inspect";
import { rows, scratch, setUpOrganisation, upload } from "../support/import-helpers";
import { startSqld, type SqldServer } from "../support/sqld";

process.env.RECURRA_DATA_DIR = scratch;

/**
 * Two `npm run worker` processes against one libSQL server: a queue of imports and the
 * recomputes they queue runs with each job executed once; a worker killed in the middle of an
 * import leaves it to the other once the lease has expired, and nothing is lost or doubled.
 */

const LEASE_MS = 2_000;

type Worker = { id: string; child: ChildProcess; log: () => string; exited: Promise<void> };

let server: SqldServer;
let db: Db;
let close: () => void;
const scopes: OrgScope[] = [];
const workers: Worker[] = [];

/** A worker process (tsx as a loader, so the pid is the worker itself and SIGKILL hits it). */
function startWorkerProcess(id: string): Worker {
  const child = spawn(
    process.execPath,
    ["--import", "tsx", "--conditions=react-server", join(process.cwd(), "jobs/worker-main.ts")],
    {
      env: {
        ...process.env,
        DATABASE_URL: server.url,
        RECURRA_DATA_DIR: scratch,
        RECURRA_WORKER_ID: id,
        RECURRA_WORKER_LEASE_MS: String(LEASE_MS),
        RECURRA_WORKER_POLL_MS: "100",
      },
      stdio: ["ignore", "ignore", "pipe"],
    },
  );
  let log = "";
  child.stderr?.on("data", (d: Buffer) => (log += d.toString()));
  const exited = new Promise<void>((r) => child.once("exit", () => r()));
  const worker = { id, child, log: () => log, exited };
  workers.push(worker);
  return worker;
}

async function waitFor(what: string, check: () => Promise<boolean> | boolean, timeoutMs: number) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`timed out waiting for ${what}\n${workers.map((w) => w.log()).join("\n")}`);
}

function repairsCsv(n: number, prefix: string): string {
  const lines = ["ro_number,unit_number,opened_on,odometer,complaint,correction,dtc_codes"];
  for (let i = 0; i < n; i++) {
    lines.push(
      `${prefix}-${i},U-${(i % 3) + 1},2025-03-${String((i % 28) + 1).padStart(2, "0")},${60000 + i},Rough idle when cold,Replaced coil,${i % 4 === 0 ? "P0301" : ""}`,
    );
  }
  return lines.join("\n");
}

/** Uploads a file and queues its import job, as the mapping screen's "Start" does. */
async function queueImport(scope: OrgScope, name: string, content: string) {
  const { importId, inspection } = await upload(db, scope, "repairs", name, content);
  const { jobId } = await startImport(db, scope, importId, {
    delimiter: inspection.delimiter,
    headers: inspection.headers,
    mapping: mappingByName(inspection.headers, inspection.mapping),
    read: inspection.read,
  });
  return { importId, jobId };
}

type JobRow = { id: number; kind: string; status: string; attempts: number; lease_owner: string };

beforeAll(async () => {
  server = await startSqld();
  const handle = await openDatabase(server.url);
  db = handle.db;
  close = () => handle.client.close();
  await migrateDatabase(db);
  scopes.push(await setUpOrganisation(db, "workers-a"), await setUpOrganisation(db, "workers-b"));
  for (const id of ["worker-1", "worker-2"]) startWorkerProcess(id);
  await waitFor(
    "both workers to start",
    () => workers.every((w) => w.log().includes(`${w.id} started`)),
    60_000,
  );
});

afterAll(async () => {
  for (const w of workers) if (w.child.exitCode === null) w.child.kill("SIGKILL");
  await Promise.all(workers.map((w) => w.exited));
  close?.();
  await server?.stop();
});

describe("two workers on one libSQL server", () => {
  test("a queue of imports and recomputes: every job runs exactly once, shared between the workers", async () => {
    const ROWS = 4_000;
    const queued = [];
    for (let i = 0; i < 6; i++) {
      const scope = scopes[i % 2] as OrgScope;
      queued.push({
        scope,
        ...(await queueImport(scope, `queue-${i}.csv`, repairsCsv(ROWS, `Q${i}`))),
      });
    }
    await waitFor(
      "the imports and their recomputes",
      async () => {
        const [open] = await rows<{ n: number }>(
          db,
          "select count(*) as n from jobs where status in ('queued', 'running')",
        );
        return Number(open?.n) === 0;
      },
      240_000,
    );
    const jobs = await rows<JobRow>(
      db,
      "select id, kind, status, attempts, lease_owner from jobs order by id",
    );
    const imports = jobs.filter((j) => j.kind === "import");
    expect(imports).toHaveLength(6);
    // Claimed once each, finished, by one of the two workers.
    for (const j of imports) {
      expect(j).toMatchObject({ status: "done", attempts: 1 });
      expect(["worker-1", "worker-2"]).toContain(j.lease_owner);
    }
    // Each import job was run once: its "read and staged" line is in exactly one worker's log.
    const logs = workers.map((w) => w.log()).join("\n");
    for (const { importId } of queued) {
      expect(logs.match(new RegExp(`import ${importId}: read and staged`, "g"))).toHaveLength(1);
    }
    // The work was shared: both workers ran at least one job.
    expect(new Set(jobs.filter((j) => j.attempts > 0).map((j) => j.lease_owner)).size).toBe(2);
    // Every row landed once.
    for (const { scope, importId } of queued) {
      expect(await getImport(db, scope, importId)).toMatchObject({
        status: "done",
        rowsImported: ROWS,
        rowsDuplicate: 0,
      });
    }
    const [counts] = await rows<{ lines: number; staged: number }>(
      db,
      `select (select count(*) from repair_lines) as lines, (select count(*) from staged_repairs) as staged`,
    );
    expect(counts).toEqual({ lines: 6 * ROWS, staged: 0 });
    // Recomputes: every one queued finished, some merged into a later one; each organisation
    // has exactly one current analysis run with cells.
    const recomputes = jobs.filter((j) => j.kind === "recompute");
    expect(recomputes.length).toBe(6);
    for (const j of recomputes) expect(j.status).toBe("done");
    const runs = await rows<{ organisation_id: number; n: number; cells: number }>(
      db,
      `select organisation_id, count(*) as n, sum(cells) as cells from analysis_runs group by organisation_id order by organisation_id`,
    );
    expect(runs.map((r) => Number(r.n))).toEqual([1, 1]);
    for (const r of runs) expect(Number(r.cells)).toBeGreaterThan(0);
  }, 300_000);

  test("killing the worker in the middle of an import: the other takes it over after the lease, and it lands once", async () => {
    const ROWS = 60_000;
    const scope = scopes[0] as OrgScope;
    const { importId, jobId } = await queueImport(scope, "kill.csv", repairsCsv(ROWS, "K"));
    // Whichever worker claims the import is killed once it has committed some staged rows.
    await waitFor(
      "the import to be reading",
      async () => {
        const imp = await getImport(db, scope, importId);
        return imp.status === "reading" && imp.rowsTotal > 0;
      },
      60_000,
    );
    const [claimed] = await rows<JobRow>(
      db,
      "select id, kind, status, attempts, lease_owner from jobs where id = ?",
      [jobId],
    );
    const doomed = workers.find((w) => w.id === claimed?.lease_owner);
    const survivor = workers.find((w) => w !== doomed);
    if (!doomed || !survivor) throw new Error(`job ${jobId} is not held by a worker`);
    const midway = await getImport(db, scope, importId);
    expect(midway.rowsTotal).toBeLessThan(ROWS);
    doomed.child.kill("SIGKILL");
    await doomed.exited;
    // Until the dead worker's lease runs out, nobody else takes the job.
    const [held] = await rows<JobRow & { lease_expires_at: number }>(
      db,
      "select id, kind, status, attempts, lease_owner, lease_expires_at from jobs where id = ?",
      [jobId],
    );
    expect(held).toMatchObject({ status: "running", attempts: 1, lease_owner: doomed.id });
    if (Date.now() < Number(held?.lease_expires_at) - 500) {
      await new Promise((r) => setTimeout(r, 200));
      const [still] = await rows<JobRow>(
        db,
        "select lease_owner, attempts from jobs where id = ?",
        [jobId],
      );
      expect(still).toMatchObject({ lease_owner: doomed.id, attempts: 1 });
    }

    await waitFor(
      "the other worker to finish the import",
      async () => {
        const [j] = await rows<JobRow>(db, "select status from jobs where id = ?", [jobId]);
        return j?.status === "done" || j?.status === "failed";
      },
      180_000,
    );
    const [job] = await rows<JobRow & { finished_at: string }>(
      db,
      "select id, kind, status, attempts, lease_owner, finished_at from jobs where id = ?",
      [jobId],
    );
    expect(job).toMatchObject({ status: "done", attempts: 2, lease_owner: survivor.id });
    expect(survivor.log()).toMatch(new RegExp(`import ${importId}: read and staged ${ROWS} rows`));
    expect(await getImport(db, scope, importId)).toMatchObject({
      status: "done",
      rowsTotal: ROWS,
      rowsImported: ROWS,
      rowsDuplicate: 0,
    });
    const [counts] = await rows<{ lines: number; orders: number; staged: number }>(
      db,
      `select (select count(*) from repair_lines where import_id = ?) as lines,
              (select count(distinct ro_number) from repair_orders where import_id = ?) as orders,
              (select count(*) from staged_repairs) as staged`,
      [importId, importId],
    );
    expect(counts).toEqual({ lines: ROWS, orders: ROWS, staged: 0 });
  }, 300_000);
});
