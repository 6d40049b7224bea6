import { z } from "zod";

/** Service levels offered (share of periods with no shortage). */
export const SERVICE_LEVELS = [0.8, 0.9, 0.95, 0.98, 0.99] as const;

/** The planner's settings as query parameters (page, route handler) — all optional. */
export const StockingQuery = z.object({
  serviceLevel: z.coerce
    .number()
    .refine((v) => (SERVICE_LEVELS as readonly number[]).includes(v), {
      message: "Choose 80%, 90%, 95%, 98% or 99%.",
    })
    .default(0.95),
  leadDays: z.preprocess(
    (v) => (v === "" ? undefined : v),
    z.coerce.number().int().min(0, "Not below 0.").max(365, "At most 365 days.").optional(),
  ),
  reviewDays: z.coerce.number().int().min(1).max(365).default(14),
  months: z.coerce.number().int().min(1).max(60).default(12),
  cautious: z
    .enum(["0", "1", "true", "false", "on"])
    .optional()
    .transform((v) => v === "1" || v === "true" || v === "on"),
  format: z.enum(["json", "csv"]).default("json"),
  /** CSV only: the purchase list (parts to reorder) or every part. */
  only: z.enum(["reorder", "all"]).default("reorder"),
});
export type StockingQuery = z.infer<typeof StockingQuery>;
