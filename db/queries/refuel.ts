import "server-only";
import { sql } from "drizzle-orm";
import type { Db } from "@/db";
import {
  measureSinceFillUp,
  medianRefuelInterval,
  sinceFillUpHistogram,
  type HistogramBin,
} from "@/lib/refuel";
import { poissonInterval, refuelWindowTest, type RefuelWindowResult } from "@/lib/stats";
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
  /** A repair order with a stall or no-start line, or a fault-code event (see getRefuelAnalysis). */
  source: "repair" | "fault";
  repairOrderId: number | null;
  roNumber: string | null;
  faultEventId: number | null;
  dtc: string | null;
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

/**
 * The test's result with its ratio interval at the organisation's confidence: the exact Poisson
 * (Garwood) limits of the observed count, divided by what chance predicts, as refuelWindowTest
 * gives them at 95%.
 */
const atLevel = (r: RefuelWindowResult, confidence: number): RefuelWindowResult => {
  const ratio = Number.isFinite(r.ratio) ? r.ratio : NaN;
  if (!(r.expected > 0)) return { ...r, ratio };
  const { lower, upper } = poissonInterval(r.observed, r.expected, confidence);
  return { ...r, ratio, lower, upper };
};

/**
 * Post-refuel stall test (statistics.md §7) per cohort and per vehicle.
 *
 * What counts as an event: a repair order with a line whose symptom is stall or no-start (one
 * event per repair order, however many lines); and a fault-code event whose code the
 * organisation has tied to a stall or no-start in that cohort — a code listed on a known issue
 * (not retired) with that symptom for the vehicle's cohort. A code alone does not say that the
 * engine stopped; the known issue is where the organisation says it does. One event per vehicle
 * and day: a fault event on the day of a counted repair order, or of another counted fault
 * event, is the same incident. Events without an odometer reading are counted in
 * eventsWithoutOdometer; events with no fill-up in the previous 1,000 mi in noFuelData, and
 * their vehicles are listed. Ratio intervals are at the organisation's confidence level. Every
 * query pins the organisation.
 */
