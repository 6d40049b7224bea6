import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { ForbiddenError, type OrgScope } from "@/db/queries/scope";
import { findOrganisationBySlug } from "@/db/queries/system";
import { createVehicle } from "@/db/queries/vehicles";
import {
  bandPosition,
  getVehicleTimeline,
  type VehicleTimeline,
} from "@/db/queries/vehicle-timeline";
import { fuelTransactions } from "@/db/schema";
import { loadDemo } from "@/db/seed/demo";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { createTestDb } from "../../support/test-db";

let db: Db;
const scopes: Record<string, OrgScope> = {};
/** A Tidewater Kestrel K2 with stall repairs (the demo plants a purge-valve stall pattern there). */
let k2: number;
let k2Timeline: VehicleTimeline;

async function rows<T>(sql: string, args: (string | number)[] = []): Promise<T[]> {
  const rs = await db.$client.execute({ sql, args });
  return rs.rows as unknown as T[];
}

async function ids(table: string, vehicleId: number): Promise<number[]> {
  const found = await rows<{ id: number }>(
    `select id from ${table} where vehicle_id = ? order by id`,
    [vehicleId],
  );
  return found.map((r) => Number(r.id));
}

const sortedIds = (records: { id: number }[]) => records.map((r) => r.id).sort((a, b) => a - b);

function expectAscending(values: string[]) {
  for (let i = 1; i < values.length; i++) {
    expect(values[i]! >= values[i - 1]!, `${values[i - 1]} then ${values[i]}`).toBe(true);
  }
}

beforeAll(async () => {
  ({ db } = await createTestDb());
  await loadDemo(db);
  for (const slug of ["tidewater", "northgate"]) {
    const org = await findOrganisationBySlug(db, slug);
    scopes[slug] = { organisationId: org.id, userId: null, role: "technician" };
    await recomputeOrganisation(db, org.id);
  }
  const [vehicle] = await rows<{ id: number }>(
    `select v.id from vehicles v
       join generations g on g.id = v.generation_id
       join repair_lines l on l.vehicle_id = v.id
      where v.organisation_id = ? and v.model = 'Kestrel' and g.label = 'K2' and l.symptom = 'stall'
      group by v.id order by count(*) desc, v.id limit 1`,
    [scopes.tidewater!.organisationId],
  );
  k2 = Number(vehicle?.id);
  const timeline = await getVehicleTimeline(db, scopes.tidewater!, k2);
  if (!timeline) throw new Error("the K2 vehicle has no timeline");
  k2Timeline = timeline;
}, 120_000);

