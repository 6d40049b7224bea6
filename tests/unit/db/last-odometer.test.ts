import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { startImport, undoImport } from "@/db/queries/imports";
import { getLookup, recordFinding } from "@/db/queries/lookup";
import type { OrgScope } from "@/db/queries/scope";
import { getVehicleTimeline } from "@/db/queries/vehicle-timeline";
import { getVehicle, listVehicles } from "@/db/queries/vehicles";
import { mappingByName } from "@/jobs/import/inspect";
import { runImport } from "@/jobs/import/run-import";
import { importText, rows, scratch, setUpOrganisation, upload } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

/**
 * A vehicle's last odometer reading is worked out from its records (db/queries/last-odometer.ts):
 * the latest-dated reading, the highest of that day. Runs on a file (the direct import path)
 * and, in `npm run test:server`, on a libSQL server (the staged path).
 */

process.env.RECURRA_DATA_DIR = scratch;

let db: Db;
let scope: OrgScope;

beforeAll(async () => {
  ({ db } = await createTestDb());
  scope = await setUpOrganisation(db, "odometer");
});

const REPAIRS = "RO number,Unit,Opened,Odometer,Complaint";
const FAULTS = "unit_number,occurred_at,odometer,dtc";
const FUEL = "unit,filled_at,odometer,volume,station";

const idOf = async (unit: string) =>
  Number(
    (
      await rows<{ id: number }>(
        db,
        "select id from vehicles where organisation_id = ? and unit_number = ?",
        [scope.organisationId, unit],
      )
    )[0]?.id,
  );

/** The vehicle's last reading as every screen that shows it reads it. */
async function shown(unit: string) {
  const id = await idOf(unit);
  const page = await getVehicle(db, scope, id);
  const timeline = await getVehicleTimeline(db, scope, id);
  const lookup = await getLookup(db, scope, { unit, codes: [], symptom: null });
  const list = await listVehicles(db, scope, { q: unit, page: 1, pageSize: 10 });
  const row = list.rows.find((r) => r.unitNumber === unit);
  return {
    page: [page?.lastOdometerMi, page?.lastOdometerOn],
    timeline: [timeline?.vehicle.lastOdometerMi, timeline?.vehicle.lastOdometerOn],
    lookup: [lookup.vehicle?.lastOdometerMi, lookup.vehicle?.lastOdometerOn],
    list: [row?.lastOdometerMi, row?.lastOdometerOn],
  };
}

const everywhere = (mi: number | null, on: string | null) => ({
  page: [mi, on],
  timeline: [mi, on],
  lookup: [mi, on],
  list: [mi, on],
});

describe("last odometer reading, from the records", () => {
  test("an import with a later, higher reading raises it", async () => {
    await importText(db, scope, "repairs", [REPAIRS, "L-1,U-1,2025-01-10,40000,Noise"].join("\n"));
    expect(await shown("U-1")).toEqual(everywhere(40_000, "2025-01-10"));
    await importText(
      db,
      scope,
      "fuel",
      [FUEL, "U-1,2025-02-01 08:00,41000,40,Harbour Rd"].join("\n"),
    );
    expect(await shown("U-1")).toEqual(everywhere(41_000, "2025-02-01"));
  });

  test("a later-dated but lower reading wins over an earlier, higher one", async () => {
    await importText(db, scope, "faults", [FAULTS, "U-2,2025-03-01 09:00,60000,P0300"].join("\n"));
    expect(await shown("U-2")).toEqual(everywhere(60_000, "2025-03-01"));
    await importText(db, scope, "faults", [FAULTS, "U-2,2025-04-01 09:00,58500,P0301"].join("\n"));
    expect(await shown("U-2")).toEqual(everywhere(58_500, "2025-04-01"));
  });

  test("within one file, the reading of the latest day wins (not the highest and the latest apart)", async () => {
    await importText(
      db,
      scope,
      "repairs",
      [REPAIRS, "L-2,U-3,2025-05-02,20000,Noise", "L-3,U-3,2025-05-01,30000,Noise"].join("\n"),
    );
    expect(await shown("U-3")).toEqual(everywhere(20_000, "2025-05-02"));
  });

  test("undo brings back the reading of the rows left, on the vehicle's page, the lookup and the list", async () => {
    const before = everywhere(41_000, "2025-02-01");
    expect(await shown("U-1")).toEqual(before);
    const { importId } = await importText(
      db,
      scope,
      "repairs",
      [REPAIRS, "L-4,U-1,2025-06-01,47000,Squeal"].join("\n"),
    );
    expect(await shown("U-1")).toEqual(everywhere(47_000, "2025-06-01"));
    await undoImport(db, scope, importId);
    expect(await shown("U-1")).toEqual(before);
  });

  test("the staged apply, in chunks, counts the import's rows once the last chunk marks it done", async () => {
    const file = [REPAIRS, "S-1,U-2,2025-07-01,59000,Noise", "S-2,U-2,2025-07-02,59100,Noise"];
    const { importId, inspection } = await upload(
      db,
      scope,
      "repairs",
      "staged.csv",
      file.join("\n"),
    );
    await startImport(db, scope, importId, {
      delimiter: inspection.delimiter,
      headers: inspection.headers,
      mapping: mappingByName(inspection.headers, inspection.mapping),
      read: inspection.read,
    });
    await runImport(db, importId, { isStagedOnFile: true, apply: { chunkRows: 1 } });
    expect(await shown("U-2")).toEqual(everywhere(59_100, "2025-07-02"));
    await undoImport(db, scope, importId);
    expect(await shown("U-2")).toEqual(everywhere(58_500, "2025-04-01"));
  });

  test("a roster import's reading, and its undo, for a vehicle with no other reading", async () => {
    const { importId } = await importText(
      db,
      scope,
      "vehicles",
      ["unit_number,make,model,model_year,odometer", "R-9,Aurel,Merlin,2021,12000"].join("\n"),
    );
    const today = new Date().toISOString().slice(0, 10);
    expect(await shown("R-9")).toEqual(everywhere(12_000, today));
    // Another record keeps the vehicle when the roster is undone; its reading is then the only one.
    await importText(db, scope, "faults", [FAULTS, "R-9,2024-12-01 10:00,11000,P0420"].join("\n"));
    await undoImport(db, scope, importId);
    expect(await shown("R-9")).toEqual(everywhere(11_000, "2024-12-01"));
  });

  test("a finding recorded today is the latest reading, even when lower", async () => {
    const id = await idOf("U-3");
    await recordFinding(db, scope, { vehicleId: id, outcome: "something-else", odometer: 19_000 });
    const today = new Date().toISOString().slice(0, 10);
    expect(await shown("U-3")).toEqual(everywhere(19_000, today));
  });
});
