import { readFileSync } from "node:fs";
import { join } from "node:path";
import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { listRankedCells } from "@/db/queries/cells";
import { getLookup } from "@/db/queries/lookup";
import type { OrgScope } from "@/db/queries/scope";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { generateRealShapedFleet, PLANTED } from "../../fixtures/real-shaped/generate";
import { importText, setUpOrganisation } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

// A fleet shaped like a real export (tests/fixtures/real-shaped): mostly scheduled service,
// wear at normal rates, rare failures, day-first dates, thousands separators, the export's own
// spellings of components; one planted failure pattern and one cohort with premature pad wear.
const DIR = join(process.cwd(), "tests/fixtures/real-shaped");
const FILES = ["generations", "vehicles", "repairs"] as const;

let db: Db;
let fleet: OrgScope;

const isPlantedFailure = (c: {
  make: string;
  model: string;
  generation: string;
  bandFrom: number;
  component: string | null;
  dtc: string | null;
}) =>
  c.make === PLANTED.failure.make &&
  c.model === PLANTED.failure.model &&
  c.generation === PLANTED.failure.generation &&
  c.bandFrom === PLANTED.failure.fromMi &&
  (c.component === "transmission/shift-solenoids" || c.dtc === "P0750");

beforeAll(async () => {
  ({ db } = await createTestDb());
  fleet = await setUpOrganisation(db, "real-shaped");
  for (const kind of FILES) {
    const { result } = await importText(db, fleet, kind, readFileSync(join(DIR, `${kind}.csv`)), {
      name: `${kind}.csv`,
    });
    expect(result.status, kind).toBe("done");
    expect(result.rowsRejected, kind).toBe(0);
  }
  await recomputeOrganisation(db, fleet.organisationId);
}, 120_000);

describe("a fleet shaped like a real export", () => {
  test("the committed files are what the generator makes (fixed seed)", () => {
    const fleetFiles = generateRealShapedFleet();
    for (const kind of FILES) {
      expect(readFileSync(join(DIR, `${kind}.csv`), "utf8"), kind).toBe(fleetFiles[kind]);
    }
  });

  test("most lines are scheduled service, read from the export's own words and spellings", async () => {
    const kinds = await db.all<{ kind: string; n: number; unmatched: number }>(sql`
      select kind, count(*) as n, sum(component_id is null) as unmatched from repair_lines
       where organisation_id = ${fleet.organisationId} group by kind`);
    const count = (k: string) => Number(kinds.find((r) => r.kind === k)?.n ?? 0);
    const total = count("service") + count("wear") + count("failure");
    expect(count("service") / total).toBeGreaterThan(0.6);
    expect(count("wear")).toBeGreaterThan(count("failure"));
    // Day-first dates: "01/03/2022" is 1 March 2022; "4,742" miles is 4742.
    const [first] = await db.all<{ opened_on: string; odometer_mi: number }>(sql`
      select l.opened_on, l.odometer_mi from repair_lines l join repair_orders o on o.id = l.repair_order_id
       where l.organisation_id = ${fleet.organisationId} and o.ro_number = 'WO40001' limit 1`);
    expect(first).toEqual({ opened_on: "2022-03-01", odometer_mi: 4742 });
    expect(kinds.reduce((s, r) => s + Number(r.unmatched), 0)).toBe(0);
  });

  test("no service component among the cells or the signals", async () => {
    const [cells] = await db.all<{ n: number; service: number }>(sql`
      select count(*) as n,
             sum(c.kind = 'service' or coalesce(k.kind, 'failure') = 'service') as service
        from cell_stats c left join components k on k.id = c.component_id
       where c.organisation_id = ${fleet.organisationId}`);
    expect(Number(cells!.n)).toBeGreaterThan(0);
    expect(Number(cells!.service)).toBe(0);
    const [signals] = await db.all<{ n: number }>(sql`
      select count(*) as n from signals s
       where s.organisation_id = ${fleet.organisationId}
         and (s.kind not in ('failure', 'wear') or s.fault_key like '%oil-service%'
              or s.fault_key like 'component:inspection/%' or s.fault_key like '%tyres-wheels/rotation%')`);
    expect(Number(signals!.n)).toBe(0);
  });

  test("the planted failure is the top signal, and the only failure signals are that pattern", async () => {
    const { cells } = await listRankedCells(db, fleet, { limit: 5 });
    expect(cells[0]!.kind).toBe("failure");
    expect(isPlantedFailure(cells[0]!), JSON.stringify(cells[0])).toBe(true);
    expect(cells[0]!.signal).toBe(true);
    const { cells: signals } = await listRankedCells(db, fleet, {
      isSignalOnly: true,
      limit: 100,
    });
    expect(signals.length).toBeGreaterThan(0);
    for (const s of signals) expect(isPlantedFailure(s), JSON.stringify(s)).toBe(true);
  });

  test("premature pad wear is found in the wear view and not among the failures", async () => {
    const { cells: wear } = await listRankedCells(db, fleet, {
      kind: "wear",
      isSignalOnly: true,
      limit: 100,
    });
    expect(wear.length).toBeGreaterThan(0);
    for (const c of wear) {
      expect(c.kind).toBe("wear");
      expect(`${c.make} ${c.model} ${c.generation}`).toBe("Brindle Tern T1");
      expect(c.component).toBe("brakes/front-pads");
    }
    const { cells: failures } = await listRankedCells(db, fleet, { limit: 1000 });
    expect(failures.some((c) => c.component?.startsWith("brakes/"))).toBe(false);
    expect(failures.every((c) => c.kind === "failure")).toBe(true);
  });

  test("the lookup's first cause for the planted cohort in its band, with no codes, is the planted failure", async () => {
    const technician = { ...fleet, role: "technician" as const };
    const result = await getLookup(db, technician, {
      unit: "MV-001",
      odometer: 60_000,
      codes: [],
      symptom: null,
    });
    expect(result.found).toBe(true);
    if (!result.found) return;
    expect(result.band?.fromMi).toBe(PLANTED.failure.fromMi);
    const first = result.causes[0]!;
    expect(first.component?.slug ?? first.title).toBe("transmission/shift-solenoids");
    const slugs = result.causes.map((c) => c.component?.slug ?? "");
    for (const service of ["engine-mechanical/oil-service", "inspection/scheduled-inspection"])
      expect(slugs).not.toContain(service);
  });
});
