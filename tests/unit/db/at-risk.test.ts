import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { getAtRiskVehicles } from "@/db/queries/at-risk";
import {
  addToCampaign,
  getCampaign,
  listCampaigns,
  setCampaignVehicleDone,
} from "@/db/queries/campaigns";
import { ConflictError, ForbiddenError, NotFoundError, type OrgScope } from "@/db/queries/scope";
import { findOrganisationBySlug } from "@/db/queries/system";
import { loadDemo } from "@/db/seed/demo";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { expectedFailures, expectedFailuresInterval, median, milesByBand } from "@/lib/at-risk";
import { jStat } from "../stats/support";
import { createTestDb } from "../../support/test-db";

describe("milesByBand (the miles ahead split at band edges)", () => {
  test("a stretch inside one band, across an edge, and none", () => {
    expect(milesByBand(5_000, 10_000, 25_000)).toEqual([[0, 10_000]]);
    expect(milesByBand(20_000, 10_000, 25_000)).toEqual([
      [0, 5_000],
      [1, 5_000],
    ]);
    expect(milesByBand(20_000, 0, 25_000)).toEqual([]);
  });
});

describe("expectedFailures (piecewise-constant Poisson rate over bands)", () => {
  const rates = new Map([
    [0, 0.0001],
    [1, 0.0004],
  ]);
  test("inside one band it is rate × miles", () => {
    expect(expectedFailures(milesByBand(5_000, 10_000, 25_000), rates)).toBeCloseTo(1, 12);
  });
  test("across a band edge each part uses its band's rate; past the cells it is 0", () => {
    // 20,000 → 25,000 at 0.0001 (0.5) + 25,000 → 30,000 at 0.0004 (2.0).
    expect(expectedFailures(milesByBand(20_000, 10_000, 25_000), rates)).toBeCloseTo(2.5, 12);
    expect(expectedFailures(milesByBand(60_000, 10_000, 25_000), rates)).toBe(0);
    expect(expectedFailures(milesByBand(0, 0, 25_000), rates)).toBe(0);
  });
});

describe("expectedFailuresInterval (the bands' gamma posteriors, summed)", () => {
  test("inside one band it is miles × the posterior's quantiles; its mean is expectedFailures", () => {
    // Posterior Gamma(shape 3, rate 20,000 mi): mean 1.5e-4 a mile; 10,000 mi → Gamma(3, scale
    // 0.5), whose 2.5% and 97.5% points come from jstat (an independent reference library).
    const posteriors = new Map([[0, { shape: 3, exposureMi: 20_000 }]]);
    const r = expectedFailuresInterval(milesByBand(5_000, 10_000, 25_000), posteriors, 0.95);
    expect(r.lower).toBeCloseTo(jStat.gamma.inv(0.025, 3, 0.5), 6);
    expect(r.upper).toBeCloseTo(jStat.gamma.inv(0.975, 3, 0.5), 6);
    expect(
      expectedFailures(milesByBand(5_000, 10_000, 25_000), new Map([[0, 3 / 20_000]])),
    ).toBeCloseTo(1.5, 12);
  });
  test("across a band edge both bands count; no posterior counts as no failures", () => {
    const both = new Map([
      [0, { shape: 3, exposureMi: 20_000 }],
      [1, { shape: 8, exposureMi: 20_000 }],
    ]);
    const across = expectedFailuresInterval(milesByBand(20_000, 10_000, 25_000), both, 0.95);
    const first = expectedFailuresInterval(milesByBand(20_000, 5_000, 25_000), both, 0.95);
    expect(across.lower).toBeGreaterThan(first.lower);
    expect(across.upper).toBeGreaterThan(first.upper);
    expect(expectedFailuresInterval(milesByBand(60_000, 10_000, 25_000), both, 0.95)).toEqual({
      lower: 0,
      upper: 0,
    });
  });
});

