import { eq, sql } from "drizzle-orm";
import seedrandom from "seedrandom";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { getComebackReport } from "@/db/queries/comebacks";
import { getRefuelAnalysis } from "@/db/queries/refuel";
import { ForbiddenError, type OrgScope } from "@/db/queries/scope";
import { createOrganisation, findOrganisationBySlug } from "@/db/queries/system";
import { createVehicle } from "@/db/queries/vehicles";
import { loadDemo } from "@/db/seed/demo";
import {
  faultEvents,
  fuelTransactions,
  knownIssueCohorts,
  knownIssues,
  organisations,
  repairLines,
  repairOrders,
} from "@/db/schema";
import { poissonInterval, wilsonInterval } from "@/lib/stats";
import { createTestDb } from "../../support/test-db";

let db: Db;

/**
 * A small fleet built through the data layer and direct inserts: 12 Aurel Kestrel 2016 and
 * 12 Brindle Tern 2018, each filled up every 250–350 mi over 20,000 mi, with 4 stalls each.
 * Planted: the Kestrels' stalls come 0.5–10 mi after a fill-up; otherwise (and always for the
 * Terns) stalls fall anywhere. One extra Kestrel has stalls but no fill-ups; one stall order has
 * no odometer reading.
 */
async function buildFleet(slug: string, isPlanted: boolean): Promise<OrgScope> {
  const org = await createOrganisation(db, { slug, name: slug, kind: "fleet", distanceUnit: "mi" });
  const scope: OrgScope = { organisationId: org.id, userId: null, role: "admin" };
  const rng = seedrandom(slug);
  let ro = 0;
  const addStall = async (vehicleId: number, odometerMi: number | null) => {
    ro++;
    const day = `2025-${String(1 + (ro % 12)).padStart(2, "0")}-${String(1 + (ro % 27)).padStart(2, "0")}`;
    const [order] = await db
      .insert(repairOrders)
      .values({
        organisationId: org.id,
        vehicleId,
        roNumber: `${slug}-${ro}`,
        openedOn: day,
        odometerMi,
      })
      .returning();
    // Two stall lines on one order count as one event.
    for (const lineNo of [1, 2])
      await db.insert(repairLines).values({
        organisationId: org.id,
        repairOrderId: order!.id,
        vehicleId,
        lineNo,
        openedOn: day,
        odometerMi,
        symptom: "stall",
      });
  };
  for (const [make, model, year, planted] of [
    ["Aurel", "Kestrel", 2016, isPlanted],
    ["Brindle", "Tern", 2018, false],
  ] as const) {
    for (let v = 0; v < 12; v++) {
      const { id } = await createVehicle(db, scope, {
        unitNumber: `${model[0]}-${v}`,
        make,
        model,
        modelYear: year,
        odometerUnit: "mi",
      });
      const fills: number[] = [];
      for (let odo = 1000 + rng() * 300; odo < 21_000; odo += 250 + rng() * 100) fills.push(odo);
      await db.insert(fuelTransactions).values(
        fills.map((odometerMi, i) => ({
          organisationId: org.id,
          vehicleId: id,
          filledAt: `2025-01-01T00:${String(Math.floor(i / 60)).padStart(2, "0")}:${String(i % 60).padStart(2, "0")}Z`,
          odometerMi,
        })),
      );
      for (let k = 0; k < 4; k++) {
        const at = planted
          ? fills[5 + Math.floor(rng() * (fills.length - 10))]! + 0.5 + rng() * 9.5
          : 2000 + rng() * 18_000;
        await addStall(id, at);
      }
    }
  }
  const { id: dry } = await createVehicle(db, scope, {
    unitNumber: "K-DRY",
    make: "Aurel",
    model: "Kestrel",
    modelYear: 2016,
    odometerUnit: "mi",
  });
  await addStall(dry, 5000);
  await addStall(dry, 9000);
  await addStall(dry, null);
  return scope;
}

let planted: OrgScope;
let plain: OrgScope;