export async function getRefuelAnalysis(
  db: Db,
  scope: OrgScope,
  windowMiles: number,
  opts: RefuelOptions = {},
) {
  assertCan(scope, "refuel:read");
  const [org] = await db.all<{ confidence_level: number }>(sql`
    select confidence_level from organisations where id = ${scope.organisationId}`);
  /** The level of every ratio interval (the organisation's setting). */
  const confidence = Number(org?.confidence_level ?? 0.95);
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
      from visible_repair_lines rl
      join visible_repair_orders ro on ro.id = rl.repair_order_id and ro.organisation_id = ${scope.organisationId}
     where rl.organisation_id = ${scope.organisationId} and rl.kind = 'failure' and rl.symptom in (${symptomList})
     group by rl.repair_order_id
     order by rl.vehicle_id, opened_on`);
  const fills = await db.all<{ vehicle_id: number; odometer_mi: number }>(sql`
    select vehicle_id, odometer_mi from visible_fuel_transactions
     where organisation_id = ${scope.organisationId} and odometer_mi is not null`);
  const knownIssueRows = await db.all<{
    id: number;
    title: string;
    state: string;
    symptoms: string | null;
    dtc_codes: string | null;
    make: string;
    model: string;
    label: string | null;
  }>(sql`
    select ki.id, ki.title, ki.state, ki.symptoms, ki.dtc_codes, c.make, c.model, g.label
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

  // Fault codes the organisation ties to a stall or no-start, per known issue and cohort.
  const codeRules = knownIssueRows.flatMap((k) => {
    const symptom = (k.symptoms ?? "")
      .split(/\s+/)
      .find((x): x is RefuelSymptom => (symptoms as readonly string[]).includes(x));
    const codes = (k.dtc_codes ?? "")
      .toUpperCase()
      .split(/[\s,;]+/)
      .filter(Boolean);
    return symptom && codes.length ? [{ ...k, symptom, codes }] : [];
  });
  const faultSymptom = (vehicleId: number, dtc: string): RefuelSymptom | null => {
    const v = info.get(vehicleId);
    if (!v) return null;
    const rule = codeRules.find(
      (k) =>
        k.make === v.make &&
        k.model === v.model &&
        (k.label === null || k.label === v.label) &&
        k.codes.includes(dtc),
    );
    return rule?.symptom ?? null;
  };
  const allCodes = [...new Set(codeRules.flatMap((k) => k.codes))];
  const faultRows = allCodes.length
    ? await db.all<{
        id: number;
        vehicle_id: number;
        occurred_at: string;
        odometer_mi: number | null;
        dtc: string;
      }>(sql`
        select id, vehicle_id, occurred_at, odometer_mi, dtc from visible_fault_events
         where organisation_id = ${scope.organisationId}
           and dtc in (${sql.join(
             allCodes.map((c) => sql`${c}`),
             sql`, `,
           )})
         order by vehicle_id, occurred_at, id`)
    : [];
  type Candidate = Omit<RefuelEvent, "sinceMi" | "intervalMi" | "odometerMi"> & {
    odometerMi: number | null;
  };
  const candidates: Candidate[] = eventRows.map((e) => ({
    source: "repair",
    repairOrderId: Number(e.repair_order_id),
    roNumber: e.ro_number,
    faultEventId: null,
    dtc: null,
    vehicleId: Number(e.vehicle_id),
    openedOn: e.opened_on,
    odometerMi: e.odometer_mi === null ? null : Number(e.odometer_mi),
    symptom: e.symptom,
  }));
  // One incident per vehicle and day: repair orders first, then the day's first fault event.
  const days = new Set(candidates.map((e) => `${e.vehicleId}|${e.openedOn.slice(0, 10)}`));
  let faultEvents = 0;
  for (const f of faultRows) {
    const vehicleId = Number(f.vehicle_id);
    const symptom = faultSymptom(vehicleId, f.dtc);
    const day = `${vehicleId}|${f.occurred_at.slice(0, 10)}`;
    if (!symptom || days.has(day)) continue;
    days.add(day);
    faultEvents++;
    candidates.push({
      source: "fault",
      repairOrderId: null,
      roNumber: null,
      faultEventId: Number(f.id),
      dtc: f.dtc,
      vehicleId,
      openedOn: f.occurred_at.slice(0, 10),
      odometerMi: f.odometer_mi === null ? null : Number(f.odometer_mi),
      symptom,
    });
  }
  candidates.sort((a, b) => a.vehicleId - b.vehicleId || a.openedOn.localeCompare(b.openedOn));
  const measured = candidates.filter(
    (e): e is Candidate & { odometerMi: number } => e.odometerMi !== null,
  );
  const eventsWithoutOdometer = candidates.length - measured.length;
  const fillUps = fills.map((f) => ({
    vehicle: Number(f.vehicle_id),
    odometer: Number(f.odometer_mi),
  }));
  const measures = measureSinceFillUp(
    measured.map((e) => ({ vehicle: e.vehicleId, odometer: e.odometerMi })),
    fillUps,
  );
  const events: RefuelEvent[] = measured.map((e, i) => ({
    ...e,
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
    ...atLevel(
      refuelWindowTest(
        e.map((x) => ({ vehicle: x.vehicleId, odometer: x.odometerMi })),
        f,
        windowMiles,
      ),
      confidence,
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
    confidence,
    symptoms: [...symptoms],
    fleet,
    cohorts,
    vehicles: perVehicle,
    events,
    eventsWithoutOdometer,
    /** Events from fault codes (the rest are repair orders). */
    faultEvents,
    noFuelData,
    histogram,
  };
}

export type RefuelAnalysis = Awaited<ReturnType<typeof getRefuelAnalysis>>;
