import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { ensureCellView } from "@/db/queries/cell-views";
import { getCellDetail, getHeatmap, getPatternOptions, faultKeyOf } from "@/db/queries/patterns";
import { ForbiddenError, type OrgScope } from "@/db/queries/scope";
import { findOrganisationBySlug } from "@/db/queries/system";
import { loadDemo } from "@/db/seed/demo";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { createTestDb } from "../../support/test-db";

let db: Db;
const scopes: Record<string, OrgScope> = {};

async function one<T>(sql: string, args: (string | number)[] = []): Promise<T> {
  const rs = await db.$client.execute({ sql, args });
  return rs.rows[0] as unknown as T;
}

beforeAll(async () => {
  ({ db } = await createTestDb());
  await loadDemo(db);
  for (const slug of ["tidewater", "northgate"]) {
    const org = await findOrganisationBySlug(db, slug);
    scopes[slug] = { organisationId: org.id, userId: null, role: "viewer" };
    await recomputeOrganisation(db, org.id);
  }
}, 120_000);

describe("faultKeyOf", () => {
  test("DTCs, components and systems become the keys the cells are stored under", () => {
    expect(faultKeyOf("p0730")).toBe("dtc:P0730");
    expect(faultKeyOf("Fuel-Vapour/Purge-Valve")).toBe("component:fuel-vapour/purge-valve");
    expect(faultKeyOf("all")).toBe("all");
    expect(faultKeyOf("dtc:P0496")).toBe("dtc:P0496");
  });
});

describe("getHeatmap", () => {
  test("the cohort view of one fault is exactly the stored cells of that fault", async () => {
    const tide = scopes.tidewater!;
    const map = await getHeatmap(db, tide, { view: "cohorts", fault: "P0730" });
    const stored = await one<{ n: number; events: number }>(
      "select count(*) as n, sum(events) as events from cell_stats where organisation_id = ? and fault_key = 'dtc:P0730'",
      [tide.organisationId],
    );
    const cells = map.rows.flatMap((r) => r.cells);
    expect(cells.length).toBe(Number(stored.n));
    expect(cells.reduce((s, c) => s + c.events, 0)).toBe(Number(stored.events));
    // Bands are the union of the rows' bands, in order, each once.
    const bandIds = map.bands.map((b) => b.band);
    expect(bandIds).toEqual([...new Set(bandIds)].sort((a, b) => a - b));
    for (const c of cells) expect(bandIds).toContain(c.bandIndex);
    // The planted Merlin M2 shift pattern is a signal in some band past 75,000 mi.
    const m2 = map.rows.find((r) => r.label === "Aurel Merlin M2");
    expect(m2?.cells.some((c) => c.isSignal && c.bandFromMi >= 75_000)).toBe(true);
  });

  test("a too-little-data cell keeps its flag (the screen shows it as n/a, not zero)", async () => {
    const map = await getHeatmap(db, scopes.tidewater!, { view: "cohorts" });
    const sparse = map.rows.flatMap((r) => r.cells).filter((c) => c.hasTooLittleData);
    expect(sparse.length).toBeGreaterThan(0);
    for (const c of sparse) expect(c.exposureMi).toBeGreaterThanOrEqual(0);
  });

  test("the fault view of one cohort has one row per fault, all-faults totals excluded", async () => {
    const map = await getHeatmap(db, scopes.tidewater!, {
      view: "faults",
      make: "Aurel",
      model: "Kestrel",
      generation: "K2",
      maxRows: 5,
    });
    expect(map.rows.length).toBeGreaterThan(0);
    expect(map.rows.length).toBeLessThanOrEqual(5);
    expect(new Set(map.rows.map((r) => r.faultKey)).size).toBe(map.rows.length);
    expect(map.rows.every((r) => r.faultKey !== "all" && r.generation === "K2")).toBe(true);
  });

  test("band range and make filters narrow the cells", async () => {
    const map = await getHeatmap(db, scopes.tidewater!, {
      view: "cohorts",
      make: "Brindle",
      bandFromMi: 50_000,
      bandToMi: 100_000,
    });
    const cells = map.rows.flatMap((r) => r.cells);
    expect(cells.length).toBeGreaterThan(0);
    expect(map.rows.every((r) => r.make === "Brindle")).toBe(true);
    expect(cells.every((c) => c.bandToMi > 50_000 && c.bandFromMi < 100_000)).toBe(true);
  });

  test("another organisation's cells never show", async () => {
    const north = await getHeatmap(db, scopes.northgate!, { view: "cohorts", fault: "P0730" });
    const tideLabels = new Set(
      (await getHeatmap(db, scopes.tidewater!, { view: "cohorts", fault: "P0730" })).rows.map(
        (r) => r.id,
      ),
    );
    const stored = await one<{ n: number }>(
      "select count(*) as n from cell_stats where organisation_id = ? and fault_key = 'dtc:P0730'",
      [scopes.northgate!.organisationId],
    );
    expect(north.rows.flatMap((r) => r.cells).length).toBe(Number(stored.n));
    expect(tideLabels.size).toBeGreaterThan(0);
  });
});

