import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { ForbiddenError, type OrgScope } from "@/db/queries/scope";
import { getStockingPlan } from "@/db/queries/stocking";
import { findOrganisationBySlug } from "@/db/queries/system";
import { loadDemo } from "@/db/seed/demo";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { poissonStockLevel } from "@/lib/stats";
import { createTestDb } from "../../support/test-db";

let db: Db;
let shop: OrgScope;
const defaults = { serviceLevel: 0.95, reviewDays: 14, months: 12, cautious: false };

beforeAll(async () => {
  ({ db } = await createTestDb());
  await loadDemo(db);
  const north = await findOrganisationBySlug(db, "northgate");
  await recomputeOrganisation(db, north.id);
  shop = { organisationId: north.id, userId: null, role: "manager" };
}, 120_000);

describe("the stocking plan of the demo shop", () => {
  test("every part's level is the Poisson quantile of its demand, and reorder = level − on hand", async () => {
    const plan = await getStockingPlan(db, shop, defaults);
    expect(plan.vehicles).toBeGreaterThan(1000);
    expect(plan.vehiclesWithOwnMileage).toBeGreaterThan(plan.vehicles * 0.8);
    expect(plan.parts.length).toBeGreaterThan(100);
    for (const p of plan.parts) {
      expect(p.stockLevel).toBe(poissonStockLevel(p.expectedDemand, 0.95));
      expect(p.reorder).toBe(Math.max(0, p.stockLevel - p.onHand));
      // The recompute stored every cell's posterior: each demand has its range, holding it.
      expect(p.demandLower).not.toBeNull();
      expect(p.demandLower!).toBeLessThanOrEqual(p.expectedDemand + 1e-9);
      expect(p.demandUpper!).toBeGreaterThanOrEqual(p.expectedDemand - 1e-9);
    }
    const needed = plan.parts.filter((p) => p.expectedDemand > 0);
    expect(needed.length).toBeGreaterThan(0);
    expect(needed.every((p) => p.demandUpper! > p.demandLower!)).toBe(true);
    // Oil service is the busiest job: its parts are class A.
    const oil = plan.parts.filter((p) => p.component === "Engine mechanical → Oil and filter");
    expect(oil.length).toBeGreaterThan(0);
    expect(oil.every((p) => p.abc === "A")).toBe(true);
  });

  test("the planted steering-assist sensor fault on the Skua SK3 drives demand for its part", async () => {
    const plan = await getStockingPlan(db, shop, defaults);
    const sensor = plan.parts.filter(
      (p) => p.component === "Steering → Steering assist sensor" && p.partNumber.startsWith("SK3-"),
    );
    expect(sensor.length).toBeGreaterThan(0);
    expect(sensor[0]!.expectedDemand).toBeGreaterThan(0);
  });

  test("the cautious option and a higher service level never plan less", async () => {
    const base = await getStockingPlan(db, shop, defaults);
    const cautious = await getStockingPlan(db, shop, {
      ...defaults,
      cautious: true,
      serviceLevel: 0.99,
    });
    const byNumber = new Map(cautious.parts.map((p) => [p.partNumber, p]));
    for (const p of base.parts) {
      const c = byNumber.get(p.partNumber);
      if (!c) continue;
      expect(c.expectedDemand).toBeGreaterThanOrEqual(p.expectedDemand - 1e-9);
      expect(c.stockLevel).toBeGreaterThanOrEqual(p.stockLevel);
    }
  });

  test("a technician may not read the plan", async () => {
    await expect(
      getStockingPlan(db, { ...shop, role: "technician" }, defaults),
    ).rejects.toBeInstanceOf(ForbiddenError);
  });
});
