import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { listImportRejects } from "@/db/queries/imports";
import type { OrgScope } from "@/db/queries/scope";
import { inspectUpload } from "@/jobs/import/inspect";
import { importText, rows, scratch, setUpOrganisation } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

/**
 * The shape of a file's rows, end to end: line endings and field counts, as the preview (the
 * head inspection) and the import read them.
 */

process.env.RECURRA_DATA_DIR = scratch;

let db: Db;
let scope: OrgScope;

beforeAll(async () => {
  ({ db } = await createTestDb());
  scope = await setUpOrganisation(db, "file-shape");
});

const issuesOf = async (importId: number) =>
  (await listImportRejects(db, scope, importId, { page: 1, pageSize: 50 })).rows.map((r) => [
    r.rowNumber,
    r.severity,
    r.column,
    r.reason,
  ]);

describe("line endings", () => {
  test("a lone CR inside a CRLF file ends a row, in the preview and in the import", async () => {
    const file =
      "RO number,Unit,Opened,Odometer\r\nC-1,U-1,2025-03-01,41000\rC-2,U-2,2025-03-02,52000\r\n";
    const inspection = inspectUpload(Buffer.from(file), "repairs", { isTruncated: false });
    expect(inspection.sampleRows).toEqual([
      ["C-1", "U-1", "2025-03-01", "41000"],
      ["C-2", "U-2", "2025-03-02", "52000"],
    ]);
    const { result, importId } = await importText(db, scope, "repairs", file);
    expect(result).toMatchObject({ status: "done", rowsTotal: 2, rowsImported: 2 });
    const orders = await rows<{ ro_number: string; odometer_mi: number }>(
      db,
      "select ro_number, odometer_mi from repair_orders where import_id = ? order by ro_number",
      [importId],
    );
    expect(orders).toEqual([
      { ro_number: "C-1", odometer_mi: 41_000 },
      { ro_number: "C-2", odometer_mi: 52_000 },
    ]);
  });
});

describe("field counts", () => {
  test("a row with a field too many is rejected; a short row is read with blanks and a warning", async () => {
    const file = [
      "RO number,Unit,Opened,Odometer,Complaint,Vendor",
      "F-1,U-1,2025-04-01,41500,Noise,North Bay",
      "F-2,U-1,2025-04-02,41600,Noise",
      "F-3,U-2,2025-04-03,52500,Noise,North Bay,stray",
      "F-4,U-3,2025-04-04,30000,Squeal,,",
    ].join("\n");
    const { result, importId } = await importText(db, scope, "repairs", file);
    expect(result).toMatchObject({
      status: "done",
      rowsTotal: 4,
      rowsImported: 2,
      rowsRejected: 2,
      rowsWarning: 1,
    });
    expect(await issuesOf(importId)).toEqual([
      [3, "warning", "", "row has 5 fields, the header has 6, read as blank"],
      [4, "rejected", "", "row has 7 fields, the header has 6"],
      [5, "rejected", "", "row has 7 fields, the header has 6"],
    ]);
    const [short] = await rows<{ vendor: string | null; complaint: string }>(
      db,
      "select o.vendor, l.complaint from repair_orders o join repair_lines l on l.repair_order_id = o.id where o.ro_number = 'F-2'",
    );
    expect(short).toEqual({ vendor: null, complaint: "Noise" });
  });
});
