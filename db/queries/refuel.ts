import "server-only";
import { sql } from "drizzle-orm";
import type { Db } from "@/db";
import {
  measureSinceFillUp,
  medianRefuelInterval,
  sinceFillUpHistogram,
  type HistogramBin,
} from "@/lib/refuel";
import { refuelWindowTest, type RefuelWindowResult } from "@/lib/stats";
import { assertCan, type OrgScope } from "./scope";

/** The symptoms the post-refuel test looks at (statistics.md §7). */
export const REFUEL_SYMPTOMS = ["stall", "no-start"] as const;
export type RefuelSymptom = (typeof REFUEL_SYMPTOMS)[number];

export type RefuelRow = RefuelWindowResult & { events: number };
export type RefuelCohort = RefuelRow & {
  /** "make|model|generation", the value of the page's cohort choice. */
  key: string;
  make: string;
  model: string;
  generation: string;
  /** Vehicles of the cohort with at least one counted event. */
  vehicles: number;
  /** The matching known issue: not retired, this cohort, a stall or no-start symptom. */
  knownIssue: { id: number; title: string; state: string } | null;
};
export type RefuelVehicle = RefuelRow & {
  vehicleId: number;
  unitNumber: string | null;
  vin: string | null;
  make: string;
  model: string;
  generation: string;
  /** Median miles between the vehicle's fill-ups; null with fewer than two fill-ups. */
  medianIntervalMi: number | null;
  /** Miles since the last fill-up of each counted event, ascending (null = no fuel data). */
  sinceMi: (number | null)[];
};
export type RefuelEvent = {
  repairOrderId: number;
  roNumber: string;
  vehicleId: number;
  openedOn: string;
  odometerMi: number;
  symptom: RefuelSymptom;
  sinceMi: number | null;
  intervalMi: number | null;
};
export type NoFuelDataVehicle = {
  vehicleId: number;
  unitNumber: string | null;
  vin: string | null;
  cohort: string;
  /** Events of the vehicle with no fill-up in the previous 1,000 mi. */
  events: number;
  fillUps: number;
};

export type RefuelOptions = {
  /** Which symptoms count (default both). */
  symptoms?: readonly RefuelSymptom[];
  /** Cohort key for the histogram; default the cohort with the strongest result. */
  cohort?: string;
  /** Histogram bin width and start of the open last bin, miles (defaults 5 and 300). */
  binMi?: number;
  maxMi?: number;
};

const clean = (r: RefuelWindowResult): RefuelWindowResult => ({
  ...r,
  ratio: Number.isFinite(r.ratio) ? r.ratio : NaN,
});

/**
 * Post-refuel stall test (statistics.md §7) per cohort and per vehicle.
 *
 * What counts as an event: a repair order with a line whose symptom is stall or no-start and an
 * odometer reading (one event per repair order, however many lines). Fault-code events are not
 * counted: they carry a code, a time and an odometer but no symptom, and a code does not say
 * that the engine stopped. Events without an odometer reading are counted in
 * eventsWithoutOdometer; events with no fill-up in the previous 1,000 mi in noFuelData, and
 * their vehicles are listed. Every query pins the organisation.
 */
