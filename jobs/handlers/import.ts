import { z } from "zod";
import { failImport, runImport } from "../import/run-import";
import { PermanentJobError } from "../errors";
import type { JobHandler } from "./index";

const Payload = z.object({ importId: z.number().int().positive() });

function importIdOf(payload: unknown): number {
  const parsed = Payload.safeParse(payload);
  if (!parsed.success) throw new PermanentJobError("The import job has no valid import id.");
  return parsed.data.importId;
}

/** Reads, checks, stages and applies one uploaded file (jobs/import/run-import.ts). */
export const importJobHandler: JobHandler = {
  async run(payload, ctx) {
    await runImport(ctx.db, importIdOf(payload), {
      hasLease: ctx.hasLease,
      holdHeartbeat: ctx.holdHeartbeat,
      log: ctx.log,
    });
  },
  async onGiveUp(job, reason, ctx) {
    await failImport(ctx.db, importIdOf(job.payload), reason);
  },
};
