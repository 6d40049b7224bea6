import { z } from "zod";
import type { JobHandler } from "./index";

const Payload = z.object({ organisationId: z.number().int().positive() });

/**
 * Recomputes an organisation's cohort × band × fault statistics after its data changed.
 * The statistics engine fills this in; until then the job only validates its payload.
 */
export const recomputeJobHandler: JobHandler = {
  async run(payload, ctx) {
    const { organisationId } = Payload.parse(payload);
    ctx.log(`recompute for organisation ${organisationId}: statistics engine not built yet`);
  },
};
