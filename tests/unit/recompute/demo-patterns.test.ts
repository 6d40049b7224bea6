import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { listRankedCells, type RankedCell } from "@/db/queries/cells";
import { getRefuelAnalysis } from "@/db/queries/refuel";
import type { OrgScope } from "@/db/queries/scope";
import { findOrganisationBySlug } from "@/db/queries/system";
import { loadDemo } from "@/db/seed/demo";
import { localDatabasePath } from "@/db";
import { countEventsByCohort, countEventsPerVehicle } from "@/jobs/recompute/events";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { createTestDb } from "../../support/test-db";

// The demo is the generated fleet with known planted patterns (db/seed/demo/patterns.ts).
let db: Db;
const scopes: Record<string, OrgScope> = {};

beforeAll(async () => {
  ({ db } = await createTestDb());
  await loadDemo(db);
  for (const slug of ["tidewater", "northgate"]) {
    const org = await findOrganisationBySlug(db, slug);
    scopes[slug] = { organisationId: org.id, userId: null, role: "admin" };
    await recomputeOrganisation(db, org.id);
  }
}, 120_000);

const fault = (c: RankedCell) => c.dtc ?? c.component ?? "";

describe("the demo's planted patterns come out on top", () => {
  test("Tidewater: shift faults of Merlin M2 past 75,000 mi and no-starts of Kestrel K3 lead the ranking", async () => {
    const { cells } = await listRankedCells(db, scopes.tidewater!, { limit: 8 });
    const top = cells.slice(0, 8);
    expect(top.every((c) => (c.ratioLower ?? 0) > 1)).toBe(true);
    const merlinShift = top.filter(
      (c) =>
        c.model === "Merlin" &&
        c.generation === "M2" &&
        c.bandFrom >= 75_000 &&
        /P0700|P0730|P0750|body-ground|P0562/.test(fault(c)),
    );
    expect(merlinShift.length).toBeGreaterThanOrEqual(4);
    expect(top.some((c) => c.generation === "K3" && /main-fuse|U0100|P0562/.test(fault(c)))).toBe(
      true,
    );
  });

  test("Tidewater: signals include the Kestrel K2 purge-flow code; no signal on a cohort without a plant", async () => {
    const { cells } = await listRankedCells(db, scopes.tidewater!, {
      isSignalOnly: true,
      limit: 1000,
    });
    expect(cells.length).toBeGreaterThan(3);
    expect(
      cells.some((c) => c.generation === "K2" && /P0496|P0441|purge-valve/.test(fault(c))),
    ).toBe(true);
    for (const c of cells) {
      expect(["Merlin M2", "Kestrel K3", "Kestrel K2"]).toContain(`${c.model} ${c.generation}`);
      expect(c.qValue).toBeLessThanOrEqual(0.05);
      expect(c.events).toBeGreaterThanOrEqual(3);
    }
  });

  test("Tidewater: the post-refuel stall cluster of Kestrel K2 is flagged, and only it", async () => {
    const { cohorts, fleet } = await getRefuelAnalysis(db, scopes.tidewater!, 20);
    expect(fleet.pValue).toBeLessThan(1e-6);
    const [first] = cohorts;
    expect(`${first?.model} ${first?.generation}`).toBe("Kestrel K2");
    expect(first?.pValue).toBeLessThan(1e-10);
    expect(first?.lower).toBeGreaterThan(3);
    for (const c of cohorts.slice(1)) expect(c.pValue).toBeGreaterThan(0.001);
  });

  test("Northgate: Skua loses steering assist in one band; Wren blows accessory fuses", async () => {
    const { cells } = await listRankedCells(db, scopes.northgate!, {
      isSignalOnly: true,
      limit: 1000,
    });
    const steering = cells.filter(
      (c) => c.model === "Skua" && /U0131|P0550|assist-sensor/.test(fault(c)),
    );
    expect(steering.length).toBeGreaterThan(0);
    expect(steering.some((c) => c.bandFrom === 50_000)).toBe(true);
    expect(cells.some((c) => c.model === "Wren" && /accessory-fuses|harness/.test(fault(c)))).toBe(
      true,
    );
  });
});

describe("event counts", () => {
  test("per-vehicle groups added up in JavaScript equal the database's GROUP BY per cohort with distinct vehicles", async () => {
    const file = localDatabasePath(db);
    for (const slug of ["tidewater", "northgate"]) {
      const org = scopes[slug]!.organisationId;
      const byCohort = await countEventsByCohort(db, org, 25_000);
      const perVehicle = file ? await countEventsPerVehicle(db, file, org, 25_000) : byCohort;
      const lines = (r: typeof byCohort) =>
        r.counts
          .map((c) => `${c.cohortKey}|${c.band}|${c.faultKey}|${c.events}|${c.vehiclesAffected}`)
          .sort();
      expect(lines(byCohort).length).toBeGreaterThan(100);
      expect(lines(perVehicle)).toEqual(lines(byCohort));
      expect(perVehicle.linesWithoutOdometer).toBe(byCohort.linesWithoutOdometer);
      // The cohort and the fault columns come out the same way too.
      const byKey = new Map(
        byCohort.counts.map((c) => [`${c.cohortKey}|${c.band}|${c.faultKey}`, c]),
      );
      for (const c of perVehicle.counts) {
        expect(c).toEqual(byKey.get(`${c.cohortKey}|${c.band}|${c.faultKey}`));
      }
    }
  });
});
