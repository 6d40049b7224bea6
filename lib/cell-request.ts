import { z } from "zod";
import { ANALYSED_KINDS } from "./component-kinds";

/** An empty form field ("from=") means the filter is not set. */
const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

const IsoDate = z
  .string()
  .trim()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "A date is written YYYY-MM-DD.")
  .refine((d) => !Number.isNaN(Date.parse(d)), "Not a calendar date.");

/**
 * A filtered view: repairs opened in a period (both days included) and/or done by one vendor
 * (cells computed from the raw rows on first use; db/queries/cell-views.ts).
 */
const ViewFields = {
  from: z.preprocess(blankToUndefined, IsoDate.optional()),
  to: z.preprocess(blankToUndefined, IsoDate.optional()),
  vendor: z.preprocess(blankToUndefined, z.string().trim().min(1).max(120).optional()),
};
/** The filters every explorer endpoint shares: cohort, fault, bands, and a period or vendor. */
const CellFilterFields = {
  /** Failure cells (the default) or wear cells. */
  kind: z.preprocess(blankToUndefined, z.enum(ANALYSED_KINDS).optional()),
  fault: z.string().trim().max(80).optional(),
  make: z.string().trim().max(60).optional(),
  model: z.string().trim().max(60).optional(),
  generation: z.string().trim().max(60).optional(),
  bandFrom: z.coerce.number().min(0).max(10_000_000).optional(),
  bandTo: z.coerce.number().min(0).max(10_000_000).optional(),
  ...ViewFields,
};
const periodInOrder = (q: { from?: string; to?: string }) => !q.from || !q.to || q.from <= q.to;
const PERIOD_MESSAGE = { message: "The period ends before it starts.", path: ["to"] };

/** Query parameters of the ranked-cells endpoints (and the pattern explorer's URL). */
export const CellQuery = z
  .object({
    ...CellFilterFields,
    signals: z
      .enum(["0", "1", "true", "false"])
      .optional()
      .transform((v) => v === "1" || v === "true"),
    sort: z.enum(["ratioLower", "rate", "events", "shrunkRate", "qValue", "exposure"]).optional(),
    direction: z.enum(["asc", "desc"]).optional(),
    limit: z.coerce.number().int().min(1).max(1000).default(50),
    offset: z.coerce.number().int().min(0).max(10_000_000).default(0),
  })
  .refine(periodInOrder, PERIOD_MESSAGE);
export type CellQuery = z.infer<typeof CellQuery>;

export const RefuelQuery = z.object({
  window: z.coerce.number().positive().max(500).optional(),
});

export const HeatmapQuery = z
  .object({
    view: z.enum(["cohorts", "faults"]).default("cohorts"),
    ...CellFilterFields,
  })
  .refine(periodInOrder, PERIOD_MESSAGE);

export const CellKeyQuery = z.object({
  make: z.string().trim().min(1).max(60),
  model: z.string().trim().min(1).max(60),
  generation: z.string().trim().min(1).max(60),
  band: z.coerce.number().int().min(0).max(1000),
  fault: z.string().trim().min(1).max(80),
  /** Repair orders opened on or after / on or before (the drill-down's list, totals and CSV). */
  from: z.preprocess(blankToUndefined, IsoDate.optional()),
  to: z.preprocess(blankToUndefined, IsoDate.optional()),
  vendor: z.preprocess(blankToUndefined, z.string().trim().min(1).max(120).optional()),
});
