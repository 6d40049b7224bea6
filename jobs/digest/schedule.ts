import { Cron } from "croner";
import { sql } from "drizzle-orm";
import type { Db } from "@/db";
import { enqueueJob } from "../queue";

/** When the weekly digest goes out: RECURRA_DIGEST_CRON (cron syntax, UTC); Monday 07:00 by default. */
export const DIGEST_CRON = process.env.RECURRA_DIGEST_CRON ?? "0 7 * * 1";

/**
 * Queues a `digest` job for every organisation on the digest schedule (croner). Several
 * processes may run the schedule: the job sends at most one digest per organisation and week.
 */
export function startDigestSchedule(opts: {
  db: Db;
  signal?: AbortSignal;
  log?: (m: string) => void;
}) {
  const job = new Cron(DIGEST_CRON, { timezone: "UTC", protect: true }, async () => {
    try {
      const orgs = await opts.db.all<{ id: number }>(sql`select id from organisations`);
      for (const o of orgs) {
        await enqueueJob(opts.db, {
          kind: "digest",
          organisationId: o.id,
          payload: { organisationId: o.id },
        });
      }
      opts.log?.(`digest queued for ${orgs.length} organisations`);
    } catch (e) {
      console.error("[recurra digest] could not queue the weekly digest:", e);
    }
  });
  opts.signal?.addEventListener("abort", () => job.stop(), { once: true });
  return job;
}
