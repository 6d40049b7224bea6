import { z } from "zod";

/** The refuel page's settings as query parameters — all optional. */
export const RefuelPageQuery = z.object({
  /** Window after a fill-up, in the organisation's unit; default the organisation's setting. */
  window: z.preprocess(
    (v) => (v === "" ? undefined : v),
    z.coerce
      .number({ message: "The window must be a number." })
      .positive("The window must be above 0.")
      .max(500, "The window is at most 500.")
      .optional(),
  ),
  symptom: z.enum(["both", "stall", "no-start"]).default("both"),
  /** Cohort of the histogram ("make|model|generation"), or "all"; default the strongest. */
  cohort: z.string().trim().max(200).optional(),
});
export type RefuelPageQuery = z.infer<typeof RefuelPageQuery>;
