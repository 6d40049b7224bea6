import { z } from "zod";

/** The id segment of /known-issues/<id>. */
export const IssueId = z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER);
