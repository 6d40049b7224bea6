/**
 * The CSV of ranked cells (the explorer's export, the signals' export): the columns other tools
 * already read, in their order and under their names (rates per 10,000 mi, exposure in miles,
 * as stored), then the figures as the screens show them, from the metric registry: in the
 * organisation's unit and at the confidence of the cells' run, each in plain words.
 */
import { cellOfRanked, type RankedCell } from "./cell-types";
import type { CsvValue } from "./import/csv-export";
import { metricFor, RATIO, SHARE, SHRUNK, type MetricContext } from "./metrics";
import { formatConfidence } from "./plain-words";

/** The columns of the first export, unchanged. */
export const CELL_CSV_COLUMNS = [
  "make",
  "model",
  "generation",
  "yearFrom",
  "yearTo",
  "bandFrom",
  "bandTo",
  "dtc",
  "component",
  "events",
  "exposureMiles",
  "vehicles",
  "vehiclesAffected",
  "rate",
  "rateLower",
  "rateUpper",
  "ratio",
  "ratioLower",
  "ratioUpper",
  "pValue",
  "qValue",
  "shrunkRate",
  "signal",
] as const satisfies readonly (keyof RankedCell)[];

/** Columns added after them. */
export const CELL_CSV_ADDED = [
  "kind",
  "faultName",
  "shareAffected",
  "shareLower",
  "shareUpper",
  "shrunkRateLower",
  "shrunkRateUpper",
  "distanceUnit",
  "confidence",
  "rateInWords",
  "ratioInWords",
  "shareInWords",
  "steadyRateInWords",
] as const;

export const CELL_CSV_HEADER = [...CELL_CSV_COLUMNS, ...CELL_CSV_ADDED];

/** One ranked cell as a CSV row (values; lib/import toCsv makes them safe for spreadsheets). */
export function cellCsvRow(c: RankedCell, ctx: MetricContext): CsvValue[] {
  const figures = cellOfRanked(c);
  const words = (m: { describe: typeof RATIO.describe }) =>
    c.hasTooLittleData ? "too little data" : m.describe(figures, ctx);
  return [
    ...CELL_CSV_COLUMNS.map((k) => c[k]),
    c.kind,
    c.faultName,
    c.shareAffected,
    c.shareLower,
    c.shareUpper,
    c.shrunkRateLower,
    c.shrunkRateUpper,
    ctx.unit,
    formatConfidence(ctx.confidence),
    words(metricFor("rate", c.kind)),
    words(RATIO),
    words(SHARE),
    words(SHRUNK),
  ];
}
