import "server-only";
import { sql, type SQL } from "drizzle-orm";
import type { Db } from "@/db";
import { RANKED_FIELDS, toRankedCell, type RankedCell } from "@/lib/cell-types";
import type { AnalysedKind } from "@/lib/component-kinds";
import { faultName } from "@/lib/plain-words";
import { cellColumnsSql, readCell, steadyInterval } from "./cell-rows";
import { assertCan, type OrgScope } from "./scope";

export type { RankedCell };

export type CellFilter = {
  /** A DTC ("P0441") or a component slug ("fuel-vapour/purge-valve"). */
  fault?: string;
  /** Failure cells (the default) or wear cells. */
  kind?: AnalysedKind;
  make?: string;
  model?: string;
  generation?: string;
  bandFromMi?: number;
  bandToMi?: number;
  isSignalOnly?: boolean;
  sort?: CellSort;
  /** Adds `firstSeen` (when the cell first became a signal) for the screens. */
  withFirstSeen?: boolean;
  direction?: "asc" | "desc";
  limit: number;
  offset?: number;
  /** A filtered view's cells (ensureCellView) instead of the latest run's. */
  viewId?: number | null;
};

/** The fault keys of the "all faults" totals (failure and wear), which are not faults to rank. */
export const ALL_FAULT_KEYS_SQL = sql.raw(`('all', 'all:wear')`);

/**
 * The table of the latest run's cells, or of a filtered view's, as `c`, its condition, and the
 * confidence its run was computed at (as `confidence_level` in a select list).
 */
export function cellSource(organisationId: number, viewId?: number | null) {
  return viewId
    ? {
        table: sql.raw("cell_view_stats"),
        where: sql`c.organisation_id = ${organisationId} and c.view_id = ${viewId}`,
        confidence: sql`(select r.confidence_level from analysis_runs r join cell_views w on w.run_id = r.id where w.id = c.view_id) as confidence_level`,
      }
    : {
        table: sql.raw("cell_stats"),
        where: sql`c.organisation_id = ${organisationId}`,
        confidence: sql`(select r.confidence_level from analysis_runs r where r.id = c.run_id) as confidence_level`,
      };
}

export const CELL_SORTS = [
  "ratioLower",
  "rate",
  "events",
  "shrunkRate",
  "qValue",
  "exposure",
] as const;
export type CellSort = (typeof CELL_SORTS)[number];

const SORT_SQL: Record<CellSort, string> = {
  ratioLower: "c.ratio_lower",
  rate: "c.rate_per_10k",
  events: "c.events",
  shrunkRate: "c.shrunk_rate_per_10k",
  qValue: "c.q_value",
  exposure: "c.exposure_mi",
};

const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));

/** The stored fields a ranked cell carries (its JSON names: lib/cell-types.ts RANKED_FIELDS). */
const RANKED_STORED = [
  ...new Set(
    Object.values(RANKED_FIELDS).filter((f) => f !== "shrunkLower" && f !== "shrunkUpper"),
  ),
] as Exclude<(typeof RANKED_FIELDS)[keyof typeof RANKED_FIELDS], "shrunkLower" | "shrunkUpper">[];

/**
 * Cells of the organisation's latest analysis run ranked by the lower bound of the rate ratio
 * (the stable score statistics.md asks for), then by the shrunk rate. Rates are per 10,000 mi;
 * bands and exposure in miles. Failure cells unless wear is asked for; the "all faults" totals
 * are left out.
 */
