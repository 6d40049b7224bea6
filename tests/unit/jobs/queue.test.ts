import { spawn } from "node:child_process";
import { createClient } from "@libsql/client";
import { join } from "node:path";
import { beforeAll, describe, expect, onTestFinished, test } from "vitest";
import type { Db } from "@/db";
import { getImport, startImport } from "@/db/queries/imports";
import type { OrgScope } from "@/db/queries/scope";
import { mappingByName } from "@/jobs/import/inspect";
import {
  claimJob,
  completeJob,
  enqueueJob,
  extendLease,
  failJob,
  reapAbandonedJobs,
} from "@/jobs/queue";
import { startWorker } from "@/jobs/worker";
import { rows, scratch, setUpOrganisation, upload } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

process.env.RECURRA_DATA_DIR = scratch;

let db: Db;
let url: string;
let scope: OrgScope;

beforeAll(async () => {
  ({ db, url } = await createTestDb());
  scope = await setUpOrganisation(db, "queue");
});

describe("job queue with leases", () => {
  test("two workers claiming at once never get the same job", async () => {
    const ids = await Promise.all(
      [1, 2, 3, 4].map((i) => enqueueJob(db, { kind: "noop", payload: { i } })),
    );
    const claims = await Promise.all(
      Array.from({ length: 6 }, (_, w) =>
        claimJob(db, { workerId: `w${w}`, leaseMs: 60_000, kinds: ["noop"] }),
      ),
    );
    const claimed = claims.filter((c) => c !== null).map((c) => c.id);
    expect(claimed.sort()).toEqual([...ids].sort());
    expect(new Set(claimed).size).toBe(4);
    for (const c of claims)
      if (c) await completeJob(db, { id: c.id, workerId: c.leaseOwner ?? "" });
  });

  test("an idle poll only reads: it does not wait while another client holds the write lock", async () => {
    // On a libSQL server a waiting writer gets a long write (an import's apply) rolled back;
    // on a file it would wait out the busy timeout (10 s). Another client takes the lock here.
    const other = createClient({ url });
    const tx = await other.transaction("write");
    try {
      await tx.execute("update jobs set payload = payload where id = -1");
      const started = performance.now();
      expect(
        await claimJob(db, { workerId: "idle", leaseMs: 60_000, kinds: ["none-queued"] }),
      ).toBeNull();
      expect(await reapAbandonedJobs(db)).toEqual([]);
      expect(performance.now() - started).toBeLessThan(2_000);
    } finally {
      await tx.rollback();
      tx.close();
      other.close();
    }
  });

  test("an expired lease is claimed again; the old owner can no longer extend it", async () => {
    const id = await enqueueJob(db, { kind: "noop2" });
    const first = await claimJob(db, { workerId: "a", leaseMs: 50, kinds: ["noop2"] });
    expect(first?.id).toBe(id);
    expect(await claimJob(db, { workerId: "b", leaseMs: 50, kinds: ["noop2"] })).toBeNull();
    await new Promise((r) => setTimeout(r, 80));
    const second = await claimJob(db, { workerId: "b", leaseMs: 60_000, kinds: ["noop2"] });
    expect(second).toMatchObject({ id, attempts: 2, leaseOwner: "b" });
    expect(await extendLease(db, { id, workerId: "a" }, 60_000)).toBe(false);
    expect(await extendLease(db, { id, workerId: "b" }, 60_000)).toBe(true);
    await completeJob(db, { id, workerId: "b" });
  });

  test("a failing job is retried with back-off, then failed for good", async () => {
    const id = await enqueueJob(db, { kind: "noop3", maxAttempts: 2 });
    const a = await claimJob(db, { workerId: "a", leaseMs: 60_000, kinds: ["noop3"] });
    expect(
      await failJob(db, { id, workerId: "a", attempts: a!.attempts, maxAttempts: 2 }, "boom", {
        isRetryable: true,
      }),
    ).toBe(false);
    const [queued] = await rows<{ status: string; run_after: number }>(
      db,
      "select status, run_after from jobs where id = ?",
      [id],
    );
    expect(queued?.status).toBe("queued");
    expect(Number(queued?.run_after)).toBeGreaterThan(Date.now());
    await db.$client.execute({ sql: "update jobs set run_after = 0 where id = ?", args: [id] });
    const b = await claimJob(db, { workerId: "b", leaseMs: 60_000, kinds: ["noop3"] });
    expect(
      await failJob(db, { id, workerId: "b", attempts: b!.attempts, maxAttempts: 2 }, "boom", {
        isRetryable: true,
      }),
    ).toBe(true);
    const [failed] = await rows<{ status: string; last_error: string }>(
      db,
      "select status, last_error from jobs where id = ?",
      [id],
    );
    expect(failed).toMatchObject({ status: "failed", last_error: "boom" });
  });

  test("an import that gives up on a database error tells the user so, without the raw error", async () => {
    const csv =
      "ro_number,unit_number,make,model,model_year,opened_on,odometer,complaint\nRO-GU-1,GU-1,Ostra,Wren,2021,2025-01-05,41000,Stalls\n";
    const { importId, inspection } = await upload(db, scope, "repairs", "give-up.csv", csv);
    const { jobId } = await startImport(db, scope, importId, {
      delimiter: inspection.delimiter,
      headers: inspection.headers,
      mapping: mappingByName(inspection.headers, inspection.mapping),
      read: inspection.read,
    });
    await db.$client.execute({
      sql: "update jobs set max_attempts = 1 where id = ?",
      args: [jobId],
    });
    // Any write of a repair order fails, as a broken disk or a lost server would.
    await db.$client.execute(
      "create trigger give_up_test before insert on repair_orders begin select raise(abort, 'simulated storage failure XQ7'); end",
    );
    onTestFinished(async () => {
      await db.$client.execute("drop trigger if exists give_up_test");
    });
    await startWorker({ db, jobId, isOneShot: true, log: () => {} });
    const imp = await getImport(db, scope, importId);
    expect(imp?.status).toBe("failed");
    expect(imp?.error).toContain("unexpected error");
    expect(imp?.error).not.toContain("XQ7");
    const [job] = await rows<{ status: string; last_error: string }>(
      db,
      "select status, last_error from jobs where id = ?",
      [jobId],
    );
    expect(job?.status).toBe("failed");
    expect(job?.last_error).toContain("simulated storage failure XQ7");
    const [orders] = await rows<{ n: number }>(
      db,
      "select count(*) as n from repair_orders where import_id = ?",
      [importId],
    );
    expect(Number(orders?.n)).toBe(0);
  });

  test("a job abandoned on its last attempt is reaped as failed", async () => {
    const id = await enqueueJob(db, { kind: "noop4", maxAttempts: 1 });
    await claimJob(db, { workerId: "a", leaseMs: 10, kinds: ["noop4"] });
    await new Promise((r) => setTimeout(r, 30));
    const reaped = await reapAbandonedJobs(db);
    expect(reaped.map((j) => j.id)).toContain(id);
    expect(reaped.find((j) => j.id === id)?.status).toBe("failed");
  });
});

