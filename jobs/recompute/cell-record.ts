import { getTableColumns } from "drizzle-orm";
import { cellStats, type CellRecord } from "@/db/schema";
import type { SqlValue } from "../import/sql-literal";
import type { CellStat } from "./cells";

// The stored cell's type lives with its table (db/schema/analysis.ts), where the data layer
// reads it too.
export type { CellRecord };

/** The stored form of a computed cell. */
export function toCellRecord(c: CellStat): Required<CellRecord> {
  return {
    make: c.cohort.make,
    model: c.cohort.model,
    generationId: c.cohort.generationId,
    cohortLabel: c.cohort.label,
    bandIndex: c.band,
    bandFromMi: c.bandFromMi,
    bandToMi: c.bandToMi,
    faultKey: c.faultKey,
    kind: c.kind,
    dtc: c.dtc,
    componentId: c.componentId,
    events: c.events,
    exposureMi: c.exposureMi,
    vehiclesAtRisk: c.vehiclesAtRisk,
    vehiclesAffected: c.vehiclesAffected,
    ratePer10k: c.ratePer10k,
    rateLower: c.rateLower,
    rateUpper: c.rateUpper,
    shareAffected: c.shareAffected,
    shareLower: c.shareLower,
    shareUpper: c.shareUpper,
    rateRatio: c.rateRatio,
    ratioLower: c.ratioLower,
    ratioUpper: c.ratioUpper,
    pValue: c.pValue,
    qValue: c.qValue,
    shrunkRatePer10k: c.shrunkRatePer10k,
    posteriorShape: c.posteriorShape,
    posteriorExposureMi: c.posteriorExposureMi,
    isSignal: c.isSignal,
    hasTooLittleData: c.hasTooLittleData,
  };
}

const SCHEMA_COLUMNS = getTableColumns(cellStats);
/** The record's fields: every column of the schema but the id, organisation and run. */
const FIELDS = (Object.keys(SCHEMA_COLUMNS) as (keyof typeof SCHEMA_COLUMNS)[]).filter(
  (f): f is keyof CellRecord => f !== "id" && f !== "organisationId" && f !== "runId",
);

/**
 * Column names and value rows for a bulk insert of cells into `cell_stats` (owner "run_id") or
 * `cell_view_stats` (owner "view_id"): each field of the record goes to the column the schema
 * names for it.
 */
export function cellInsertRows(
  organisationId: number,
  owner: { column: "run_id" | "view_id"; id: number },
  cells: readonly CellStat[],
): { columns: string[]; rows: SqlValue[][] } {
  const columns = ["organisation_id", owner.column, ...FIELDS.map((f) => SCHEMA_COLUMNS[f].name)];
  const rows = cells.map((c) => {
    const record = toCellRecord(c);
    return [organisationId, owner.id, ...FIELDS.map((f) => record[f] as SqlValue)];
  });
  return { columns, rows };
}
