import "server-only";
import { getTableColumns, sql, type SQL } from "drizzle-orm";
import { cellStats, type StoredCell } from "@/db/schema";
import {
  BAND_FIELDS,
  FIGURE_FIELDS,
  PLACE_FIELDS,
  POSTERIOR_FIELDS,
  type CellFigures,
  type HeatCell,
  type SteadyInterval,
} from "@/lib/cell-types";
import { faultName } from "@/lib/plain-words";
import { gammaSumInterval } from "@/lib/stats";

/**
 * Reading computed cells by name: the columns come from the schema (`cell_stats`, whose columns
 * `cell_view_stats` shares), and one function maps a row back to the stored cell's fields.
 */
const COLUMNS = getTableColumns(cellStats);
type CellField = keyof StoredCell;
type DriverColumn = { name: string; mapFromDriverValue(value: unknown): unknown };

/** `c.make, c.model, …`: the columns of these fields as the schema names them, on `alias`. */
export function cellColumnsSql(fields: readonly CellField[], alias = "c"): SQL {
  return sql.raw(
    [...new Set(fields)].map((f) => `${alias}.${(COLUMNS[f] as DriverColumn).name}`).join(", "),
  );
}

/** The one row mapping: these fields of a stored cell from a row selected by cellColumnsSql. */
export function readCell<K extends CellField>(
  row: Record<string, unknown>,
  fields: readonly K[],
): Pick<StoredCell, K> {
  const out: Partial<Record<CellField, unknown>> = {};
  for (const f of fields) {
    const column = COLUMNS[f] as DriverColumn;
    const v = row[column.name];
    out[f] = v === null || v === undefined ? null : column.mapFromDriverValue(v);
  }
  return out as Pick<StoredCell, K>;
}

/** The columns readFigures needs (figures and the rate's gamma posterior). */
export const FIGURE_COLUMNS_SQL = cellColumnsSql([...FIGURE_FIELDS, ...POSTERIOR_FIELDS]);

/**
 * The steady rate's interval per 10,000 mi: the equal-tailed interval of the stored posterior
 * Gamma(shape, exposure) (gammaPoissonShrinkage), through gammaSumInterval with one term, which
 * is exact for one term. None when shrinkage did not run.
 */
export function steadyInterval(
  cell: Pick<StoredCell, (typeof POSTERIOR_FIELDS)[number]>,
  confidence: number,
): SteadyInterval {
  const shape = cell.posteriorShape;
  const exposure = cell.posteriorExposureMi;
  if (shape === null || exposure === null || !(shape > 0) || !(exposure > 0))
    return { shrunkLower: null, shrunkUpper: null };
  const i = gammaSumInterval([{ shape, rate: exposure, weight: 10_000 }], confidence);
  return { shrunkLower: i.lower, shrunkUpper: i.upper };
}

/**
 * A cell's figures from a row selected with FIGURE_COLUMNS_SQL, at the confidence its run was
 * computed with (the row's `confidence_level`, see cellSource).
 */
export function readFigures(row: Record<string, unknown>): CellFigures {
  const confidence = Number(row.confidence_level);
  return {
    ...readCell(row, FIGURE_FIELDS),
    ...steadyInterval(readCell(row, POSTERIOR_FIELDS), confidence),
  };
}

const text = (v: unknown) => (v === null || v === undefined ? null : String(v));

/** The one row mapping of a heatmap, drill-down or evidence cell: its band and its figures. */
export function toHeatCell(r: Record<string, unknown>): HeatCell {
  return { ...readCell(r, BAND_FIELDS), ...readFigures(r) };
}

/** A heat cell's columns by name, with where it sits and its run's confidence (an expression). */
export const HEAT_COLUMNS = (confidence: SQL) =>
  sql`${cellColumnsSql([...PLACE_FIELDS, ...BAND_FIELDS])}, ${FIGURE_COLUMNS_SQL}, ${confidence}`;

/**
 * The fault of a row selected with HEAT_COLUMNS, by its name; the row also carries
 * `dtc_description`, `component_system` and `component_name` (joined by the caller).
 */
export function faultNameOf(r: Record<string, unknown>): string {
  const place = readCell(r, PLACE_FIELDS);
  return faultName({
    dtc: place.dtc,
    dtcDescription: text(r.dtc_description),
    componentSystem: text(r.component_system),
    componentName: text(r.component_name),
    faultKey: place.faultKey,
  });
}