beforeAll(async () => {
  ({ db } = await createTestDb());
  planted = await buildFleet("planted", true);
  plain = await buildFleet("plain", false);
  // A stall known issue on the planted cohort (all generations) and a retired one that never matches.
  for (const [title, state] of [
    ["Stalls after fill-ups", "watching"],
    ["Old stall issue", "retired"],
  ] as const) {
    const [issue] = await db
      .insert(knownIssues)
      .values({ organisationId: planted.organisationId, title, state, symptoms: "stall" })
      .returning();
    await db.insert(knownIssueCohorts).values({
      organisationId: planted.organisationId,
      knownIssueId: issue!.id,
      make: "Aurel",
      model: "Kestrel",
    });
  }
}, 60_000);

describe("post-refuel stall finder on generated fleets (statistics.md §7)", () => {
  test("a planted cluster puts its cohort on top with a tiny p-value; the other cohort is unremarkable", async () => {
    const r = await getRefuelAnalysis(db, planted, 20);
    const [top, other] = r.cohorts;
    expect(top).toMatchObject({ make: "Aurel", model: "Kestrel", generation: "2016" });
    // 48 of 48 measurable stalls within 20 mi where chance predicts about 48 × 20/300 ≈ 3.2.
    expect(top!.observed).toBe(48);
    expect(top!.expected).toBeGreaterThan(2);
    expect(top!.expected).toBeLessThan(5);
    expect(top!.pValue).toBeLessThan(1e-20);
    expect(top!.lower).toBeGreaterThan(5);
    expect(other!.pValue).toBeGreaterThan(0.001);
    // The planted vehicles lead the per-vehicle list; each links to a vehicle id of the org.
    expect(r.vehicles.slice(0, 12).every((v) => v.model === "Kestrel")).toBe(true);
    expect(r.vehicles[0]!.sinceMi.every((s) => s !== null && s <= 10)).toBe(true);
    expect(r.vehicles[0]!.medianIntervalMi).toBeGreaterThan(250);
    // The histogram defaults to the strongest cohort and shows the cluster in the first bins.
    expect(r.histogram.cohort).toBe(top!.key);
    expect(r.histogram.bins[0]!.observed + r.histogram.bins[1]!.observed).toBe(48);
    expect(r.histogram.bins[0]!.chance).toBeLessThan(2);
  });

  test("the ratio's interval is at the organisation's confidence level", async () => {
    const at95 = await getRefuelAnalysis(db, planted, 20);
    expect(at95.confidence).toBe(0.95);
    await db
      .update(organisations)
      .set({ confidenceLevel: 0.8 })
      .where(eq(organisations.id, planted.organisationId));
    try {
      const at80 = await getRefuelAnalysis(db, planted, 20);
      expect(at80.confidence).toBe(0.8);
      const [top] = at80.cohorts;
      // Exact Poisson (Garwood) limits of the observed count, divided by what chance predicts.
      const limits = poissonInterval(top!.observed, top!.expected, 0.8);
      expect(top!.lower).toBeCloseTo(limits.lower, 10);
      expect(top!.upper).toBeCloseTo(limits.upper, 10);
      // A lower level gives a narrower interval around the same ratio and p-value.
      expect(top!.lower).toBeGreaterThan(at95.cohorts[0]!.lower);
      expect(top!.upper).toBeLessThan(at95.cohorts[0]!.upper);
      expect(top!.ratio).toBe(at95.cohorts[0]!.ratio);
      expect(top!.pValue).toBe(at95.cohorts[0]!.pValue);
    } finally {
      await db
        .update(organisations)
        .set({ confidenceLevel: 0.95 })
        .where(eq(organisations.id, planted.organisationId));
    }
  });

  test("without a plant no cohort stands out", async () => {
    const r = await getRefuelAnalysis(db, plain, 20);
    expect(r.cohorts).toHaveLength(2);
    for (const c of r.cohorts) expect(c.pValue).toBeGreaterThan(0.001);
    expect(r.fleet.pValue).toBeGreaterThan(0.001);
  });

  test("events are counted once per repair order; no fuel data and no odometer are counted and listed", async () => {
    const r = await getRefuelAnalysis(db, planted, 20);
    // 24 vehicles × 4 stalls + 2 measured-odometer stalls of the dry vehicle.
    expect(r.events).toHaveLength(98);
    expect(r.eventsWithoutOdometer).toBe(1);
    expect(r.fleet.noFuelData).toBe(2);
    expect(r.noFuelData).toEqual([
      expect.objectContaining({ unitNumber: "K-DRY", events: 2, fillUps: 0 }),
    ]);
    expect(r.cohorts[0]!.noFuelData).toBe(2);
  });

  test("the matching non-retired stall known issue is offered; another organisation sees none", async () => {
    const r = await getRefuelAnalysis(db, planted, 20);
    expect(r.cohorts[0]!.knownIssue).toMatchObject({ title: "Stalls after fill-ups" });
    expect(r.cohorts[1]!.knownIssue).toBeNull();
    const onlyNoStarts = await getRefuelAnalysis(db, planted, 20, { symptoms: ["no-start"] });
    expect(onlyNoStarts.cohorts).toEqual([]);
    const p = await getRefuelAnalysis(db, plain, 20);
    expect(p.cohorts.every((c) => c.knownIssue === null)).toBe(true);
    // Vehicle ids never cross organisations.
    const plainIds = new Set(p.vehicles.map((v) => v.vehicleId));
    expect(r.vehicles.some((v) => plainIds.has(v.vehicleId))).toBe(false);
  });

  test("fault codes count when a known issue of the cohort ties them to a stall; once per vehicle and day", async () => {
    const org = await createOrganisation(db, {
      slug: "codes",
      name: "codes",
      kind: "fleet",
      distanceUnit: "mi",
    });
    const scope: OrgScope = { organisationId: org.id, userId: null, role: "admin" };
    const vehicle = async (unitNumber: string, make: string, model: string) =>
      (
        await createVehicle(db, scope, {
          unitNumber,
          make,
          model,
          modelYear: 2016,
          odometerUnit: "mi",
        })
      ).id;
    const kestrel = await vehicle("K-1", "Aurel", "Kestrel");
    const tern = await vehicle("T-1", "Brindle", "Tern");
    for (const v of [kestrel, tern]) {
      await db.insert(fuelTransactions).values(
        [1000, 1300, 1600, 1900].map((odometerMi, i) => ({
          organisationId: org.id,
          vehicleId: v,
          filledAt: `2025-03-0${i + 1}T08:00:00Z`,
          odometerMi,
        })),
      );
    }
    const [issue] = await db
      .insert(knownIssues)
      .values({
        organisationId: org.id,
        title: "Stalls after fill-ups",
        state: "watching",
        symptoms: "stall rough-running",
        dtcCodes: "P0496 P0441",
      })
      .returning();
    await db.insert(knownIssueCohorts).values({
      organisationId: org.id,
      knownIssueId: issue!.id,
      make: "Aurel",
      model: "Kestrel",
    });
    // A stall repair order on 03-02 (1,302 mi: 2 mi after a fill-up).
    const [order] = await db
      .insert(repairOrders)
      .values({
        organisationId: org.id,
        vehicleId: kestrel,
        roNumber: "S-1",
        openedOn: "2025-03-02",
        odometerMi: 1302,
      })
      .returning();
    await db.insert(repairLines).values({
      organisationId: org.id,
      repairOrderId: order!.id,
      vehicleId: kestrel,
      openedOn: "2025-03-02",
      odometerMi: 1302,
      symptom: "stall",
    });
    await db.insert(faultEvents).values([
      // Counted: the issue's code, its cohort, 3 mi after a fill-up.
      {
        organisationId: org.id,
        vehicleId: kestrel,
        occurredAt: "2025-03-03T09:00:00Z",
        odometerMi: 1603,
        dtc: "P0496",
      },
      // The same day again (another code of the issue): the same incident.
      {
        organisationId: org.id,
        vehicleId: kestrel,
        occurredAt: "2025-03-03T09:05:00Z",
        odometerMi: 1604,
        dtc: "P0441",
      },
      // The day of the repair order: the same incident.
      {
        organisationId: org.id,
        vehicleId: kestrel,
        occurredAt: "2025-03-02T10:00:00Z",
        odometerMi: 1302,
        dtc: "P0496",
      },
      // Not the issue's code; not the issue's cohort.
      {
        organisationId: org.id,
        vehicleId: kestrel,
        occurredAt: "2025-03-04T09:00:00Z",
        odometerMi: 1905,
        dtc: "P0300",
      },
      {
        organisationId: org.id,
        vehicleId: tern,
        occurredAt: "2025-03-03T09:00:00Z",
        odometerMi: 1603,
        dtc: "P0496",
      },
    ]);
    const r = await getRefuelAnalysis(db, scope, 20);
    expect(r.faultEvents).toBe(1);
    expect(r.events.map((e) => [e.source, e.roNumber ?? e.dtc, e.odometerMi, e.sinceMi])).toEqual([
      ["repair", "S-1", 1302, 2],
      ["fault", "P0496", 1603, 3],
    ]);
    expect(r.fleet).toMatchObject({ events: 2, observed: 2 });
    // Only stalls were tied to these codes: asked for no-starts, they do not count.
    const noStarts = await getRefuelAnalysis(db, scope, 20, { symptoms: ["no-start"] });
    expect(noStarts.faultEvents).toBe(0);
    expect(noStarts.events).toEqual([]);
  });

  test("roles: viewers may read the analysis; technicians may not", async () => {
    await expect(getRefuelAnalysis(db, { ...planted, role: "viewer" }, 20)).resolves.toBeDefined();
    await expect(
      getRefuelAnalysis(db, { ...planted, role: "technician" }, 20),
    ).rejects.toBeInstanceOf(ForbiddenError);
  });
});