describe("a worker killed in the middle of an import", () => {
  test("the import is picked up by another worker after the lease expires, and lands exactly once", async () => {
    const ROWS = 120_000;
    const lines = ["ro_number,unit_number,opened_on,odometer,complaint,correction,dtc_codes"];
    for (let i = 0; i < ROWS; i++) {
      const unit = `U-${(i % 3) + 1}`;
      lines.push(
        `K-${i},${unit},2025-01-${String((i % 28) + 1).padStart(2, "0")},${40000 + i},Noise from the front end,Tightened,${i % 5 === 0 ? "P0300" : ""}`,
      );
    }
    const { importId, inspection } = await upload(
      db,
      scope,
      "repairs",
      "kill-test.csv",
      lines.join("\n"),
    );
    const { jobId } = await startImport(db, scope, importId, {
      delimiter: inspection.delimiter,
      headers: inspection.headers,
      mapping: mappingByName(inspection.headers, inspection.mapping),
      read: inspection.read,
    });
    // One process (tsx as a loader rather than npx → tsx → node), so SIGKILL hits the worker.
    const child = spawn(
      process.execPath,
      ["--import", "tsx", "--conditions=react-server", join(process.cwd(), "jobs/worker-main.ts")],
      {
        env: {
          ...process.env,
          DATABASE_URL: url,
          RECURRA_DATA_DIR: scratch,
          RECURRA_WORKER_ID: "doomed",
          RECURRA_WORKER_LEASE_MS: "1500",
          RECURRA_WORKER_POLL_MS: "100",
        },
        stdio: ["ignore", "ignore", "pipe"],
      },
    );
    onTestFinished(() => {
      if (child.exitCode === null) child.kill("SIGKILL");
    });
    let childLog = "";
    child.stderr?.on("data", (d: Buffer) => (childLog += d.toString()));
    const exited = new Promise((r) => child.once("exit", r));
    // Wait until the child is reading the file and has committed some staged rows, then kill it.
    for (let i = 0; i < 600; i++) {
      const imp = await getImport(db, scope, importId);
      if (imp.status === "reading" && imp.rowsTotal > 0) break;
      await new Promise((r) => setTimeout(r, 50));
    }
    const midway = await getImport(db, scope, importId);
    expect(midway.status).toBe("reading");
    expect(midway.rowsTotal).toBeLessThan(ROWS);
    expect(child.exitCode, childLog).toBeNull();
    child.kill("SIGKILL");
    await exited;
    expect(
      Number(
        (
          await rows<{ n: number }>(
            db,
            "select count(*) as n from repair_lines where import_id = ?",
            [importId],
          )
        )[0]?.n,
      ),
    ).toBe(0);

    // Another worker takes the job over once the dead one's lease has run out.
    await startWorker({
      db,
      workerId: "survivor",
      jobId,
      isOneShot: true,
      leaseMs: 30_000,
      log: () => {},
    });
    let result = await getImport(db, scope, importId);
    for (let i = 0; i < 40 && result.status !== "done"; i++) {
      await new Promise((r) => setTimeout(r, 250));
      await startWorker({
        db,
        workerId: "survivor",
        jobId,
        isOneShot: true,
        leaseMs: 30_000,
        log: () => {},
      });
      result = await getImport(db, scope, importId);
    }
    expect(result).toMatchObject({
      status: "done",
      rowsTotal: ROWS,
      rowsImported: ROWS,
      rowsDuplicate: 0,
    });
    const [job] = await rows<{ attempts: number; lease_owner: string; status: string }>(
      db,
      "select attempts, lease_owner, status from jobs where id = ?",
      [jobId],
    );
    expect(job).toMatchObject({ attempts: 2, status: "done", lease_owner: "survivor" });
    const counts = await rows<{ lines: number; orders: number; staged: number }>(
      db,
      `select (select count(*) from repair_lines where import_id = ?) as lines,
              (select count(distinct ro_number) from repair_orders where import_id = ?) as orders,
              (select count(*) from staged_repairs) as staged`,
      [importId, importId],
    );
    expect(counts[0]).toEqual({ lines: ROWS, orders: ROWS, staged: 0 });
  }, 120_000);
});
