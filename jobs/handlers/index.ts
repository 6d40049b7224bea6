import type { Db } from "@/db";
import type { Job } from "../queue";
import { digestJobHandler } from "./digest";
import { importJobHandler } from "./import";
import { recomputeJobHandler } from "./recompute";

export type JobContext = {
  db: Db;
  job: Job;
  log: (msg: string) => void;
  /** Progress for the job row (0–100); written with the next heartbeat. */
  setProgress: (percent: number) => void;
  /** False once another worker has taken the job over (this one must stop writing). */
  hasLease: () => boolean;
  /**
   * Pauses (true) or resumes (false) the lease heartbeat, while the job itself holds the
   * database's write lock (a heartbeat would only wait for it).
   */
  holdHeartbeat: (isHeld: boolean) => void;
};

export type JobHandler = {
  run: (payload: unknown, ctx: JobContext) => Promise<void>;
  /** Called once when the job has failed for good (no attempts left, or a permanent error). */
  onGiveUp?: (job: Job, reason: string, ctx: JobContext) => Promise<void>;
};

/** Every kind of background work, by job kind. */
export const HANDLERS: Record<string, JobHandler> = {
  import: importJobHandler,
  recompute: recomputeJobHandler,
  digest: digestJobHandler,
};
