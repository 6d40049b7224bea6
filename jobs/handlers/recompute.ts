import { z } from "zod";
import { PermanentJobError } from "../errors";
import { recomputeOrganisation } from "../recompute/recompute";
import type { JobHandler } from "./index";

const Payload = z.object({ organisationId: z.number().int().positive() });

/** Recomputes an organisation's cohort × band × fault statistics after its data changed. */
export const recomputeJobHandler: JobHandler = {
  async run(payload, ctx) {
    const parsed = Payload.safeParse(payload);
    if (!parsed.success)
      throw new PermanentJobError("The recompute job has no valid organisation id.");
    // Several imports in a row queue several recomputes: one run covers them all.
    await ctx.db.$client.execute({
      sql: `update jobs set status = 'done', finished_at = strftime('%Y-%m-%dT%H:%M:%fZ','now'), last_error = 'merged into a later recompute'
             where kind = 'recompute' and status = 'queued' and organisation_id = ? and id <> ?`,
      args: [parsed.data.organisationId, ctx.job.id],
    });
    await recomputeOrganisation(ctx.db, parsed.data.organisationId, ctx.log);
  },
};