describe("on the demo", () => {
  let tidewater: OrgScope;
  let northgate: OrgScope;
  beforeAll(async () => {
    await loadDemo(db);
    const t = await findOrganisationBySlug(db, "tidewater");
    const n = await findOrganisationBySlug(db, "northgate");
    tidewater = { organisationId: t.id, userId: null, role: "manager" };
    northgate = { organisationId: n.id, userId: null, role: "manager" };
  }, 120_000);

  test("the Tidewater Kestrel K2 cohort is the strongest post-refuel result, with its known issue", async () => {
    const r = await getRefuelAnalysis(db, tidewater, 20);
    const [top, next] = r.cohorts;
    expect(`${top?.make} ${top?.model} ${top?.generation}`).toBe("Aurel Kestrel K2");
    expect(top!.pValue).toBeLessThan(1e-10);
    expect(next!.pValue).toBeGreaterThan(0.001);
    expect(top!.knownIssue?.title).toMatch(/refuel/i);
    expect(r.histogram.cohort).toBe("Aurel|Kestrel|K2");
  });

  test("both organisations have comebacks; technicians and viewers may not read them", async () => {
    for (const scope of [tidewater, northgate]) {
      const r = await getComebackReport(db, scope);
      expect(r.comebacks).toBeGreaterThan(10);
      expect(r.pairs.length).toBeGreaterThan(10);
      expect(r.byTechnician.length).toBeGreaterThan(2);
      for (const p of r.pairs) {
        expect(p.first.vehicleId).toBe(p.again.vehicleId);
        expect(p.again.openedOn > p.first.openedOn).toBe(true);
      }
    }
    for (const role of ["technician", "viewer"] as const)
      await expect(getComebackReport(db, { ...northgate, role })).rejects.toBeInstanceOf(
        ForbiddenError,
      );
  });

  test("comebacks name their faults and carry intervals at the organisation's confidence", async () => {
    const r = await getComebackReport(db, tidewater);
    expect(r.settings.confidence).toBe(0.95);
    const w = wilsonInterval(r.comebacks, r.repairs, r.settings.confidence);
    expect(r.overall.lower).toBeCloseTo(w.lower, 12);
    expect(r.overall.upper).toBeCloseTo(w.upper, 12);
    // Faults by name: "P0496 — …" for a DTC the catalogue describes, "System → Name" for a
    // component; never a slug.
    const described = new Map(
      (
        await db.all<{ code: string; description: string }>(
          sql`select code, description from dtc_codes`,
        )
      ).map((d) => [d.code, d.description]),
    );
    const dtcFaults = r.byFault.filter((f) => f.key.startsWith("dtc:"));
    expect(dtcFaults.some((f) => described.has(f.key.slice(4)))).toBe(true);
    for (const f of r.byFault) {
      const code = f.key.slice(4);
      if (f.key.startsWith("dtc:"))
        expect(f.label).toBe(described.has(code) ? `${code} — ${described.get(code)}` : code);
      else expect(f.label).toMatch(/^[A-Z][^/]* → [A-Z][^/]*$/);
    }
    for (const p of r.pairs)
      for (const name of p.faults)
        expect(name).toMatch(/^[A-Z][0-9A-F]{4}( — .+)?$|^[A-Z][^/]* → [A-Z][^/]*$/);
  });
});
