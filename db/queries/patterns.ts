import "server-only";
import { sql } from "drizzle-orm";
import type { Db } from "@/db";
import { meanCumulativeFunction } from "@/lib/stats";
import { ensureCellView, hasViewFilter } from "./cell-views";
import { ALL_FAULT_KEYS_SQL, cellSource } from "./cells";
import { allFaultsKey, type AnalysedKind } from "@/lib/component-kinds";
import { cautionsForComponent, cautionsForWork, isHighVoltageVehicle } from "@/lib/known-issues";
import { PLACE_FIELDS, type HeatCell } from "@/lib/cell-types";
import { faultName } from "@/lib/plain-words";
import { faultNameOf, HEAT_COLUMNS, readCell, toHeatCell } from "./cell-rows";
import { assertCan, type OrgScope } from "./scope";

/** A fault filter: "P0441" (DTC), "fuel-vapour/purge-valve" (component) or "fuel-vapour" (system). */
export function faultKeyOf(fault: string): string {
  const f = fault.trim();
  if (/^[PCBU][0-3][0-9A-F]{3}$/i.test(f)) return `dtc:${f.toUpperCase()}`;
  if (f.startsWith("dtc:") || f.startsWith("component:") || f === "all" || f === "all:wear")
    return f;
  return `component:${f.toLowerCase()}`;
}

export type { HeatCell };

export type HeatRow = {
  id: string;
  /** The cohort ("Aurel Merlin M2") or the fault as people name it ("P0730 — …"). */
  label: string;
  make: string;
  model: string;
  generation: string;
  faultKey: string;
  cells: HeatCell[];
};

const n = (v: unknown) => (v === null || v === undefined ? null : Number(v));

export type HeatmapQuery = {
  /** "cohorts": rows are cohorts for one fault (or all faults); "faults": rows are faults of one cohort. */
  view: "cohorts" | "faults";
  fault?: string;
  make?: string;
  model?: string;
  generation?: string;
  bandFromMi?: number;
  bandToMi?: number;
  /** Most rows shown in the fault view (by events). */
  maxRows?: number;
  /** A filtered view's cells (ensureCellView) instead of the latest run's. */
  viewId?: number | null;
  /** Failure cells (the default) or wear cells. */
  kind?: AnalysedKind;
};

/**
 * The heatmap from the latest computed cells (never from raw rows): cohorts × mileage bands for
 * one fault (or the all-faults totals), or for one cohort, its faults × bands.
 */
export async function getHeatmap(db: Db, scope: OrgScope, q: HeatmapQuery) {
  assertCan(scope, "patterns:read");
  const source = cellSource(scope.organisationId, q.viewId);
  const kind = q.kind ?? "failure";
  const conds = [source.where, sql`c.kind = ${kind}`];
  if (q.view === "cohorts")
    conds.push(sql`c.fault_key = ${q.fault ? faultKeyOf(q.fault) : allFaultsKey(kind)}`);
  else conds.push(sql`c.fault_key not in ${ALL_FAULT_KEYS_SQL}`);
  if (q.make) conds.push(sql`c.make = ${q.make}`);
  if (q.model) conds.push(sql`c.model = ${q.model}`);
  if (q.generation) conds.push(sql`c.cohort_label = ${q.generation}`);
  if (q.bandFromMi !== undefined) conds.push(sql`c.band_to_mi > ${q.bandFromMi}`);
  if (q.bandToMi !== undefined) conds.push(sql`c.band_from_mi < ${q.bandToMi}`);
  if (q.view === "faults") {
    // The faults with the most events in this cohort.
    conds.push(sql`c.fault_key in (select c.fault_key from ${source.table} c
        where ${source.where} and c.kind = ${kind} and c.fault_key not in ${ALL_FAULT_KEYS_SQL}
          ${q.make ? sql`and c.make = ${q.make}` : sql``} ${q.model ? sql`and c.model = ${q.model}` : sql``}
          ${q.generation ? sql`and c.cohort_label = ${q.generation}` : sql``}
        group by c.fault_key order by sum(c.events) desc limit ${q.maxRows ?? 25})`);
  }
  const rows = await db.all<Record<string, unknown>>(sql`
    select ${HEAT_COLUMNS(source.confidence)}, k.name as component_name, k.system as component_system,
           d.description as dtc_description
      from ${source.table} c
      left join components k on k.id = c.component_id
      left join dtc_codes d on d.code = c.dtc
     where ${sql.join(conds, sql` and `)}
     order by c.make, c.model, c.cohort_label, c.fault_key, c.band_index`);
  const byRow = new Map<string, HeatRow>();
  const bands = new Map<number, { band: number; from: number; to: number }>();
  for (const r of rows) {
    const place = readCell(r, PLACE_FIELDS);
    const generation = place.cohortLabel;
    const id = q.view === "cohorts" ? `${place.make}|${place.model}|${generation}` : place.faultKey;
    let row = byRow.get(id);
    if (!row) {
      row = {
        id,
        label: q.view === "cohorts" ? `${place.make} ${place.model} ${generation}` : faultNameOf(r),
        make: place.make,
        model: place.model,
        generation,
        faultKey: place.faultKey,
        cells: [],
      };
      byRow.set(id, row);
    }
    const cell = toHeatCell(r);
    row.cells.push(cell);
    bands.set(cell.bandIndex, { band: cell.bandIndex, from: cell.bandFromMi, to: cell.bandToMi });
  }
  return {
    rows: [...byRow.values()],
    bands: [...bands.values()].sort((a, b) => a.band - b.band),
  };
}