describe("getVehicleTimeline", () => {
  test("lists exactly the vehicle's own records, each sorted by time", async () => {
    const t = k2Timeline;
    expect(t.vehicle).toMatchObject({ id: k2, make: "Aurel", model: "Kestrel", cohortLabel: "K2" });
    expect(t.repairLines.length).toBeGreaterThan(0);
    expect(t.faultEvents.length).toBeGreaterThan(0);
    expect(t.fillUps.length).toBeGreaterThan(0);
    expect(sortedIds(t.repairLines)).toEqual(await ids("repair_lines", k2));
    expect(sortedIds(t.faultEvents)).toEqual(await ids("fault_events", k2));
    expect(sortedIds(t.fillUps)).toEqual(await ids("fuel_transactions", k2));
    expect(sortedIds(t.odometerReadings)).toEqual(await ids("odometer_readings", k2));
    expectAscending(t.repairLines.map((r) => r.openedOn));
    expectAscending(t.faultEvents.map((r) => r.occurredAt));
    expectAscending(t.fillUps.map((r) => r.filledAt));
    expect(t.isCapped).toEqual({ faultEvents: false, fillUps: false, odometerReadings: false });
  });

  test("repair lines carry their order, codes and component", async () => {
    const withCodes = k2Timeline.repairLines.find((l) => l.dtcs.length > 0);
    expect(withCodes).toBeDefined();
    const stored = await rows<{ dtc: string; description: string | null }>(
      `select c.dtc, d.description from repair_line_codes c left join dtc_codes d on d.code = c.dtc
        where c.repair_line_id = ? order by c.id`,
      [withCodes!.id],
    );
    expect(withCodes!.dtcs).toEqual(stored.map((r) => r.dtc));
    // The same codes by name, for the records table.
    expect(withCodes!.dtcNames).toEqual(
      stored.map((r) => (r.description ? `${r.dtc} — ${r.description}` : r.dtc)),
    );
    const [order] = await rows<{ ro_number: string }>(
      "select o.ro_number from repair_orders o join repair_lines l on l.repair_order_id = o.id where l.id = ?",
      [withCodes!.id],
    );
    expect(withCodes!.roNumber).toBe(order?.ro_number);
    const stall = k2Timeline.repairLines.find((l) => l.symptom === "stall" && l.componentSlug);
    expect(stall?.componentName).toBeTruthy();
  });

  test("totals add up against direct SQL", async () => {
    const [lines] = await rows<{ n: number; parts: number; labour: number }>(
      `select count(*) as n, coalesce(sum(parts_cost_cents), 0) as parts,
              coalesce(sum(labor_cost_cents), 0) as labour
         from repair_lines where vehicle_id = ?`,
      [k2],
    );
    const [fuel] = await rows<{ n: number; price: number }>(
      "select count(*) as n, coalesce(sum(price_total_cents), 0) as price from fuel_transactions where vehicle_id = ?",
      [k2],
    );
    expect(k2Timeline.totals).toEqual({
      repairOrders: (await ids("repair_orders", k2)).length,
      repairLines: Number(lines?.n),
      faultEvents: (await ids("fault_events", k2)).length,
      fillUps: Number(fuel?.n),
      odometerReadings: (await ids("odometer_readings", k2)).length,
      partsCostCents: Number(lines?.parts),
      laborCostCents: Number(lines?.labour),
      fuelCostCents: Number(fuel?.price),
    });
    expect(k2Timeline.totals.partsCostCents).toBeGreaterThan(0);
    expect(Number.isInteger(k2Timeline.totals.laborCostCents)).toBe(true);
  });

  test("a reading the statistics ignore is marked doubtful and sets no current odometer", async () => {
    const scope = scopes.tidewater!;
    const { id } = await createVehicle(
      db,
      { ...scope, role: "admin" },
      {
        unitNumber: "TL-ODO-1",
        make: "Aurel",
        model: "Kestrel",
        modelYear: 2016,
        odometerUnit: "mi",
      },
    );
    // The middle reading is the first one with a digit typed twice (×10).
    await db.insert(fuelTransactions).values(
      [
        ["2024-01-01T08:00:00.000Z", 45_000],
        ["2024-02-01T08:00:00.000Z", 450_000],
        ["2024-03-01T08:00:00.000Z", 47_100],
      ].map(([filledAt, odometerMi]) => ({
        organisationId: scope.organisationId,
        vehicleId: id,
        filledAt: String(filledAt),
        odometerMi: Number(odometerMi),
        volumeL: 40,
        priceTotalCents: 6_000,
      })),
    );
    const t = await getVehicleTimeline(db, scope, id);
    expect(t?.vehicle.lastOdometerMi).toBeNull();
    expect(t?.fillUps.map((f) => [f.odometerMi, f.isOdometerDoubtful])).toEqual([
      [45_000, false],
      [450_000, true],
      [47_100, false],
    ]);
    expect(t?.vehicle.currentOdometerMi).toBe(47_100);
    expect(t?.totals).toMatchObject({ repairOrders: 0, fillUps: 3, fuelCostCents: 18_000 });
    // A 2016 Kestrel belongs to the K2 generation: it matches the K2 cells, none of them yet.
    expect(t?.vehicle.cohortLabel).toBe("K2");
    expect(t?.patterns.every((p) => !p.hasHadFault)).toBe(true);
    expect(t?.patterns.some((p) => p.faultKey === "dtc:P0496" && p.position === "ahead")).toBe(
      true,
    );
  });

  test("another organisation's vehicle reads as missing; a viewer may not read vehicles", async () => {
    const [foreign] = await rows<{ id: number }>(
      "select id from vehicles where organisation_id = ? order by id limit 1",
      [scopes.northgate!.organisationId],
    );
    expect(await getVehicleTimeline(db, scopes.tidewater!, Number(foreign?.id))).toBeNull();
    expect(await getVehicleTimeline(db, scopes.northgate!, k2)).toBeNull();
    expect(await getVehicleTimeline(db, scopes.tidewater!, 987_654_321)).toBeNull();
    await expect(
      getVehicleTimeline(db, { ...scopes.tidewater!, role: "viewer" }, k2),
    ).rejects.toBeInstanceOf(ForbiddenError);
  });
});

