import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { listImportRejects } from "@/db/queries/imports";
import type { OrgScope } from "@/db/queries/scope";
import { importText, rows, scratch, setUpOrganisation } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

/**
 * Odometer plausibility while importing (jobs/import/odometer-checks.ts, Recurra's thresholds):
 * a doubtful reading is a warning on its row, and the row is still imported.
 */

process.env.RECURRA_DATA_DIR = scratch;

let db: Db;
let scope: OrgScope;

beforeAll(async () => {
  ({ db } = await createTestDb());
  scope = await setUpOrganisation(db, "odometer-checks");
});

describe("odometer warnings", () => {
  test("judged against the stored reading and the file's own, by date; warned rows still land", async () => {
    await importText(
      db,
      scope,
      "repairs",
      ["RO number,Unit,Opened,Odometer,Complaint", "W-1,U-1,2025-05-01,170000,Noise"].join("\n"),
    );
    const fuel = [
      "unit,filled_at,odometer,volume,station",
      "U-1,2025-06-01 08:00,1200,40,Harbour Rd",
      "U-1,2025-06-05 08:00,170400,40,Harbour Rd",
      "U-2,2025-06-01 08:00,30000,40,Harbour Rd",
      "U-2,2025-06-02 08:00,31600,40,Harbour Rd",
      "U-2,2025-06-12 08:00,32500,40,Harbour Rd",
    ].join("\n");
    const { importId, result } = await importText(db, scope, "fuel", fuel);
    expect(result).toMatchObject({ status: "done", rowsImported: 5, rowsWarning: 2 });
    const warnings = await listImportRejects(db, scope, importId, {
      page: 1,
      pageSize: 50,
      severity: "warning",
    });
    expect(warnings.rows.map((w) => [w.rowNumber, w.column, w.reason])).toEqual([
      [
        2,
        "odometer",
        "odometer goes backwards: 1,200 mi on 2025-06-01, below 170,000 mi on 2025-05-01",
      ],
      [5, "odometer", "odometer implies 1,600 mi a day since 30,000 mi on 2025-06-01"],
    ]);
    const landed = await rows<{ n: number }>(
      db,
      "select count(*) as n from fuel_transactions where import_id = ? and odometer_mi in (1200, 31600)",
      [importId],
    );
    expect(Number(landed[0]?.n)).toBe(2);
  });
});