/** Makes, models, generations and faults present in the latest run, for the filter lists. */
export async function getPatternOptions(db: Db, scope: OrgScope) {
  assertCan(scope, "patterns:read");
  const cohorts = await db.all<{ make: string; model: string; generation: string }>(sql`
    select distinct make, model, cohort_label as generation from cell_stats
     where organisation_id = ${scope.organisationId} order by make, model, cohort_label`);
  const faults = await db.all<{
    fault_key: string;
    kind: AnalysedKind;
    events: number;
    dtc: string | null;
    dtc_description: string | null;
    component_system: string | null;
    component_name: string | null;
  }>(sql`
    select c.fault_key, c.kind, sum(c.events) as events, c.dtc, d.description as dtc_description,
           k.system as component_system, k.name as component_name
      from cell_stats c
      left join dtc_codes d on d.code = c.dtc
      left join components k on k.id = c.component_id
     where c.organisation_id = ${scope.organisationId} and c.fault_key not in ${ALL_FAULT_KEYS_SQL}
     group by c.fault_key, c.kind order by sum(c.events) desc`);
  return {
    cohorts,
    faults: faults.map((f) => ({
      value: f.fault_key.replace(/^dtc:|^component:/, ""),
      label: faultName({
        dtc: f.dtc,
        dtcDescription: f.dtc_description,
        componentSystem: f.component_system,
        componentName: f.component_name,
        faultKey: f.fault_key,
      }),
      /** The component's system as people name it (a DTC has none). */
      system: f.component_system,
      kind: f.kind,
      events: Number(f.events),
    })),
  };
}

export type CellKey = {
  make: string;
  model: string;
  generation: string;
  band: number;
  fault: string;
  /** A period or a vendor: the drill-down's repair lines, totals and statistics (a filtered view). */
  from?: string;
  to?: string;
  vendor?: string;
};

/** The SQL that picks the repair lines behind a cell (its cohort, band and fault). */
function cellLines(scope: OrgScope, key: CellKey, bandWidthMi: number) {
  const fk = faultKeyOf(key.fault);
  // The lines a cell counts (jobs/recompute/events.ts): a DTC's failure lines, a component's
  // failure or wear lines (never its scheduled service), the failure or the wear totals.
  const fault = fk.startsWith("dtc:")
    ? sql`l.kind = 'failure' and exists (select 1 from visible_repair_line_codes rc where rc.repair_line_id = l.id and rc.dtc = ${fk.slice(4)})`
    : fk.startsWith("component:")
      ? sql`l.kind in ('failure', 'wear') and l.component_id = (select id from components where slug = ${fk.slice(10)})`
      : sql`l.kind = ${fk === "all:wear" ? "wear" : "failure"} and (l.component_id is not null or l.dtc_codes is not null)`;
  return sql`l.organisation_id = ${scope.organisationId} and v.make = ${key.make} and v.model = ${key.model}
    and coalesce(g.label, cast(v.model_year as text)) = ${key.generation}
    and l.odometer_mi >= ${key.band * bandWidthMi} and l.odometer_mi < ${(key.band + 1) * bandWidthMi}
    and ${fault}`;
}

