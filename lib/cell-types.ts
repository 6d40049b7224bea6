/**
 * The shapes a computed cell takes on its way to the screens, all derived from the stored cell
 * (db/schema/analysis.ts `StoredCell`, itself `typeof cellStats.$inferSelect`): no field is
 * written by hand a second time. Pure and free of the database, so that client components
 * (heatmap, ranked table) may import it.
 */
import type { StoredCell } from "@/db/schema/analysis";

export type { StoredCell };

/** The fields every figure on the screens is read from (lib/metrics.ts). */
export const FIGURE_FIELDS = [
  "kind",
  "events",
  "exposureMi",
  "vehiclesAtRisk",
  "vehiclesAffected",
  "ratePer10k",
  "rateLower",
  "rateUpper",
  "shareAffected",
  "shareLower",
  "shareUpper",
  "rateRatio",
  "ratioLower",
  "ratioUpper",
  "pValue",
  "qValue",
  "shrunkRatePer10k",
  "isSignal",
  "hasTooLittleData",
] as const satisfies readonly (keyof StoredCell)[];
export type FigureField = (typeof FIGURE_FIELDS)[number];

/** The stored gamma posterior the steady rate's interval is worked out from. */
export const POSTERIOR_FIELDS = [
  "posteriorShape",
  "posteriorExposureMi",
] as const satisfies readonly (keyof StoredCell)[];

/**
 * The steady (shrunk) rate's interval per 10,000 mi: the equal-tailed interval of the cell's
 * stored gamma posterior at its run's confidence. Not stored; worked out when the cell is read
 * (db/queries/cell-rows.ts), because its quantiles are too heavy to ship to the browser.
 */
export type SteadyInterval = { shrunkLower: number | null; shrunkUpper: number | null };

/** A cell's figures: what lib/metrics.ts reads. */
export type CellFigures = Pick<StoredCell, FigureField> & SteadyInterval;

export const BAND_FIELDS = [
  "bandIndex",
  "bandFromMi",
  "bandToMi",
] as const satisfies readonly (keyof StoredCell)[];
/** A cell of the heatmap and of the drill-down: its band and its figures. */
export type HeatCell = CellFigures & Pick<StoredCell, (typeof BAND_FIELDS)[number]>;

/** Where a cell sits: cohort and fault. */
export const PLACE_FIELDS = [
  "make",
  "model",
  "cohortLabel",
  "faultKey",
  "dtc",
] as const satisfies readonly (keyof StoredCell)[];
export type CellPlace = Pick<StoredCell, (typeof PLACE_FIELDS)[number]>;

/**
 * The names a ranked cell has in JSON (the command line's `rank`/`signals --json`, /api/cells,
 * /api/signals and the CSV export), each naming the stored field it carries. Other tools read
 * these names: add names, never rename one.
 */
export const RANKED_FIELDS = {
  make: "make",
  model: "model",
  generation: "cohortLabel",
  bandFrom: "bandFromMi",
  bandTo: "bandToMi",
  dtc: "dtc",
  kind: "kind",
  events: "events",
  exposureMiles: "exposureMi",
  vehicles: "vehiclesAtRisk",
  vehiclesAffected: "vehiclesAffected",
  rate: "ratePer10k",
  rateLower: "rateLower",
  rateUpper: "rateUpper",
  ratio: "rateRatio",
  ratioLower: "ratioLower",
  ratioUpper: "ratioUpper",
  pValue: "pValue",
  qValue: "qValue",
  shrunkRate: "shrunkRatePer10k",
  signal: "isSignal",
  // Added with the metric registry (lib/metrics.ts):
  shareAffected: "shareAffected",
  shareLower: "shareLower",
  shareUpper: "shareUpper",
  shrunkRateLower: "shrunkLower",
  shrunkRateUpper: "shrunkUpper",
  hasTooLittleData: "hasTooLittleData",
} as const satisfies Record<string, keyof (StoredCell & SteadyInterval)>;

type RankedSource = StoredCell & SteadyInterval;
type RankedFields = typeof RANKED_FIELDS;
/** The stored fields a ranked cell is made from. */
export type RankedSourceField = RankedFields[keyof RankedFields];

/** A ranked cell: the stored fields under their JSON names, with its generation's years and its fault's names. */
export type RankedCell = { -readonly [K in keyof RankedFields]: RankedSource[RankedFields[K]] } & {
  yearFrom: number;
  yearTo: number;
  /** The component's slug (a DTC cell has none). */
  component: string | null;
  /** The fault as people name it ("P0730 — …", "Brakes → Front pads"). */
  faultName: string;
};

/** The one mapping from a read cell to its JSON names. */
export function toRankedCell(
  cell: Pick<RankedSource, RankedSourceField>,
  extra: Pick<RankedCell, "yearFrom" | "yearTo" | "component" | "faultName">,
): RankedCell {
  const out: Record<string, unknown> = {};
  for (const [name, field] of Object.entries(RANKED_FIELDS)) out[name] = cell[field];
  return { ...(out as Omit<RankedCell, keyof typeof extra>), ...extra };
}

/** The same mapping backwards: a ranked cell's figures and band under their stored names. */
export function cellOfRanked(r: RankedCell): Pick<RankedSource, RankedSourceField> {
  const out: Record<string, unknown> = {};
  for (const [name, field] of Object.entries(RANKED_FIELDS))
    out[field] = r[name as keyof RankedFields];
  return out as Pick<RankedSource, RankedSourceField>;
}