describe("getPatternOptions", () => {
  test("lists the cohorts and faults of the organisation's cells, busiest fault first", async () => {
    const options = await getPatternOptions(db, scopes.tidewater!);
    expect(options.cohorts).toContainEqual({ make: "Aurel", model: "Merlin", generation: "M2" });
    const events = options.faults.map((f) => f.events);
    expect(events).toEqual([...events].sort((a, b) => b - a));
    expect(options.faults.find((f) => f.value === "P0730")?.label).toMatch(/^P0730 /);
  });
});

describe("getCellDetail", () => {
  test("a fuel-vapour fault's drill-down carries the fuel-vapour caution; a hybrid cohort adds high voltage", async () => {
    const tide = scopes.tidewater!;
    const map = await getHeatmap(db, tide, { view: "cohorts", fault: "P0496" });
    const k2 = map.rows.find((r) => r.label === "Aurel Kestrel K2")!;
    const cell = k2.cells.sort((a, b) => b.events - a.events)[0]!;
    const key = {
      make: "Aurel",
      model: "Kestrel",
      generation: "K2",
      band: cell.bandIndex,
      fault: "P0496",
    };
    const detail = await getCellDetail(db, tide, key);
    // P0496's usual component is the purge valve (reference data), whose work is fuel-vapour work.
    expect(detail!.cautions.map((c) => c.kind)).toEqual(["fuel-vapour"]);
    await db.run(
      sql`update generations set powertrain = 'hybrid' where organisation_id = ${tide.organisationId} and label = 'K2'`,
    );
    try {
      const hybrid = await getCellDetail(db, tide, key);
      expect(hybrid!.cautions.map((c) => c.kind)).toEqual(["high-voltage", "fuel-vapour"]);
    } finally {
      await db.run(
        sql`update generations set powertrain = null where organisation_id = ${tide.organisationId} and label = 'K2'`,
      );
    }
  });

  test("the drill-down's repair lines are the cell's events; totals add up", async () => {
    const tide = scopes.tidewater!;
    const map = await getHeatmap(db, tide, { view: "cohorts", fault: "P0730" });
    const m2 = map.rows.find((r) => r.label === "Aurel Merlin M2")!;
    const cell = m2.cells.filter((c) => c.isSignal).sort((a, b) => b.events - a.events)[0]!;
    const detail = await getCellDetail(db, tide, {
      make: "Aurel",
      model: "Merlin",
      generation: "M2",
      band: cell.bandIndex,
      fault: "P0730",
    });
    expect(detail).not.toBeNull();
    const d = detail!;
    expect(d.cell.events).toBe(cell.events);
    expect(d.lines.length).toBe(cell.events);
    expect(d.vehicles.length).toBe(cell.vehiclesAffected);
    expect(d.vehicles.reduce((s, v) => s + v.repairs, 0)).toBe(d.lines.length);
    expect(d.totals.costCents).toBe(d.lines.reduce((s, l) => s + l.costCents, 0));
    for (const l of d.lines) {
      expect(l.dtcCodes).toContain("P0730");
      expect(l.odometerMi).toBeGreaterThanOrEqual(cell.bandFromMi);
      expect(l.odometerMi).toBeLessThan(cell.bandToMi);
    }
    // The MCF is a non-decreasing step function with its limits around it.
    const points = d.mcf.points;
    expect(points.length).toBeGreaterThan(0);
    for (let i = 1; i < points.length; i++) {
      expect(points[i]!.mcf).toBeGreaterThanOrEqual(points[i - 1]!.mcf);
      expect(points[i]!.at).toBeGreaterThanOrEqual(points[i - 1]!.at);
    }
    for (const p of points) {
      expect(p.lower).toBeLessThanOrEqual(p.mcf);
      expect(p.upper).toBeGreaterThanOrEqual(p.mcf);
    }
  });

  test("a period or a vendor narrows the repair lines, the totals and the statistics alike", async () => {
    const tide = scopes.tidewater!;
    const key = { make: "Aurel", model: "Merlin", generation: "M2", band: 6, fault: "P0730" };
    const all = (await getCellDetail(db, tide, key))!;
    expect(all.isFiltered).toBe(false);
    expect(all.isViewStats).toBe(false);
    const dates = all.lines.map((l) => l.openedOn).sort();
    const middle = dates[Math.floor(dates.length / 2)]!;
    const later = (await getCellDetail(db, tide, { ...key, from: middle }))!;
    expect(later.isFiltered).toBe(true);
    expect(later.isViewStats).toBe(true);
    expect(later.lines.length).toBe(dates.filter((d) => d >= middle).length);
    expect(later.lines.length).toBeLessThan(all.lines.length);
    // The statistics are the explorer's for the same view, and count the same repair lines.
    const viewId = await ensureCellView(db, tide, { from: middle });
    const map = await getHeatmap(db, tide, { view: "cohorts", fault: "P0730", viewId });
    const viewCell = map.rows
      .find((r) => r.label === "Aurel Merlin M2")!
      .cells.find((c) => c.bandIndex === 6);
    expect(later.cell).toEqual(viewCell);
    expect(later.cell.events).toBe(later.lines.length);
    expect(later.cell.exposureMi).toBeLessThan(all.cell.exposureMi);
    const earlier = (await getCellDetail(db, tide, { ...key, to: middle }))!;
    expect(earlier.lines.every((l) => l.openedOn <= middle)).toBe(true);
    expect(earlier.cell.events).toBe(earlier.lines.length);
    expect(later.totals.costCents).toBe(later.lines.reduce((s, l) => s + l.costCents, 0));
    expect(all.vendors.length).toBeGreaterThan(0);
    const vendor = all.vendors[0]!;
    const one = (await getCellDetail(db, tide, { ...key, vendor: vendor.toUpperCase() }))!;
    expect(one.lines.length).toBe(all.lines.filter((l) => l.vendor === vendor).length);
    expect(one.lines.length).toBeGreaterThan(0);
    expect(one.cell.events).toBe(one.lines.length);
    // A period with no miles driven in it has no cells: the whole history answers, flagged.
    const none = (await getCellDetail(db, tide, { ...key, from: "1990-01-01", to: "1990-12-31" }))!;
    expect(none.isFiltered).toBe(true);
    expect(none.isViewStats).toBe(false);
    expect(none.cell).toEqual(all.cell);
    expect(none.lines).toEqual([]);
  });

  test("a cell of another organisation, or that does not exist, is null", async () => {
    const key = { make: "Aurel", model: "Merlin", generation: "M2", band: 6, fault: "P0730" };
    expect(await getCellDetail(db, scopes.tidewater!, key)).not.toBeNull();
    expect(await getCellDetail(db, scopes.northgate!, key)).toBeNull();
    expect(await getCellDetail(db, scopes.tidewater!, { ...key, band: 999 })).toBeNull();
  });

  test("a scope without the capability is refused", async () => {
    const none = { ...scopes.tidewater!, role: "nobody" } as unknown as OrgScope;
    await expect(getHeatmap(db, none, { view: "cohorts" })).rejects.toBeInstanceOf(ForbiddenError);
  });
});
