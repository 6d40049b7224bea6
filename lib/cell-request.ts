import { z } from "zod";

/** Query parameters of the ranked-cells endpoints (and the pattern explorer's URL). */
export const CellQuery = z.object({
  fault: z.string().trim().max(80).optional(),
  make: z.string().trim().max(60).optional(),
  model: z.string().trim().max(60).optional(),
  generation: z.string().trim().max(60).optional(),
  bandFrom: z.coerce.number().min(0).max(10_000_000).optional(),
  bandTo: z.coerce.number().min(0).max(10_000_000).optional(),
  signals: z
    .enum(["0", "1", "true", "false"])
    .optional()
    .transform((v) => v === "1" || v === "true"),
  limit: z.coerce.number().int().min(1).max(1000).default(50),
  offset: z.coerce.number().int().min(0).max(10_000_000).default(0),
});
export type CellQuery = z.infer<typeof CellQuery>;

export const RefuelQuery = z.object({
  window: z.coerce.number().positive().max(500).optional(),
});