describe("patterns the vehicle matches", () => {
  test("a Kestrel K2 with stall repairs lists the K2 purge-flow signal", () => {
    const { patterns } = k2Timeline;
    expect(patterns.length).toBeGreaterThan(0);
    for (const p of patterns) {
      expect(`${p.make} ${p.model} ${p.cohortLabel}`).toBe("Aurel Kestrel K2");
      expect(p.isSignal || (p.ratioLower ?? 0) > 1).toBe(true);
    }
    const purge = patterns.find((p) => p.isSignal && p.faultKey === "dtc:P0496");
    expect(purge).toBeDefined();
    expect(purge?.dtcDescription).toMatch(/purge/i);
    expect(purge?.bandToMi).toBeGreaterThan(purge!.bandFromMi);
  });

  test("each pattern carries its kind and its cell's p- and q-value for the details", async () => {
    for (const p of k2Timeline.patterns) {
      expect(["failure", "wear"]).toContain(p.kind);
      const [cell] = await rows<{ kind: string; p_value: number | null; q_value: number | null }>(
        `select kind, p_value, q_value from cell_stats
          where organisation_id = ? and make = ? and model = ? and cohort_label = ?
            and band_index = ? and fault_key = ?`,
        [scopes.tidewater!.organisationId, p.make, p.model, p.cohortLabel, p.bandIndex, p.faultKey],
      );
      expect(p.kind).toBe(cell?.kind);
      expect(p.pValue).toBe(cell?.p_value);
      expect(p.qValue).toBe(cell?.q_value);
    }
    const purge = k2Timeline.patterns.find((p) => p.faultKey === "dtc:P0496");
    expect(purge?.kind).toBe("failure");
    expect(purge?.pValue).toBeLessThan(0.05);
  });

  test("position and the vehicle's own history agree with its records", async () => {
    const odometer = k2Timeline.vehicle.currentOdometerMi;
    expect(odometer).not.toBeNull();
    for (const p of k2Timeline.patterns) {
      expect(p.position).toBe(bandPosition(odometer, p.bandFromMi, p.bandToMi));
      if (p.dtc) {
        const [coded] = await rows<{ n: number }>(
          "select count(*) as n from repair_line_codes where vehicle_id = ? and dtc = ?",
          [k2, p.dtc],
        );
        const [events] = await rows<{ n: number }>(
          "select count(*) as n from fault_events where vehicle_id = ? and dtc = ?",
          [k2, p.dtc],
        );
        expect(p.vehicleRepairs).toBe(Number(coded?.n));
        expect(p.vehicleFaultEvents).toBe(Number(events?.n));
        expect(p.hasHadFault).toBe(Number(coded?.n) + Number(events?.n) > 0);
      } else {
        const [lines] = await rows<{ n: number; in_band: number }>(
          `select count(*) as n,
                  coalesce(sum(l.odometer_mi >= ? and l.odometer_mi < ?), 0) as in_band
             from repair_lines l join components k on k.id = l.component_id
            where l.vehicle_id = ? and k.slug = ?`,
          [p.bandFromMi, p.bandToMi, k2, p.componentSlug ?? ""],
        );
        expect(p.vehicleRepairs).toBe(Number(lines?.n));
        expect(p.vehicleRepairsInBand).toBe(Number(lines?.in_band));
      }
    }
    // Inside and approaching bands come first.
    const order = ["inside", "approaching", "ahead", "past", "unknown"];
    expectAscending(k2Timeline.patterns.map((p) => String(order.indexOf(p.position))));
  });

  test("a vehicle with no generation is matched on its model year", async () => {
    const candidates = await rows<{ id: number; model_year: number }>(
      `select v.id, v.model_year from vehicles v
        where v.organisation_id = ? and v.generation_id is null
          and exists (select 1 from cell_stats c
                       where c.organisation_id = v.organisation_id and c.make = v.make
                         and c.model = v.model and c.cohort_label = cast(v.model_year as text)
                         and c.fault_key <> 'all' and (c.is_signal = 1 or c.ratio_lower > 1))
        order by v.id limit 1`,
      [scopes.northgate!.organisationId],
    );
    const [vehicle] = candidates;
    expect(vehicle).toBeDefined();
    const timeline = await getVehicleTimeline(db, scopes.northgate!, Number(vehicle?.id));
    expect(timeline?.vehicle.cohortLabel).toBe(String(vehicle?.model_year));
    expect(timeline?.patterns.length).toBeGreaterThan(0);
    for (const p of timeline?.patterns ?? [])
      expect(p.cohortLabel).toBe(String(vehicle?.model_year));
  });
});

describe("bandPosition", () => {
  // Bands hold their lower edge and not their upper one (band = floor(odometer / width)).
  test.each([
    [162_000, "inside"],
    [150_000, "inside"],
    [175_000, "past"],
    [149_999, "approaching"],
    [125_000, "approaching"],
    [124_999, "ahead"],
    [null, "unknown"],
  ] as const)("odometer %s against 150,000–175,000 is %s", (odometer, expected) => {
    expect(bandPosition(odometer, 150_000, 175_000)).toBe(expected);
  });
});
