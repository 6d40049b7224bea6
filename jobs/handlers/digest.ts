import { z } from "zod";
import { sendDigest } from "../digest/digest";
import { PermanentJobError } from "../errors";
import type { JobHandler } from "./index";

const Payload = z.object({ organisationId: z.number().int().positive() });

/** Sends an organisation's weekly digest to the members who opted in (once per ISO week). */
export const digestJobHandler: JobHandler = {
  async run(payload, ctx) {
    const parsed = Payload.safeParse(payload);
    if (!parsed.success) throw new PermanentJobError("The digest job has no valid organisation.");
    const r = await sendDigest(ctx.db, parsed.data.organisationId);
    ctx.log(
      r.skipped
        ? `digest ${r.week}: already sent for organisation ${parsed.data.organisationId}`
        : `digest ${r.week}: queued for ${r.recipients} members`,
    );
  },
};
