import "server-only";
import { sql, type SQL } from "drizzle-orm";
import type { Db } from "@/db";
import type { AnalysedKind } from "@/lib/component-kinds";
import { assertCan, type OrgScope } from "./scope";

/** One ranked cell, in the shape the command line and the route handlers share. */
export type RankedCell = {
  make: string;
  model: string;
  generation: string;
  yearFrom: number;
  yearTo: number;
  bandFrom: number;
  bandTo: number;
  dtc: string | null;
  component: string | null;
  /** failure or wear (never service): which lines the cell counts. */
  kind: AnalysedKind;
  events: number;
  exposureMiles: number;
  vehicles: number;
  vehiclesAffected: number;
  rate: number | null;
  rateLower: number | null;
  rateUpper: number | null;
  ratio: number | null;
  ratioLower: number | null;
  ratioUpper: number | null;
  pValue: number | null;
  qValue: number | null;
  shrunkRate: number | null;
  signal: boolean;
};

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

/** The table of the latest run's cells, or of a filtered view's, as `c`, and its condition. */
export function cellSource(organisationId: number, viewId?: number | null) {
  return viewId
    ? {
        table: sql.raw("cell_view_stats"),
        where: sql`c.organisation_id = ${organisationId} and c.view_id = ${viewId}`,
      }
    : { table: sql.raw("cell_stats"), where: sql`c.organisation_id = ${organisationId}` };
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
    select c.make, c.model, c.cohort_label, g.year_from, g.year_to, c.band_from_mi, c.band_to_mi, c.dtc,
           k.slug as component, c.kind, c.events, c.exposure_mi, c.vehicles_at_risk, c.vehicles_affected,
           c.rate_per_10k, c.rate_lower, c.rate_upper, c.rate_ratio, c.ratio_lower, c.ratio_upper,
           c.p_value, c.q_value, c.shrunk_rate_per_10k, c.is_signal, s.created_at as first_seen
      from ${source.table} c
      left join generations g on g.id = c.generation_id
      left join components k on k.id = c.component_id
      left join signals s on s.organisation_id = c.organisation_id and s.make = c.make and s.model = c.model
        and s.cohort_label = c.cohort_label and s.band_index = c.band_index and s.fault_key = c.fault_key
     where ${filterSql}
     order by ${sql.raw(orderBy)}
     limit ${filter.limit} offset ${filter.offset ?? 0}`);
  const [count] = await db.all<{ n: number }>(sql`
    select count(*) as n from ${source.table} c left join components k on k.id = c.component_id where ${filterSql}`);
  const cells: (RankedCell & { firstSeen?: string | null })[] = rows.map((r) => {
    const label = String(r.cohort_label);
    const year = /^\d{4}$/.test(label) ? Number(label) : null;
    return {
      make: String(r.make),
      model: String(r.model),
      generation: label,
      yearFrom: num(r.year_from) ?? year ?? 0,
      yearTo: num(r.year_to) ?? year ?? 0,
      bandFrom: Number(r.band_from_mi),
      bandTo: Number(r.band_to_mi),
      dtc: r.dtc === null ? null : String(r.dtc),
      component: r.component === null ? null : String(r.component),
      kind: r.kind === "wear" ? "wear" : "failure",
      events: Number(r.events),
      exposureMiles: Number(r.exposure_mi),
      vehicles: Number(r.vehicles_at_risk),
      vehiclesAffected: Number(r.vehicles_affected),
      rate: num(r.rate_per_10k),
      rateLower: num(r.rate_lower),
      rateUpper: num(r.rate_upper),
      ratio: num(r.rate_ratio),
      ratioLower: num(r.ratio_lower),
      ratioUpper: num(r.ratio_upper),
      pValue: num(r.p_value),
      qValue: num(r.q_value),
      shrunkRate: num(r.shrunk_rate_per_10k),
      signal: Boolean(r.is_signal),
      ...(filter.withFirstSeen
        ? { firstSeen: r.first_seen === null ? null : String(r.first_seen) }
        : {}),
    };
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