describe("the at-risk watch-list and campaign lists on the demo", () => {
  let db: Db;
  let fleet: OrgScope;
  let shop: OrgScope;
  beforeAll(async () => {
    ({ db } = await createTestDb());
    await loadDemo(db);
    const tide = await findOrganisationBySlug(db, "tidewater");
    const north = await findOrganisationBySlug(db, "northgate");
    await recomputeOrganisation(db, tide.id);
    await recomputeOrganisation(db, north.id);
    fleet = { organisationId: tide.id, userId: null, role: "manager" };
    shop = { organisationId: north.id, userId: null, role: "manager" };
  }, 120_000);

  test("vehicles approaching the confirmed Merlin M2 ground-strap issue are listed with expected failures", async () => {
    const { rows } = await getAtRiskVehicles(db, fleet, { nextMiles: 10_000 });
    const m2 = rows.filter(
      (r) =>
        r.source.kind === "known-issue" && r.source.title.startsWith("Harsh or flaring shifts"),
    );
    expect(m2.length).toBeGreaterThan(0);
    for (const r of m2) {
      expect(r.cohort).toBe("Aurel Merlin M2");
      expect(r.odometerMi).toBeGreaterThanOrEqual(75_000 - 25_000);
      expect(r.expected).toBeGreaterThan(0);
      expect(r.fixCostCents).not.toBeNull();
      // The interval from the bands' posteriors holds the expected count.
      expect(r.expectedLower).not.toBeNull();
      expect(r.expectedLower!).toBeLessThan(r.expected);
      expect(r.expectedUpper!).toBeGreaterThan(r.expected);
    }
    // Sorted by expected failures, most first.
    const expected = rows.map((r) => r.expected);
    expect(expected).toEqual([...expected].sort((a, b) => b - a));
    // None of them has had the fix inside the range.
    const ids = m2.map((r) => r.vehicleId);
    const [fixed] = await db.all<{ n: number }>(sql`
      select count(*) as n from repair_lines l join components k on k.id = l.component_id
       where l.vehicle_id in (${sql.join(
         ids.map((i) => sql`${i}`),
         sql`, `,
       )})
         and k.slug = 'power-distribution/body-ground' and l.odometer_mi >= 75000`);
    expect(Number(fixed?.n)).toBe(0);
  });

  test("a signal's fault is named as people name it, never by its slug", async () => {
    const { rows } = await getAtRiskVehicles(db, fleet, { nextMiles: 10_000 });
    const signals = rows.flatMap((r) => (r.source.kind === "signal" ? [r.source] : []));
    expect(signals.length).toBeGreaterThan(0);
    const names = await db.all<{ key: string; name: string }>(sql`
      select 'dtc:' || code as key, code || ' — ' || description as name from dtc_codes
      union all
      select 'component:' || slug, system || ' → ' || name from components`);
    const nameOf = new Map(names.map((n) => [n.key, n.name]));
    for (const s of signals) {
      expect(s.label).toBe(nameOf.get(s.faultKey));
      if (s.faultKey.startsWith("component:"))
        expect(s.label).not.toContain(s.faultKey.slice("component:".length));
    }
  });

  test("campaign lists: add, no duplicates, done and undone; organisations and roles enforced", async () => {
    const { rows } = await getAtRiskVehicles(db, fleet, { nextMiles: 10_000 });
    const ids = [...new Set(rows.map((r) => r.vehicleId))].slice(0, 3);
    const { campaignId, added } = await addToCampaign(db, fleet, {
      name: "Ground straps",
      vehicleIds: ids,
    });
    expect(added).toBe(ids.length);
    const again = await addToCampaign(db, fleet, { campaignId, vehicleIds: ids });
    expect(again.added).toBe(0);
    await expect(
      addToCampaign(db, fleet, { name: "Ground straps", vehicleIds: ids }),
    ).rejects.toBeInstanceOf(ConflictError);
    const c = (await getCampaign(db, fleet, campaignId))!;
    expect(c.vehicles).toHaveLength(ids.length);
    await setCampaignVehicleDone(db, fleet, { campaignVehicleId: c.vehicles[0]!.id, done: true });
    expect((await listCampaigns(db, fleet))[0]).toMatchObject({
      name: "Ground straps",
      vehicles: ids.length,
      done: 1,
    });
    await setCampaignVehicleDone(db, fleet, { campaignVehicleId: c.vehicles[0]!.id, done: false });
    expect((await listCampaigns(db, fleet))[0]?.done).toBe(0);

    // Another organisation sees nothing and cannot touch it, nor add its own vehicles here.
    expect(await getCampaign(db, shop, campaignId)).toBeNull();
    await expect(
      setCampaignVehicleDone(db, shop, { campaignVehicleId: c.vehicles[0]!.id, done: true }),
    ).rejects.toBeInstanceOf(NotFoundError);
    const [shopVehicle] = await db.all<{ id: number }>(
      sql`select id from vehicles where organisation_id = ${shop.organisationId} limit 1`,
    );
    await expect(
      addToCampaign(db, fleet, { campaignId, vehicleIds: [Number(shopVehicle?.id)] }),
    ).rejects.toBeInstanceOf(NotFoundError);
    await expect(
      getAtRiskVehicles(db, { ...fleet, role: "technician" }, { nextMiles: 1000 }),
    ).rejects.toBeInstanceOf(ForbiddenError);
  });
});

describe("median", () => {
  // The middle value, or the mean of the two middle values for an even count (NIST/SEMATECH
  // e-Handbook of Statistical Methods, 1.3.5.1); none → 0 by Recurra's choice.
  test("odd and even counts, unsorted input left as it was, and none", () => {
    const xs = [9, 1, 5];
    expect(median(xs)).toBe(5);
    expect(xs).toEqual([9, 1, 5]);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([7])).toBe(7);
    expect(median([])).toBe(0);
  });
});
