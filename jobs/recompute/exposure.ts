import type { Db } from "@/db";
import { allocateExposure, cleanOdometerReadings, clipReadingsToPeriod } from "@/lib/stats";
import { COHORT_LABEL_SQL, cohortKey, type Cohort } from "./cohorts";

export type BandExposure = { miles: number; vehicles: number };

export type ExposureResult = {
  cohorts: Map<string, Cohort>;
  /** cohort key → band index → miles and vehicles with miles in the band. */
  byCohortBand: Map<string, Map<number, BandExposure>>;
  readings: number;
  readingsIgnored: number;
  vehicles: number;
};

/** Vehicles per query page: keeps memory bounded however large the organisation. */
const PAGE = 500;
const DAY_MS = 86_400_000;

/**
 * Exposure (vehicle-miles) per cohort and mileage band, from every dated odometer reading the
 * organisation holds: repair orders, fault events, fill-ups and roster readings. Each vehicle's
 * readings are cleaned (cleanOdometerReadings: backwards, absurd jumps) and its driven miles
 * are split across the bands they cross (allocateExposure).
 */
export async function computeExposure(
  db: Db,
  organisationId: number,
  bandWidthMi: number,
  period: { from?: string; to?: string } = {},
): Promise<ExposureResult> {
  // Only the miles driven within the period count (ISO dates, both days included).
  const periodStart = period.from ? Date.parse(`${period.from}T00:00:00Z`) : null;
  const periodEnd = period.to ? Date.parse(`${period.to}T00:00:00Z`) + DAY_MS : null;
  const cohorts = new Map<string, Cohort>();
  const vehicleCohort = new Map<number, string>();
  const vehicleRows = await db.$client.execute({
    sql: `select v.id, v.make, v.model, v.model_year, ${COHORT_LABEL_SQL} as label, g.id as generation_id,
                 coalesce(g.year_from, v.model_year) as year_from, coalesce(g.year_to, v.model_year) as year_to
            from vehicles v left join generations g on g.id = v.generation_id
           where v.organisation_id = ? order by v.id`,
    args: [organisationId],
  });
  for (const r of vehicleRows.rows) {
    const key = cohortKey(String(r.make), String(r.model), String(r.label));
    vehicleCohort.set(Number(r.id), key);
    if (!cohorts.has(key)) {
      cohorts.set(key, {
        key,
        make: String(r.make),
        model: String(r.model),
        label: String(r.label),
        generationId: r.generation_id === null ? null : Number(r.generation_id),
        yearFrom: Number(r.year_from),
        yearTo: Number(r.year_to),
      });
    }
  }
  const byCohortBand = new Map<string, Map<number, BandExposure>>();
  let readings = 0;
  let readingsIgnored = 0;
  const ids = [...vehicleCohort.keys()];
  for (let i = 0; i < ids.length; i += PAGE) {
    const from = ids[i] as number;
    const to = ids[Math.min(ids.length, i + PAGE) - 1] as number;
    // One row per vehicle: its readings as "day,miles;day,miles;…" (days since 1970, the day's
    // highest reading). A few thousand strings cross into JavaScript instead of a million row
    // objects. They are put in day order here: group_concat(… order by …) needs SQLite 3.44,
    // which the libSQL server's statement parser does not accept.
    const rs = await db.$client.execute({
      sql: `select vehicle_id,
                   group_concat(cast(julianday(day) - 2440587.5 as integer) || ',' || odometer_mi, ';') as readings
              from (select vehicle_id, day, max(odometer_mi) as odometer_mi from (
                select vehicle_id, opened_on as day, odometer_mi from visible_repair_orders
                 where organisation_id = ?1 and vehicle_id between ?2 and ?3 and odometer_mi is not null
                union all
                select vehicle_id, substr(occurred_at, 1, 10), odometer_mi from visible_fault_events
                 where organisation_id = ?1 and vehicle_id between ?2 and ?3 and odometer_mi is not null
                union all
                select vehicle_id, substr(filled_at, 1, 10), odometer_mi from visible_fuel_transactions
                 where organisation_id = ?1 and vehicle_id between ?2 and ?3 and odometer_mi is not null
                union all
                select vehicle_id, read_on, odometer_mi from visible_odometer_readings
                 where organisation_id = ?1 and vehicle_id between ?2 and ?3
              ) group by vehicle_id, day) group by vehicle_id`,
      args: [organisationId, from, to],
    });
    for (const r of rs.rows) {
      const key = vehicleCohort.get(Number(r.vehicle_id));
      const batch: { at: number; odometer: number }[] = [];
      for (const pair of String(r.readings ?? "").split(";")) {
        const comma = pair.indexOf(",");
        if (comma < 0) continue;
        batch.push({
          at: Number(pair.slice(0, comma)) * DAY_MS,
          odometer: Number(pair.slice(comma + 1)),
        });
      }
      batch.sort((a, b) => a.at - b.at);
      readings += batch.length;
      const cleaned = cleanOdometerReadings(batch);
      readingsIgnored += cleaned.ignored;
      const kept =
        periodStart === null && periodEnd === null
          ? cleaned.kept
          : clipReadingsToPeriod(cleaned.kept, periodStart, periodEnd);
      if (!key || kept.length < 2) continue;
      let bands = byCohortBand.get(key);
      if (!bands) byCohortBand.set(key, (bands = new Map()));
      for (const [band, miles] of allocateExposure(kept, bandWidthMi)) {
        if (miles <= 0) continue;
        const cell = bands.get(band) ?? { miles: 0, vehicles: 0 };
        cell.miles += miles;
        cell.vehicles += 1;
        bands.set(band, cell);
      }
    }
  }
  return { cohorts, byCohortBand, readings, readingsIgnored, vehicles: ids.length };
}
