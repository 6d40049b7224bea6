import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { ensureCellView } from "@/db/queries/cell-views";
import { listRankedCells } from "@/db/queries/cells";
import { getHeatmap } from "@/db/queries/patterns";
import type { OrgScope } from "@/db/queries/scope";
import { findOrganisationBySlug } from "@/db/queries/system";
import { loadDemo } from "@/db/seed/demo";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { CellQuery } from "@/lib/cell-request";
import { rows } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

// Filtered views of the explorer: repairs in a period, or by one vendor (db/queries/cell-views.ts).
let db: Db;
let scope: OrgScope;

beforeAll(async () => {
  ({ db } = await createTestDb());
  await loadDemo(db);
  const org = await findOrganisationBySlug(db, "tidewater");
  scope = { organisationId: org.id, userId: null, role: "viewer" };
  await recomputeOrganisation(db, org.id);
}, 120_000);

/** Every cell of the "all faults" heatmap, by cohort and band. */
async function allFaults(viewId: number | null) {
  const { rows: heat } = await getHeatmap(db, scope, { view: "cohorts", viewId });
  const out = new Map<string, { events: number; exposure: number }>();
  for (const r of heat) {
    for (const c of r.cells)
      out.set(`${r.id}|${c.bandIndex}`, { events: c.events, exposure: c.exposureMi });
  }
  return out;
}

describe("filtered views of the cells", () => {
  test("a period covering all the data gives the run's own cells", async () => {
    const [span] = await rows<{ first: string; last: string }>(
      db,
      "select min(opened_on) as first, max(opened_on) as last from repair_orders where organisation_id = ?",
      [scope.organisationId],
    );
    const viewId = await ensureCellView(db, scope, { from: "1990-01-01", to: "2100-12-31" });
    expect(viewId).not.toBeNull();
    const wide = await listRankedCells(db, scope, { limit: 1000, viewId });
    const run = await listRankedCells(db, scope, { limit: 1000 });
    expect(wide.total).toBe(run.total);
    expect(wide.cells).toEqual(run.cells);
    // The period really covers every repair.
    expect(span && span.first >= "1990-01-01" && span.last <= "2100-12-31").toBe(true);
    // Asked again, the same view answers (computed once).
    expect(await ensureCellView(db, scope, { from: "1990-01-01", to: "2100-12-31" })).toBe(viewId);
  });

  test("two periods that meet add up to the whole: events exactly, exposure to the mile", async () => {
    const whole = await allFaults(null);
    const early = await allFaults(await ensureCellView(db, scope, { to: "2024-06-30" }));
    const late = await allFaults(await ensureCellView(db, scope, { from: "2024-07-01" }));
    let events = 0;
    for (const [key, w] of whole) {
      const a = early.get(key) ?? { events: 0, exposure: 0 };
      const b = late.get(key) ?? { events: 0, exposure: 0 };
      expect(a.events + b.events).toBe(w.events);
      expect(Math.abs(a.exposure + b.exposure - w.exposure)).toBeLessThan(1);
      events += a.events;
    }
    // The early view counts exactly the failure lines opened by then (with a band and a fault).
    const [n] = await rows<{ n: number }>(
      db,
      `select count(*) as n from repair_lines where organisation_id = ? and opened_on <= '2024-06-30'
          and odometer_mi is not null and kind = 'failure' and (component_id is not null or dtc_codes is not null)`,
      [scope.organisationId],
    );
    expect(events).toBe(n?.n);
    expect(events).toBeGreaterThan(0);
  });

  test("a vendor's view counts that vendor's repairs against the same exposure", async () => {
    const [top] = await rows<{ vendor: string; n: number }>(
      db,
      `select vendor, count(*) as n from repair_lines where organisation_id = ? and vendor is not null
          and odometer_mi is not null and kind = 'failure' and (component_id is not null or dtc_codes is not null)
        group by vendor order by n desc limit 1`,
      [scope.organisationId],
    );
    expect(top).toBeDefined();
    const whole = await allFaults(null);
    const byVendor = await allFaults(
      await ensureCellView(db, scope, { vendor: top!.vendor.toUpperCase() }),
    );
    let events = 0;
    for (const [key, v] of byVendor) {
      events += v.events;
      expect(v.exposure).toBeCloseTo(whole.get(key)!.exposure, 6);
    }
    expect(events).toBe(top!.n);
  });

  test("a new run replaces the views; a period that ends before it starts is refused", async () => {
    const viewId = await ensureCellView(db, scope, { to: "2024-06-30" });
    await recomputeOrganisation(db, scope.organisationId);
    const [left] = await rows<{ n: number }>(
      db,
      "select count(*) as n from cell_view_stats where view_id = ?",
      [viewId!],
    );
    expect(left?.n).toBe(0);
    expect(await ensureCellView(db, scope, {})).toBeNull();
    const bad = CellQuery.safeParse({ from: "2024-05-01", to: "2024-04-01" });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0]?.message).toMatch(/ends before it starts/);
  });
});