/**
 * Everything the drill-down shows for one cell: its computed statistics, the repair lines
 * behind it, the vehicles affected, cost and downtime totals, and the mean cumulative function
 * of this fault over mileage for the whole cohort (Nelson; Lawless–Nadeau limits).
 */
export async function getCellDetail(db: Db, scope: OrgScope, key: CellKey) {
  assertCan(scope, "patterns:read");
  const fk = faultKeyOf(key.fault);
  const viewFilter = { from: key.from, to: key.to, vendor: key.vendor };
  // With a period or a vendor, the statistics are the filtered view's (as in the explorer);
  // a cell that has no exposure in that view falls back to the whole history, and says so.
  const viewId = await ensureCellView(db, scope, viewFilter);
  const readCell = async (fromView: number | null) => {
    const source = cellSource(scope.organisationId, fromView);
    const run = fromView
      ? sql`(select w.run_id from cell_views w where w.id = c.view_id)`
      : sql`c.run_id`;
    const [row] = await db.all<Record<string, unknown>>(sql`
      select ${HEAT_COLUMNS(sql`r.confidence_level`)}, r.band_width_mi, r.finished_at,
             k.name as component_name, k.system as component_system, d.description as dtc_description,
             coalesce(k.slug, dk.slug) as caution_slug
        from ${source.table} c join analysis_runs r on r.id = ${run}
        left join components k on k.id = c.component_id
        left join dtc_codes d on d.code = c.dtc
        left join components dk on dk.id = d.component_id
       where ${source.where} and c.make = ${key.make} and c.model = ${key.model}
         and c.cohort_label = ${key.generation} and c.band_index = ${key.band} and c.fault_key = ${fk}
       limit 1`);
    return row;
  };
  const viewRow = viewId ? await readCell(viewId) : undefined;
  const cellRow = viewRow ?? (await readCell(null));
  if (!cellRow) return null;
  const bandWidthMi = Number(cellRow.band_width_mi);
  const lines = await db.all<Record<string, unknown>>(sql`
    select l.id, o.id as order_id, o.ro_number, l.vehicle_id, v.unit_number, v.vin, l.opened_on, o.closed_on,
           l.odometer_mi, l.complaint, l.cause, l.correction, l.dtc_codes, l.parts_cost_cents, l.labor_cost_cents,
           l.labor_hours, l.technician, coalesce(l.vendor, o.vendor) as vendor
      from visible_repair_lines l
      join visible_repair_orders o on o.id = l.repair_order_id
      join vehicles v on v.id = l.vehicle_id
      left join generations g on g.id = v.generation_id
     where ${cellLines(scope, key, bandWidthMi)}
       -- The same period and vendor conditions as the views' (jobs/recompute/events.ts).
       ${key.from ? sql`and l.opened_on >= ${key.from}` : sql``}
       ${key.to ? sql`and l.opened_on <= ${key.to}` : sql``}
       ${key.vendor ? sql`and l.vendor = ${key.vendor} collate nocase` : sql``}
     order by l.opened_on desc, l.id desc
     limit 2000`);
  const vendorRows = await db.all<{ vendor: string }>(sql`
    select distinct l.vendor
      from visible_repair_lines l
      join vehicles v on v.id = l.vehicle_id
      left join generations g on g.id = v.generation_id
     where ${cellLines(scope, key, bandWidthMi)} and l.vendor is not null
     order by 1 limit 200`);
  // MCF over mileage for the cohort: each vehicle observed up to its last odometer reading.
  const histories = await db.all<{
    vehicle_id: number;
    end_mi: number | null;
    engine: string | null;
    powertrain: string | null;
  }>(sql`
    select v.id as vehicle_id, v.last_odometer_mi as end_mi, v.engine, g.powertrain
      from vehicles v left join generations g on g.id = v.generation_id
     where v.organisation_id = ${scope.organisationId} and v.make = ${key.make} and v.model = ${key.model}
       and coalesce(g.label, cast(v.model_year as text)) = ${key.generation}`);
  const faultAll = { ...key, band: 0 };
  const cohortEvents = await db.all<{ vehicle_id: number; odometer_mi: number }>(sql`
    select l.vehicle_id, l.odometer_mi from visible_repair_lines l
      join vehicles v on v.id = l.vehicle_id left join generations g on g.id = v.generation_id
     where ${cellLines(scope, faultAll, Number.MAX_SAFE_INTEGER / 4)} and l.odometer_mi is not null`);
  const eventsByVehicle = new Map<number, number[]>();
  for (const e of cohortEvents) {
    const list = eventsByVehicle.get(Number(e.vehicle_id)) ?? [];
    list.push(Number(e.odometer_mi));
    eventsByVehicle.set(Number(e.vehicle_id), list);
  }
  const units = histories
    .filter((h) => h.end_mi !== null && Number(h.end_mi) > 0)
    .map((h) => {
      const end = Number(h.end_mi);
      const events = (eventsByVehicle.get(Number(h.vehicle_id)) ?? []).filter((at) => at <= end);
      return { end, events };
    });
  const mcf = units.length ? meanCumulativeFunction(units, Number(cellRow.confidence_level)) : [];

  const costCents = lines.reduce(
    (s, l) => s + Number(l.parts_cost_cents ?? 0) + Number(l.labor_cost_cents ?? 0),
    0,
  );
  const orderDays = new Map<number, number>();
  for (const l of lines) {
    if (!l.closed_on) continue;
    const days = (Date.parse(String(l.closed_on)) - Date.parse(String(l.opened_on))) / 86_400_000;
    if (Number.isFinite(days) && days >= 0) orderDays.set(Number(l.order_id), days);
  }
  const vehicles = new Map<
    number,
    { vehicleId: number; unitNumber: string | null; vin: string | null; repairs: number }
  >();
  for (const l of lines) {
    const id = Number(l.vehicle_id);
    const v = vehicles.get(id) ?? {
      vehicleId: id,
      unitNumber: l.unit_number ? String(l.unit_number) : null,
      vin: l.vin ? String(l.vin) : null,
      repairs: 0,
    };
    v.repairs++;
    vehicles.set(id, v);
  }
  const faultLabel = faultNameOf(cellRow);
  // The cautions of the work this fault leads to: its component's (a DTC's usual component), and
  // high voltage when any vehicle of the cohort is hybrid or electric.
  const cautions = cautionsForWork(
    cautionsForComponent(cellRow.caution_slug === null ? null : String(cellRow.caution_slug)),
    { isHighVoltage: histories.some((h) => isHighVoltageVehicle(h)) },
  );
  return {
    cell: toHeatCell(cellRow),
    cautions,
    kind: (cellRow.kind === "wear" ? "wear" : "failure") as AnalysedKind,
    faultKey: fk,
    faultLabel,
    confidenceLevel: Number(cellRow.confidence_level),
    computedAt: String(cellRow.finished_at),
    lines: lines.map((l) => ({
      id: Number(l.id),
      roNumber: String(l.ro_number),
      vehicleId: Number(l.vehicle_id),
      unitNumber: l.unit_number ? String(l.unit_number) : null,
      vin: l.vin ? String(l.vin) : null,
      openedOn: String(l.opened_on),
      closedOn: l.closed_on ? String(l.closed_on) : null,
      odometerMi: n(l.odometer_mi),
      complaint: l.complaint ? String(l.complaint) : null,
      cause: l.cause ? String(l.cause) : null,
      correction: l.correction ? String(l.correction) : null,
      dtcCodes: l.dtc_codes ? String(l.dtc_codes) : null,
      costCents: Number(l.parts_cost_cents ?? 0) + Number(l.labor_cost_cents ?? 0),
      laborHours: n(l.labor_hours),
      technician: l.technician ? String(l.technician) : null,
      vendor: l.vendor ? String(l.vendor) : null,
    })),
    isCapped: lines.length >= 2000,
    isFiltered: hasViewFilter(viewFilter),
    /** The statistics are the period's / vendor's (false: the whole history's). */
    isViewStats: viewRow !== undefined,
    vendors: vendorRows.map((r) => String(r.vendor)),
    vehicles: [...vehicles.values()].sort((a, b) => b.repairs - a.repairs),
    totals: {
      costCents,
      downtimeDays: [...orderDays.values()].reduce((s, d) => s + d, 0),
      orders: new Set(lines.map((l) => Number(l.order_id))).size,
    },
    mcf: { units: units.length, points: mcf },
  };
}
