import { and, eq, sql } from "drizzle-orm";
import type { Db, DbOrTx } from "@/db";
import { jobs } from "@/db/schema";

/**
 * The job queue: rows in `jobs`, claimed by workers with a lease. Claiming is a read for a
 * candidate, then an UPDATE … RETURNING that checks again, so two workers can never claim the
 * same job; a worker that dies stops extending its lease, and once the lease has expired
 * another worker claims the job again. An idle worker's poll only reads.
 */

export type Job = typeof jobs.$inferSelect;

export async function enqueueJob(
  db: DbOrTx,
  input: {
    kind: string;
    organisationId?: number | null;
    payload?: unknown;
    runAfter?: number;
    maxAttempts?: number;
  },
): Promise<number> {
  const [row] = await db
    .insert(jobs)
    .values({
      kind: input.kind,
      organisationId: input.organisationId ?? null,
      payload: input.payload ?? null,
      runAfter: input.runAfter ?? Date.now(),
      maxAttempts: input.maxAttempts ?? 3,
    })
    .returning({ id: jobs.id });
  if (!row) throw new Error("enqueueJob: insert returned no row");
  return row.id;
}

/**
 * Claims the oldest runnable job: queued and due, or running with an expired lease and attempts
 * left. Returns null when there is nothing to do.
 */
export async function claimJob(
  db: Db,
  opts: { workerId: string; leaseMs: number; kinds?: readonly string[]; jobId?: number },
): Promise<Job | null> {
  const now = Date.now();
  const kindFilter = opts.kinds?.length
    ? sql`and kind in (${sql.join(
        opts.kinds.map((k) => sql`${k}`),
        sql`, `,
      )})`
    : sql``;
  const idFilter = opts.jobId ? sql`and id = ${opts.jobId}` : sql``;
  const isRunnable = sql`((status = 'queued' and run_after <= ${now})
      or (status = 'running' and lease_expires_at < ${now} and attempts < max_attempts))`;
  // Looked for first with a read, so an idle worker's poll never takes the write lock: a
  // libSQL server rolls back a long write (an import's apply) when another client waits for
  // its lock. Two workers can see the same candidate; the UPDATE checks again, so only one
  // gets it, and the other tries the next one (each miss means another worker took a job, so
  // this ends; the bound is only a guard).
  for (let tries = 0; tries < 50; tries++) {
    const [candidate] = await db.all<{ id: number }>(sql`
      select id from jobs where ${isRunnable} ${kindFilter} ${idFilter} order by id limit 1`);
    if (!candidate) return null;
    const rows = await db.all<Record<string, unknown>>(sql`
      update jobs
         set status = 'running', lease_owner = ${opts.workerId},
             lease_expires_at = ${now + opts.leaseMs}, attempts = attempts + 1
       where id = ${Number(candidate.id)} and ${isRunnable}
      returning id`);
    const id = rows[0]?.id;
    if (id === undefined) continue; // another worker was first
    const [job] = await db
      .select()
      .from(jobs)
      .where(eq(jobs.id, Number(id)));
    return job ?? null;
  }
  return null;
}

/** Extends the lease (and records progress); false when the lease was lost to another worker. */
export async function extendLease(
  db: Db,
  job: { id: number; workerId: string },
  leaseMs: number,
  progress?: number,
): Promise<boolean> {
  const result = await db
    .update(jobs)
    .set({
      leaseExpiresAt: Date.now() + leaseMs,
      ...(progress === undefined ? {} : { progress }),
    })
    .where(and(eq(jobs.id, job.id), eq(jobs.leaseOwner, job.workerId), eq(jobs.status, "running")));
  return result.rowsAffected > 0;
}

export async function completeJob(db: Db, job: { id: number; workerId: string }): Promise<void> {
  await db
    .update(jobs)
    .set({ status: "done", finishedAt: new Date().toISOString(), leaseExpiresAt: null })
    .where(and(eq(jobs.id, job.id), eq(jobs.leaseOwner, job.workerId)));
}

/**
 * Records a failure: the job is queued again after a back-off while attempts remain, otherwise
 * it is failed for good. Returns true when it was failed for good.
 */
export async function failJob(
  db: Db,
  job: { id: number; workerId: string; attempts: number; maxAttempts: number },
  error: string,
  opts: { isRetryable: boolean },
): Promise<boolean> {
  const isFinal = !opts.isRetryable || job.attempts >= job.maxAttempts;
  await db
    .update(jobs)
    .set({
      status: isFinal ? "failed" : "queued",
      lastError: error.slice(0, 2000),
      runAfter: Date.now() + 2_000 * 2 ** job.attempts,
      leaseOwner: null,
      leaseExpiresAt: null,
      finishedAt: isFinal ? new Date().toISOString() : null,
    })
    .where(and(eq(jobs.id, job.id), eq(jobs.leaseOwner, job.workerId)));
  return isFinal;
}

/**
 * Jobs whose lease expired with no attempts left (their worker died on the last try): marks
 * them failed and returns them, so their owners (e.g. an import) can be marked failed too.
 */
export async function reapAbandonedJobs(db: Db): Promise<Job[]> {
  const now = Date.now();
  const isAbandoned = sql`status = 'running' and lease_expires_at < ${now} and attempts >= max_attempts`;
  // A read first, so a poll with nothing to reap takes no write lock (see claimJob).
  const [any] = await db.all<{ id: number }>(sql`select id from jobs where ${isAbandoned} limit 1`);
  if (!any) return [];
  const rows = await db.all<{ id: number }>(sql`
    update jobs set status = 'failed', last_error = 'The worker stopped before finishing; no attempts left.',
           finished_at = strftime('%Y-%m-%dT%H:%M:%fZ','now'), lease_owner = null, lease_expires_at = null
     where ${isAbandoned}
    returning id`);
  if (rows.length === 0) return [];
  return db
    .select()
    .from(jobs)
    .where(
      sql`${jobs.id} in (${sql.join(
        rows.map((r) => sql`${Number(r.id)}`),
        sql`, `,
      )})`,
    );
}
