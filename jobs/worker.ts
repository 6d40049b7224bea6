import { hostname } from "node:os";
import { setTimeout as sleep } from "node:timers/promises";
import type { Db } from "@/db";
import { claimJob, completeJob, extendLease, failJob, reapAbandonedJobs, type Job } from "./queue";
import { PermanentJobError } from "./errors";
import { HANDLERS, type JobContext } from "./handlers";

/** What the user is told when a job gives up on an error that was not written for them. */
export const UNEXPECTED_FAILURE =
  "It stopped on an unexpected error on its last try (the details are in the worker's log). Try again; if it fails again, tell your administrator.";

export type WorkerOptions = {
  db: Db;
  workerId?: string;
  /** How long a claim lasts without a heartbeat (ms). */
  leaseMs?: number;
  /** Pause between polls of an empty queue (ms). */
  pollMs?: number;
  /** Stop after the queue is empty once (for the CLI and tests). */
  isOneShot?: boolean;
  /** Only this job (the CLI runs the import it just queued). */
  jobId?: number;
  signal?: AbortSignal;
  log?: (msg: string) => void;
};

export function defaultWorkerId(): string {
  return `${hostname()}:${process.pid}:${Math.random().toString(36).slice(2, 8)}`;
}

/** Runs one claimed job with a heartbeat that keeps its lease; returns when it settles. */
export async function runJob(
  db: Db,
  job: Job,
  workerId: string,
  leaseMs: number,
  log: (m: string) => void,
) {
  const handler = HANDLERS[job.kind];
  const owner = { id: job.id, workerId };
  if (!handler) {
    await failJob(
      db,
      { ...owner, attempts: job.attempts, maxAttempts: job.maxAttempts },
      `No handler for job kind "${job.kind}".`,
      {
        isRetryable: false,
      },
    );
    return;
  }
  let hasLease = true;
  let isHeartbeatHeld = false;
  let progress: number | undefined;
  const beat = setInterval(
    () => {
      if (isHeartbeatHeld) return;
      extendLease(db, owner, leaseMs, progress)
        .then((ok) => {
          hasLease = ok;
        })
        .catch((e: unknown) => log(`heartbeat of job ${job.id} failed: ${String(e)}`));
    },
    Math.max(250, Math.floor(leaseMs / 3)),
  );
  const ctx: JobContext = {
    db,
    job,
    log,
    setProgress: (p) => {
      progress = p;
    },
    hasLease: () => hasLease,
    holdHeartbeat: (isHeld) => {
      isHeartbeatHeld = isHeld;
    },
  };
  try {
    await handler.run(job.payload, ctx);
    clearInterval(beat);
    await completeJob(db, owner);
  } catch (e) {
    clearInterval(beat);
    const message = e instanceof Error ? e.message : String(e);
    const isFinal = await failJob(
      db,
      { ...owner, attempts: job.attempts, maxAttempts: job.maxAttempts },
      message,
      {
        isRetryable: !(e instanceof PermanentJobError),
      },
    );
    log(`job ${job.id} (${job.kind}) failed${isFinal ? " for good" : ", will retry"}: ${message}`);
    // A permanent error's message is written for the user (a bad file, a bad mapping); any
    // other error's (the database's, the system's) stays in the log and the job's last_error.
    if (isFinal) {
      await handler.onGiveUp?.(
        job,
        e instanceof PermanentJobError ? message : UNEXPECTED_FAILURE,
        ctx,
      );
    }
  }
}

/**
 * The worker loop: claim, run, repeat. Several workers (processes or machines) can run against
 * one database; each job runs once at a time, and a dead worker's job is picked up again when
 * its lease expires.
 */
export async function startWorker(opts: WorkerOptions): Promise<void> {
  const workerId = opts.workerId ?? defaultWorkerId();
  const leaseMs = opts.leaseMs ?? 30_000;
  const pollMs = opts.pollMs ?? 1_000;
  const log = opts.log ?? ((m: string) => console.warn(`[recurra worker] ${m}`));
  const isLongRunning = !opts.isOneShot && !opts.jobId;
  let pauseMs = pollMs;
  while (!opts.signal?.aborted) {
    try {
      for (const job of await reapAbandonedJobs(opts.db)) {
        await HANDLERS[job.kind]?.onGiveUp?.(job, job.lastError ?? "abandoned", {
          db: opts.db,
          job,
          log,
          setProgress: () => {},
          hasLease: () => false,
          holdHeartbeat: () => {},
        });
      }
      const job = await claimJob(opts.db, { workerId, leaseMs, jobId: opts.jobId });
      pauseMs = pollMs;
      if (job) {
        await runJob(opts.db, job, workerId, leaseMs, log);
        if (opts.jobId) return;
        continue;
      }
    } catch (e) {
      // A long-running worker outlives database hiccups: a libSQL server answers SQLITE_BUSY
      // while it still holds the write lock of a client that died mid-transaction (it rolls it
      // back after a few seconds), and a server can restart. Wait, with back-off, and go on.
      if (!isLongRunning) throw e;
      pauseMs = Math.min(30_000, Math.max(pollMs, pauseMs * 2));
      log(
        `database error, trying again in ${pauseMs} ms: ${e instanceof Error ? e.message : String(e)}`,
      );
    }
    if (opts.isOneShot) return;
    await sleep(pauseMs, undefined, { signal: opts.signal }).catch(() => {});
  }
}
