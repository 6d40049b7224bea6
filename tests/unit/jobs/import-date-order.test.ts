import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import type { OrgScope } from "@/db/queries/scope";
import { inspectUpload, PREVIEW_ROWS, resolveDateFormat } from "@/jobs/import/inspect";
import { inspectStoredImport } from "@/jobs/import/upload";
import { importText, rows, scratch, setUpOrganisation, upload } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

/**
 * The order of a file's dates at the mapping step and at the start: decided by the file, or
 * chosen by the user, never guessed (jobs/import/inspect.ts resolveDateFormat, which the start
 * route and the command line use).
 */

process.env.RECURRA_DATA_DIR = scratch;

let db: Db;
let scope: OrgScope;

beforeAll(async () => {
  ({ db } = await createTestDb());
  scope = await setUpOrganisation(db, "date-order");
});

const HEADER = "RO number,Unit,Opened,Odometer,Complaint";
const inspect = (lines: string[]) =>
  inspectUpload(Buffer.from(lines.join("\n")), "repairs", { isTruncated: false });

describe("date order", () => {
  test("a file whose dates fit both orders cannot start until one is chosen", () => {
    const inspection = inspect([
      HEADER,
      "A-1,U-1,03/04/2025,41000,Noise",
      "A-2,U-1,05/06/2025,42000,Noise",
    ]);
    expect(inspection.dateOrder).toMatchObject({ status: "ask", isConflict: false });
    expect(resolveDateFormat(inspection, undefined)).toEqual({
      ok: false,
      message:
        "The dates in “Opened” (for example 03/04/2025 and 05/06/2025) fit both day/month/year and month/day/year. Choose the order.",
    });
    expect(resolveDateFormat(inspection, "dmy")).toEqual({ ok: true, dateFormat: "dmy" });
  });

  test("a day above 12 anywhere in the inspected head decides, beyond the preview's rows too", () => {
    const lines = [HEADER];
    for (let i = 0; i < 300; i++) lines.push(`B-${i},U-1,03/04/2025,${41000 + i},Noise`);
    lines.push("B-300,U-1,14/04/2025,41300,Noise");
    const inspection = inspect(lines);
    expect(inspection.sampleRows).toHaveLength(PREVIEW_ROWS);
    expect(inspection.dateOrder).toMatchObject({
      status: "decided",
      format: "dmy",
      sample: { column: "Opened", value: "14/04/2025" },
    });
    expect(inspection.read.dateFormat).toBe("dmy");
    expect(resolveDateFormat(inspection, undefined)).toEqual({ ok: true, dateFormat: "dmy" });
  });

  test("ISO dates never ask", () => {
    const inspection = inspect([HEADER, "C-1,U-1,2025-03-04,41000,Noise"]);
    expect(resolveDateFormat(inspection, undefined)).toEqual({ ok: true, dateFormat: "iso" });
  });

  test("the order is learnt from the columns mapped on screen", async () => {
    const file = ["RO number,Unit,Date In,Visit,Odometer", "E-1,U-2,2025-03-04,03/04/2025,52000"];
    const { importId, inspection } = await upload(
      db,
      scope,
      "repairs",
      "remap.csv",
      file.join("\n"),
    );
    expect(inspection.dateOrder).toEqual({ status: "iso" });
    const remapped = await inspectStoredImport(db, scope, importId, { opened_on: "Visit" });
    expect(remapped.dateOrder).toMatchObject({ status: "ask" });
  });

  test("the chosen order is the one the import reads with", async () => {
    const file = [HEADER, "F-1,U-3,03/04/2025,30000,Noise", "F-2,U-3,05/06/2025,30500,Noise"];
    const { importId, result } = await importText(db, scope, "repairs", file.join("\n"), {
      read: { dateFormat: "dmy" },
    });
    expect(result).toMatchObject({ status: "done", rowsImported: 2 });
    const dates = await rows<{ opened_on: string }>(
      db,
      "select opened_on from repair_orders where import_id = ? order by ro_number",
      [importId],
    );
    expect(dates.map((d) => d.opened_on)).toEqual(["2025-04-03", "2025-06-05"]);
  });
});