export async function getRefuelAnalysis(
  db: Db,
  scope: OrgScope,
  windowMiles: number,
  opts: RefuelOptions = {},
) {
  assertCan(scope, "refuel:read");
  const symptoms = opts.symptoms && opts.symptoms.length > 0 ? opts.symptoms : REFUEL_SYMPTOMS;
  const symptomList = sql.join(
    symptoms.map((s) => sql`${s}`),
    sql`, `,
  );
  const vehicles = await db.all<{
    id: number;
    unit_number: string | null;
    vin: string | null;
    make: string;
    model: string;
    label: string;
  }>(sql`
    select v.id, v.unit_number, v.vin, v.make, v.model,
           coalesce(g.label, cast(v.model_year as text)) as label
      from vehicles v left join generations g on g.id = v.generation_id
     where v.organisation_id = ${scope.organisationId}`);
  const eventRows = await db.all<{
    repair_order_id: number;
    ro_number: string;
    vehicle_id: number;
    opened_on: string;
    odometer_mi: number | null;
    symptom: RefuelSymptom;
  }>(sql`
    select rl.repair_order_id, ro.ro_number, rl.vehicle_id, min(rl.opened_on) as opened_on,
           coalesce(min(rl.odometer_mi), ro.odometer_mi) as odometer_mi, min(rl.symptom) as symptom
      from repair_lines rl
      join repair_orders ro on ro.id = rl.repair_order_id and ro.organisation_id = ${scope.organisationId}
     where rl.organisation_id = ${scope.organisationId} and rl.symptom in (${symptomList})
     group by rl.repair_order_id
     order by rl.vehicle_id, opened_on`);
  const fills = await db.all<{ vehicle_id: number; odometer_mi: number }>(sql`
    select vehicle_id, odometer_mi from fuel_transactions
     where organisation_id = ${scope.organisationId} and odometer_mi is not null`);
  const knownIssueRows = await db.all<{
    id: number;
    title: string;
    state: string;
    symptoms: string | null;
    make: string;
    model: string;
    label: string | null;
  }>(sql`
    select ki.id, ki.title, ki.state, ki.symptoms, c.make, c.model, g.label
      from known_issues ki
      join known_issue_cohorts c on c.known_issue_id = ki.id and c.organisation_id = ${scope.organisationId}
      left join generations g on g.id = c.generation_id
     where ki.organisation_id = ${scope.organisationId} and ki.state <> 'retired'
     order by case ki.state when 'confirmed' then 0 when 'watching' then 1 else 2 end, ki.id`);

  const info = new Map(vehicles.map((v) => [Number(v.id), v]));
  const cohortOf = (id: number) => {
    const v = info.get(id);
    return v ? `${v.make}|${v.model}|${v.label}` : "?|?|?";
  };
  const measured = eventRows.filter((e) => e.odometer_mi !== null);
  const eventsWithoutOdometer = eventRows.length - measured.length;
  const fillUps = fills.map((f) => ({
    vehicle: Number(f.vehicle_id),
    odometer: Number(f.odometer_mi),
  }));
  const measures = measureSinceFillUp(
    measured.map((e) => ({ vehicle: Number(e.vehicle_id), odometer: Number(e.odometer_mi) })),
    fillUps,
  );
  const events: RefuelEvent[] = measured.map((e, i) => ({
    repairOrderId: Number(e.repair_order_id),
    roNumber: e.ro_number,
    vehicleId: Number(e.vehicle_id),
    openedOn: e.opened_on,
    odometerMi: Number(e.odometer_mi),
    symptom: e.symptom,
    sinceMi: measures[i]!.sinceMi,
    intervalMi: measures[i]!.intervalMi,
  }));

  const group = <T>(rows: readonly T[], key: (row: T) => string | number) => {
    const out = new Map<string | number, T[]>();
    for (const r of rows) {
      const k = key(r);
      const list = out.get(k);
      if (list) list.push(r);
      else out.set(k, [r]);
    }
    return out;
  };
  const test = (e: readonly RefuelEvent[], f: typeof fillUps): RefuelRow => ({
    ...clean(
      refuelWindowTest(
        e.map((x) => ({ vehicle: x.vehicleId, odometer: x.odometerMi })),
        f,
        windowMiles,
      ),
    ),
    events: e.length,
  });
  const byEvidence = (a: RefuelRow, b: RefuelRow) =>
    a.pValue - b.pValue || b.observed - a.observed || b.events - a.events;

  const fleet = test(events, fillUps);
  const fillsByCohort = group(fillUps, (f) => cohortOf(f.vehicle));
  const fillsByVehicle = group(fillUps, (f) => f.vehicle);

  const matchIssue = (make: string, model: string, generation: string) => {
    const hit = knownIssueRows.find(
      (k) =>
        k.make === make &&
        k.model === model &&
        (k.label === null || k.label === generation) &&
        (k.symptoms ?? "").split(/\s+/).some((s) => (symptoms as readonly string[]).includes(s)),
    );
    return hit ? { id: Number(hit.id), title: hit.title, state: hit.state } : null;
  };

  const cohorts: RefuelCohort[] = [...group(events, (e) => cohortOf(e.vehicleId))]
    .map(([key, e]) => {
      const [make = "", model = "", generation = ""] = String(key).split("|");
      return {
        key: String(key),
        make,
        model,
        generation,
        vehicles: new Set(e.map((x) => x.vehicleId)).size,
        knownIssue: matchIssue(make, model, generation),
        ...test(e, fillsByCohort.get(key) ?? []),
      };
    })
    .sort(byEvidence);

  const perVehicle: RefuelVehicle[] = [...group(events, (e) => e.vehicleId)]
    .map(([id, e]) => {
      const v = info.get(Number(id));
      const own = fillsByVehicle.get(id) ?? [];
      return {
        vehicleId: Number(id),
        unitNumber: v?.unit_number ?? null,
        vin: v?.vin ?? null,
        make: v?.make ?? "",
        model: v?.model ?? "",
        generation: v?.label ?? "",
        medianIntervalMi: medianRefuelInterval(own.map((f) => f.odometer)),
        sinceMi: e.map((x) => x.sinceMi).sort((a, b) => (a ?? Infinity) - (b ?? Infinity)),
        ...test(e, own),
      };
    })
    .sort(byEvidence);

  // Vehicles whose events could not be measured against a fill-up: listed, never dropped.
  const fillCount = new Map([...fillsByVehicle].map(([id, f]) => [id, f.length]));
  const noFuelData: NoFuelDataVehicle[] = [
    ...group(
      events.filter((e) => e.sinceMi === null),
      (e) => e.vehicleId,
    ),
  ]
    .map(([id, e]) => {
      const v = info.get(Number(id));
      return {
        vehicleId: Number(id),
        unitNumber: v?.unit_number ?? null,
        vin: v?.vin ?? null,
        cohort: v ? `${v.make} ${v.model} ${v.label}` : "",
        events: e.length,
        fillUps: fillCount.get(id) ?? 0,
      };
    })
    .sort((a, b) => b.events - a.events || a.vehicleId - b.vehicleId);

  const chosen = cohorts.find((c) => c.key === opts.cohort) ?? cohorts[0] ?? null;
  const histogramEvents =
    opts.cohort === "all"
      ? events
      : chosen
        ? events.filter((e) => cohortOf(e.vehicleId) === chosen.key)
        : [];
  const histogram: { cohort: string; bins: HistogramBin[]; measured: number } = {
    cohort: opts.cohort === "all" ? "all" : (chosen?.key ?? "all"),
    bins: sinceFillUpHistogram(histogramEvents, opts.binMi ?? 5, opts.maxMi ?? 300),
    measured: histogramEvents.filter((e) => e.sinceMi !== null && e.intervalMi !== null).length,
  };

  return {
    windowMiles,
    symptoms: [...symptoms],
    fleet,
    cohorts,
    vehicles: perVehicle,
    events,
    eventsWithoutOdometer,
    noFuelData,
    histogram,
  };
}

export type RefuelAnalysis = Awaited<ReturnType<typeof getRefuelAnalysis>>;
