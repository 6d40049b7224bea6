import "server-only";
import { sql } from "drizzle-orm";
import type { Db } from "@/db";
import { refuelWindowTest, type RefuelWindowResult } from "@/lib/stats";
import { assertCan, type OrgScope } from "./scope";

export type RefuelRow = RefuelWindowResult & { events: number };
export type RefuelCohort = RefuelRow & { make: string; model: string; generation: string };
export type RefuelVehicle = RefuelRow & {
  vehicleId: number;
  unitNumber: string | null;
  vin: string | null;
  make: string;
  model: string;
  generation: string;
};

const clean = (r: RefuelWindowResult): RefuelWindowResult => ({
  ...r,
  ratio: Number.isFinite(r.ratio) ? r.ratio : NaN,
});

/**
 * Post-refuel stall test (statistics.md §7) per cohort and per vehicle: stall and no-start
 * repairs (by symptom) against each vehicle's fill-ups. Vehicles with no usable fuel data are
 * counted in noFuelData, never dropped silently.
 */
export async function getRefuelAnalysis(db: Db, scope: OrgScope, windowMiles: number) {
  assertCan(scope, "refuel:read");
  const vehicles = await db.all<Record<string, unknown>>(sql`
    select v.id, v.unit_number, v.vin, v.make, v.model, coalesce(g.label, cast(v.model_year as text)) as label
      from vehicles v left join generations g on g.id = v.generation_id
     where v.organisation_id = ${scope.organisationId}`);
  const events = await db.all<{ vehicle_id: number; odometer_mi: number }>(sql`
    select vehicle_id, odometer_mi from repair_lines
     where organisation_id = ${scope.organisationId} and symptom in ('stall', 'no-start') and odometer_mi is not null`);
  const fills = await db.all<{ vehicle_id: number; odometer_mi: number }>(sql`
    select vehicle_id, odometer_mi from fuel_transactions
     where organisation_id = ${scope.organisationId} and odometer_mi is not null`);

  const info = new Map(vehicles.map((v) => [Number(v.id), v]));
  const cohortOf = (id: number) => {
    const v = info.get(id);
    return v ? `${String(v.make)}|${String(v.model)}|${String(v.label)}` : "?";
  };
  const group = <T extends { vehicle_id: number }>(
    rows: T[],
    key: (id: number) => string | number,
  ) => {
    const out = new Map<string | number, T[]>();
    for (const r of rows) {
      const k = key(Number(r.vehicle_id));
      const list = out.get(k);
      if (list) list.push(r);
      else out.set(k, [r]);
    }
    return out;
  };
  const test = (e: typeof events, f: typeof fills): RefuelRow => ({
    ...clean(
      refuelWindowTest(
        e.map((x) => ({ vehicle: Number(x.vehicle_id), odometer: Number(x.odometer_mi) })),
        f.map((x) => ({ vehicle: Number(x.vehicle_id), odometer: Number(x.odometer_mi) })),
        windowMiles,
      ),
    ),
    events: e.length,
  });

  const fleet = test(events, fills);
  const fillsByCohort = group(fills, cohortOf);
  const cohorts: RefuelCohort[] = [...group(events, cohortOf)].map(([key, e]) => {
    const [make = "", model = "", generation = ""] = String(key).split("|");
    return { make, model, generation, ...test(e, fillsByCohort.get(key) ?? []) };
  });
  const fillsByVehicle = group(fills, (id) => id);
  const perVehicle: RefuelVehicle[] = [...group(events, (id) => id)].map(([id, e]) => {
    const v = info.get(Number(id));
    return {
      vehicleId: Number(id),
      unitNumber: v?.unit_number ? String(v.unit_number) : null,
      vin: v?.vin ? String(v.vin) : null,
      make: String(v?.make ?? ""),
      model: String(v?.model ?? ""),
      generation: String(v?.label ?? ""),
      ...test(e, fillsByVehicle.get(id) ?? []),
    };
  });
  const byEvidence = (a: RefuelRow, b: RefuelRow) => a.pValue - b.pValue || b.observed - a.observed;
  return {
    windowMiles,
    fleet,
    cohorts: cohorts.sort(byEvidence),
    vehicles: perVehicle.sort(byEvidence),
  };
}