export async function listRankedCells(db: Db, scope: OrgScope, filter: CellFilter) {
  assertCan(scope, "patterns:read");
  const source = cellSource(scope.organisationId, filter.viewId);
  const conditions: SQL[] = [
    source.where,
    sql`c.kind = ${filter.kind ?? "failure"}`,
    sql`c.fault_key not in ${ALL_FAULT_KEYS_SQL}`,
  ];
  if (filter.fault) {
    // A DTC, a component slug, or a system (the part of component slugs before the "/").
    const f = filter.fault.trim();
    conditions.push(
      sql`(c.dtc = ${f.toUpperCase()} or k.slug = ${f.toLowerCase()} or k.slug like ${`${f.toLowerCase().replace(/[%_]/g, "")}/%`})`,
    );
  }
  if (filter.make) conditions.push(sql`c.make = ${filter.make}`);
  if (filter.model) conditions.push(sql`c.model = ${filter.model}`);
  if (filter.generation) conditions.push(sql`c.cohort_label = ${filter.generation}`);
  if (filter.bandFromMi !== undefined) conditions.push(sql`c.band_to_mi > ${filter.bandFromMi}`);
  if (filter.bandToMi !== undefined) conditions.push(sql`c.band_from_mi < ${filter.bandToMi}`);
  if (filter.isSignalOnly) conditions.push(sql`c.is_signal = 1`);
  const filterSql = sql.join(conditions, sql` and `);
  // Default: the stable score (ratio lower bound), unknowns last; ties by shrunk rate, events.
  const column = SORT_SQL[filter.sort ?? "ratioLower"];
  const direction = filter.direction ?? (filter.sort === "qValue" ? "asc" : "desc");
  const orderBy = `${column} is null, ${column} ${direction === "asc" ? "asc" : "desc"}, c.shrunk_rate_per_10k desc, c.events desc, c.id`;
  const rows = await db.all<Record<string, unknown>>(sql`
    select ${cellColumnsSql([...RANKED_STORED, "faultKey", "posteriorShape", "posteriorExposureMi"])},
           ${source.confidence}, g.year_from, g.year_to, k.slug as component_slug,
           k.system as component_system, k.name as component_name, d.description as dtc_description,
           s.created_at as first_seen
      from ${source.table} c
      left join generations g on g.id = c.generation_id
      left join components k on k.id = c.component_id
      left join dtc_codes d on d.code = c.dtc
      left join signals s on s.organisation_id = c.organisation_id and s.make = c.make and s.model = c.model
        and s.cohort_label = c.cohort_label and s.band_index = c.band_index and s.fault_key = c.fault_key
     where ${filterSql}
     order by ${sql.raw(orderBy)}
     limit ${filter.limit} offset ${filter.offset ?? 0}`);
  const [count] = await db.all<{ n: number }>(sql`
    select count(*) as n from ${source.table} c left join components k on k.id = c.component_id where ${filterSql}`);
  const text = (v: unknown) => (v === null || v === undefined ? null : String(v));
  const cells: (RankedCell & { firstSeen?: string | null })[] = rows.map((r) => {
    const cell = readCell(r, [...RANKED_STORED, "faultKey"]);
    const year = /^\d{4}$/.test(cell.cohortLabel) ? Number(cell.cohortLabel) : null;
    const ranked = toRankedCell(
      {
        ...cell,
        ...steadyInterval(
          readCell(r, ["posteriorShape", "posteriorExposureMi"]),
          Number(r.confidence_level),
        ),
      },
      {
        yearFrom: num(r.year_from) ?? year ?? 0,
        yearTo: num(r.year_to) ?? year ?? 0,
        component: text(r.component_slug),
        faultName: faultName({
          dtc: cell.dtc,
          dtcDescription: text(r.dtc_description),
          componentSystem: text(r.component_system),
          componentName: text(r.component_name),
          faultKey: cell.faultKey,
        }),
      },
    );
    return filter.withFirstSeen ? { ...ranked, firstSeen: text(r.first_seen) } : ranked;
  });
  return { cells, total: Number(count?.n ?? 0) };
}

/** When the organisation's statistics were last computed, and what the run found. */
export async function getLatestRun(db: Db, scope: OrgScope) {
  assertCan(scope, "patterns:read");
  const [run] = await db.all<Record<string, unknown>>(sql`
    select id, created_at as started_at, finished_at, cells, signals, readings_ignored, band_width_mi, confidence_level
      from analysis_runs where organisation_id = ${scope.organisationId} and status = 'done'
     order by id desc limit 1`);
  return run
    ? {
        id: Number(run.id),
        finishedAt: String(run.finished_at),
        cells: Number(run.cells),
        signals: Number(run.signals),
        readingsIgnored: Number(run.readings_ignored),
        bandWidthMi: Number(run.band_width_mi),
        confidenceLevel: Number(run.confidence_level),
      }
    : null;
}
