import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import {
  cancelImport,
  DuplicateFileError,
  getImport,
  listImportRejects,
  undoImport,
} from "@/db/queries/imports";
import type { OrgScope } from "@/db/queries/scope";
import { UploadTooLargeError } from "@/jobs/import/storage";
import { importText, rows, scratch, setUpOrganisation, upload } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

process.env.RECURRA_DATA_DIR = scratch;

let db: Db;
let scope: OrgScope;

const HEADER =
  "RO number,Unit,Opened,Odometer,Complaint,Cause,Correction,DTC codes,Component,Labor hours,Parts cost,Labor cost,Make,Model,Year";

beforeAll(async () => {
  ({ db } = await createTestDb());
  scope = await setUpOrganisation(db, "pipeline");
});

const count = async (table: string) =>
  Number(
    (
      await rows<{ n: number }>(
        db,
        `select count(*) as n from ${table} where organisation_id = ?`,
        [scope.organisationId],
      )
    )[0]?.n,
  );

describe("repairs import, end to end", () => {
  const file = [
    HEADER,
    "A-1,U-1,2025-03-01,41000,Stalls after filling up,Purge valve stuck open,Replaced purge valve,P0496;P0441,fuel-vapour/purge-valve,1.2,84.50,150.00,,,",
    "A-1,U-1,2025-03-01,41000,Engine lamp on,,Cleared codes,,,0.2,0,25,,,",
    "A-2,NEW-9,2025-03-02,1200,Won't crank,Flat battery,Replaced battery,P0562,,0.5,120,60,Aurel,Merlin,2021",
    "A-3,NOPE,2025-03-03,5000,Noise,,,,,,,,,,",
    "A-4,U-2,2024-02-31,50000,Noise,,,,,,,,,,",
    "A-5,U-2,2025-03-05,-10,Noise,,,,,,,,,,",
    "A-6,U-3,2025-03-06,30000,Rough idle,,,X0300 P99999 P0300,,,,,,,",
    '"=HYPERLINK(""http://example.invalid"")",U-3,2025-03-07,30100,"Rattle, with ""quotes""',
    'over two lines",,,,,,,,,,',
    "A-1,U-1,2025-03-01,41000,Stalls after filling up,Purge valve stuck open,Replaced purge valve,P0496;P0441,fuel-vapour/purge-valve,1.2,84.50,150.00,,,",
    "",
    "A-7,U-1,2025-04-01,41900,Squeal from brakes,,Pads,,,,,,,,,extra,trailing",
  ].join("\r\n");

  test("lands whole, counts every row, and reports each rejected one", async () => {
    const before = await count("repair_lines");
    const { importId, result } = await importText(db, scope, "repairs", file, {
      name: "march.csv",
    });
    expect(result.status).toBe("done");
    // 10 data rows (the blank line is not a row): 4 rejected (A-7 has two fields too many),
    // 1 duplicate in the file, 5 lines in.
    expect(result).toMatchObject({
      rowsTotal: 10,
      rowsRejected: 4,
      rowsDuplicate: 1,
      rowsImported: 5,
      vehiclesCreated: 1,
    });
    expect((await count("repair_lines")) - before).toBe(5);
    const rejects = await listImportRejects(db, scope, importId, {
      page: 1,
      pageSize: 50,
      severity: "rejected",
    });
    expect(rejects.rows.map((r) => [r.rowNumber, r.column])).toEqual([
      [5, "unit_number"],
      [6, "opened_on"],
      [7, "odometer"],
      [12, ""],
    ]);
    expect(rejects.rows[0]?.reason).toMatch(/unknown vehicle NOPE/);
    expect(rejects.rows[1]?.reason).toMatch(/2024-02-31|not a date/);
    expect(rejects.rows[3]?.reason).toBe("row has 17 fields, the header has 15");
    const warnings = await listImportRejects(db, scope, importId, {
      page: 1,
      pageSize: 50,
      severity: "warning",
    });
    const reasons = warnings.rows.map((w) => w.reason).join(" | ");
    expect(reasons).toMatch(/X0300/);
    expect(reasons).toMatch(/P99999/);
    // Lines of one RO share the order; DTC lists become one code row each; bad codes left out.
    const lines = await rows<{
      ro: string;
      line_no: number;
      dtc_codes: string | null;
      component_id: number | null;
    }>(
      db,
      `select o.ro_number as ro, l.line_no, l.dtc_codes, l.component_id from repair_lines l
         join repair_orders o on o.id = l.repair_order_id where o.import_id = ? order by o.ro_number, l.line_no`,
      [importId],
    );
    expect(lines.filter((l) => l.ro === "A-1").map((l) => l.line_no)).toEqual([1, 2]);
    expect(lines.find((l) => l.ro === "A-6")?.dtc_codes).toBe("P0300");
    expect(lines.find((l) => l.ro === "A-1")?.component_id).not.toBeNull();
    const codes = await rows<{ dtc: string }>(
      db,
      "select dtc from repair_line_codes where repair_line_id in (select id from repair_lines where import_id = ?) order by dtc",
      [importId],
    );
    expect(codes.map((c) => c.dtc)).toEqual(["P0300", "P0441", "P0496", "P0562"]);
    // A formula-like cell is kept as plain text; a quoted newline stays inside its cell.
    const formula = await rows<{ complaint: string }>(
      db,
      "select l.complaint from repair_lines l join repair_orders o on o.id = l.repair_order_id where o.ro_number like '=HYPERLINK%'",
    );
    // The file's own line ending (CRLF here) stays inside the cell as written.
    expect(formula[0]?.complaint).toBe('Rattle, with "quotes"\r\nover two lines');
    // A recompute of the statistics is queued by the same atomic step.
    expect((await rows(db, "select id from jobs where kind = 'recompute'")).length).toBeGreaterThan(
      0,
    );
  });

  test("the same file again is recognised and not loaded twice; after undo it can come back", async () => {
    const again = upload(db, scope, "repairs", "march-again.csv", file);
    await expect(again).rejects.toBeInstanceOf(DuplicateFileError);
    await expect(again).rejects.toThrow(/already imported on \d{4}-\d{2}-\d{2}/);
    const [done] = await rows<{ id: number }>(
      db,
      "select id from imports where file_name = 'march.csv'",
    );
    const linesBefore = await count("repair_lines");
    const vehiclesBefore = await count("vehicles");
    await undoImport(db, scope, Number(done?.id));
    expect(linesBefore - (await count("repair_lines"))).toBe(5);
    expect(vehiclesBefore - (await count("vehicles"))).toBe(1); // NEW-9, created by the import
    expect(await count("repair_line_codes")).toBe(0);
    expect((await getImport(db, scope, Number(done?.id))).status).toBe("undone");
    const { result } = await importText(db, scope, "repairs", file, { name: "march.csv" });
    expect(result).toMatchObject({ status: "done", rowsImported: 5 });
  });

  test("an RO already in the data is skipped as a duplicate by a different file", async () => {
    const overlap = [
      HEADER,
      "A-2,NEW-9,2025-03-02,1200,Won't crank,,,,,,,,,,",
      "A-8,U-2,2025-05-01,52000,Noise,,,,,,,,,,",
    ].join("\n");
    const { result } = await importText(db, scope, "repairs", overlap);
    expect(result).toMatchObject({
      status: "done",
      rowsTotal: 2,
      rowsImported: 1,
      rowsDuplicate: 1,
    });
  });
});

describe("fault, fuel, vehicle, part and generation imports", () => {
  test("fault events: duplicates by vehicle, moment and code; a bad single DTC rejects the row", async () => {
    const faults = [
      "unit_number,occurred_at,odometer,dtc,mil_on,status",
      "U-1,2025-06-01 08:00,42000,P0441,yes,confirmed",
      "U-1,2025-06-01 08:00,42000,P0441,yes,confirmed",
      "U-1,2025-06-01 08:00,42000,P0496,no,pending",
      "U-2,2025-06-02 09:30,52100,X0300,no,pending",
    ].join("\n");
    const { result } = await importText(db, scope, "faults", faults);
    expect(result).toMatchObject({
      status: "done",
      rowsTotal: 4,
      rowsImported: 2,
      rowsDuplicate: 1,
      rowsRejected: 1,
    });
  });

  test("fuel: litres from US gallons (NIST SP 811: 1 US gal = 3.785411784 L), km to miles", async () => {
    const fuel = [
      "unit,filled_at,odometer (km),volume,volume_unit,price_total,station",
      "U-3,2025-06-03 07:15,50000,10,US gal,41.20,Harbour Rd",
    ].join("\n");
    const { importId, result } = await importText(db, scope, "fuel", fuel);
    expect(result.status).toBe("done");
    const [row] = await rows<{ volume_l: number; odometer_mi: number; price_total_cents: number }>(
      db,
      "select volume_l, odometer_mi, price_total_cents from fuel_transactions where import_id = ?",
      [importId],
    );
    expect(row?.volume_l).toBeCloseTo(37.85411784, 8);
    expect(row?.odometer_mi).toBeCloseTo(50000 / 1.609344, 6); // NIST SP 811: 1 mi = 1.609344 km
    expect(row?.price_total_cents).toBe(4120);
  });

  test("parts: new parts added, existing ones updated, and undo restores the previous stock", async () => {
    const first = [
      "part_number,description,on_hand,unit_cost,lead_time_days",
      "PV-100,Purge valve,4,38.90,3",
      "BR-200,Brake pads front,10,22.00,2",
    ].join("\n");
    await importText(db, scope, "parts", first);
    const second = [
      "part_number,description,on_hand,unit_cost,lead_time_days",
      "PV-100,Purge valve,1,39.50,3",
      "FU-300,Accessory fuse 15A,50,0.40,1",
    ].join("\n");
    const { importId, result } = await importText(db, scope, "parts", second);
    expect(result).toMatchObject({ status: "done", rowsImported: 2 });
    const stock = async () =>
      Object.fromEntries(
        (
          await rows<{ part_number: string; on_hand: number }>(
            db,
            "select part_number, on_hand from parts where organisation_id = ? order by part_number",
            [scope.organisationId],
          )
        ).map((r) => [r.part_number, r.on_hand]),
      );
    expect(await stock()).toEqual({ "BR-200": 10, "FU-300": 50, "PV-100": 1 });
    await undoImport(db, scope, importId);
    expect(await stock()).toEqual({ "BR-200": 10, "PV-100": 4 });
  });

  test("generations: the catalogue is matched to vehicles, and undo takes it back", async () => {
    const gens = ["make,model,generation,year_from,year_to", "Aurel,Kestrel,K2,2014,2019"].join(
      "\n",
    );
    const { importId } = await importText(db, scope, "generations", gens);
    const matched = async () =>
      Number(
        (
          await rows<{ n: number }>(
            db,
            "select count(*) as n from vehicles where organisation_id = ? and generation_id is not null",
            [scope.organisationId],
          )
        )[0]?.n,
      );
    expect(await matched()).toBe(3); // U-1..U-3 are 2016 Kestrels
    await undoImport(db, scope, importId);
    expect(await matched()).toBe(0);
  });

  test("vehicle roster: new vehicles added, known ones counted as duplicates, VIN problems reported", async () => {
    const roster = [
      "unit_number,vin,make,model,model_year,odometer",
      "U-1,,Aurel,Kestrel,2016,45000",
      "R-1,1M8GDM9AXKP042788,Brindle,Tern,2019,12000",
      "R-2,1M8GDM9ABKP042788,Brindle,Tern,2019,9000",
      "R-3,11111111111111111,Brindle,Tern,2020,100",
      "R-4,1M8GDM9OXKP042788,Brindle,Tern,2020,100",
    ].join("\n");
    const { importId, result } = await importText(db, scope, "vehicles", roster);
    expect(result).toMatchObject({
      status: "done",
      rowsTotal: 5,
      rowsImported: 4,
      rowsDuplicate: 1,
    });
    const warnings = await listImportRejects(db, scope, importId, {
      page: 1,
      pageSize: 50,
      severity: "warning",
    });
    const text = warnings.rows.map((w) => `${w.rowNumber}:${w.reason}`).join(" | ");
    // 49 CFR 565: wrong check digit is a warning; a placeholder is flagged; O is never in a VIN.
    expect(text).toMatch(/4:.*check digit/i);
    expect(text).toMatch(/5:.*placeholder/i);
    expect(text).toMatch(/6:.*(I, O|O)/);
  });
});

describe("characters cut between two chunks of the file", () => {
  test("a four-byte character across the 64 KiB read boundary arrives whole", async () => {
    // The file is read in chunks of 64 KiB (Node's default for file streams): the wrench emoji
    // (U+1F527, four bytes in UTF-8) starts two bytes before the first boundary.
    const rows1 = [HEADER];
    for (let i = 0; Buffer.byteLength(rows1.join("\n")) < 65_000; i++) {
      rows1.push(`W-${i},U-1,2025-02-01,${3000 + i},Noise,,,,,,,,,,`);
    }
    const head = `${rows1.join("\n")}\nW-x,U-1,2025-02-02,4000,Caf\u00e9 `;
    const pad = "x".repeat(65_534 - Buffer.byteLength(head));
    const complaint = `Caf\u00e9 ${pad}\u{1F527} rattle`;
    const text = `${rows1.join("\n")}\nW-x,U-1,2025-02-02,4000,${complaint},,,,,,,,,,\n`;
    expect(Buffer.from(text).subarray(65_534, 65_538)).toEqual(Buffer.from("\u{1F527}"));
    const { importId, result } = await importText(db, scope, "repairs", text);
    expect(result).toMatchObject({ status: "done", rowsTotal: rows1.length, rowsRejected: 0 });
    const [line] = await rows<{ complaint: string }>(
      db,
      "select l.complaint from repair_lines l join repair_orders o on o.id = l.repair_order_id where o.ro_number = 'W-x' and l.import_id = ?",
      [importId],
    );
    expect(line?.complaint).toBe(complaint);
  });
});

describe("bad files: a clear message and nothing partial", () => {
  const expectNothingNew = async (fn: () => Promise<unknown>) => {
    const before = await count("repair_lines");
    await fn();
    expect(await count("repair_lines")).toBe(before);
    expect(
      Number((await rows<{ n: number }>(db, "select count(*) as n from staged_repairs"))[0]?.n),
    ).toBe(0);
  };

  test.each([
    ["an empty file", "", /empty/i],
    [
      "binary garbage",
      Buffer.from([0x00, 0x01, 0x02, 0xff, 0xfe, 0x00, 0x10, 0x80, 0x00, 0x00]),
      /not text/i,
    ],
    [
      "Latin-1 text",
      Buffer.from("RO number,Unit,Opened\nA,U-1,2025-01-01,Caf\xe9\n", "latin1"),
      /UTF-8/,
    ],
    ["a PDF", Buffer.from("%PDF-1.7\n1 0 obj\n"), /PDF|not.*CSV|not text/i],
  ])("%s is refused at the mapping step", async (_name, content, message) => {
    await expectNothingNew(async () => {
      const { inspection } = await upload(
        db,
        scope,
        "repairs",
        `bad-${Math.random()}.csv`,
        content,
      );
      expect(inspection.problems.join(" ")).toMatch(message);
    });
  });

  test("a header with no rows, a missing required column and a duplicated header are explained", async () => {
    const headerOnly = await upload(db, scope, "repairs", "header-only.csv", `${HEADER}\n`);
    expect(headerOnly.inspection.notices.join(" ")).toMatch(/no data rows/);
    const missing = await upload(
      db,
      scope,
      "repairs",
      "missing.csv",
      "Unit,Opened,Complaint\nU-1,2025-01-01,Noise\n",
    );
    expect(missing.inspection.problems.join(" ")).toMatch(/RO number|ro_number/i);
    const twice = await upload(
      db,
      scope,
      "repairs",
      "twice.csv",
      "RO number,Unit,Opened,Odometer,Odometer\nA,U-1,2025-01-01,1,2\n",
    );
    expect(twice.inspection.problems.join(" ")).toMatch(/Odometer.*more than once/);
  });

  test("a fuel file offered as repairs is recognised", async () => {
    const fuel = await upload(
      db,
      scope,
      "repairs",
      "fuel-as-repairs.csv",
      "unit,filled_at,odometer,volume,price_total,station\nU-1,2025-01-01 10:00,100,30,50.00,X\n",
    );
    expect(fuel.inspection.notices.join(" ")).toMatch(/looks like fuel-card transactions/);
  });

  test("an unterminated quote fails the import cleanly; the file is kept", async () => {
    await expectNothingNew(async () => {
      const lines = [HEADER];
      for (let i = 0; i < 30; i++) lines.push(`Q-${i},U-1,2025-01-01,${1000 + i},Noise,,,,,,,,,,`);
      lines.push('Q-99,U-1,2025-01-02,2000,"Never closed,,,,,,,,,,');
      const { result } = await importText(db, scope, "repairs", lines.join("\n"));
      expect(result.status).toBe("failed");
      expect(result.error).toMatch(/never closed/);
    });
  });

  test("a single line of more than 1 MB fails the import cleanly", async () => {
    await expectNothingNew(async () => {
      const big = `${HEADER}\nB-1,U-1,2025-01-01,100,Noise,,,,,,,,,,\nB-2,U-1,2025-01-02,200,${"x".repeat(1_100_000)},,,,,,,,,,\n`;
      const { result } = await importText(db, scope, "repairs", big);
      expect(result.status).toBe("failed");
      expect(result.error).toMatch(/longer than 1,000,000 characters/);
    });
  });

  test("text that stops being UTF-8 past the inspected head fails the import cleanly", async () => {
    await expectNothingNew(async () => {
      // The mapping step reads the first 256 KB (jobs/import/storage.ts HEAD_BYTES); the
      // Latin-1 "é" (0xE9 alone is not UTF-8, Unicode §3.9) comes after that, while reading.
      const lines = [HEADER];
      for (let i = 0; lines.join("\n").length < 300_000; i++) {
        lines.push(`L-${i},U-1,2025-01-01,${1000 + i},Noise from the front,,,,,,,,,,`);
      }
      lines.push("L-last,U-1,2025-01-02,2000,Caf\xe9 smell,,,,,,,,,,");
      const { result } = await importText(
        db,
        scope,
        "repairs",
        Buffer.from(lines.join("\n"), "latin1"),
      );
      expect(result.status).toBe("failed");
      expect(result.error).toMatch(/not UTF-8/);
    });
  });

  test("a file over the size limit is refused while streaming, and nothing is kept", async () => {
    await db.$client.execute({
      sql: "update organisations set upload_limit_mb = 1 where id = ?",
      args: [scope.organisationId],
    });
    try {
      await expect(
        upload(
          db,
          scope,
          "repairs",
          "huge.csv",
          `${HEADER}\n${"Z,U-1,2025-01-01,1,x,,,,,,,,,,\n".repeat(80_000)}`,
        ),
      ).rejects.toBeInstanceOf(UploadTooLargeError);
      const { readdirSync } = await import("node:fs");
      const { join } = await import("node:path");
      const left = readdirSync(join(scratch, "uploads", String(scope.organisationId))).filter(
        (f) => f.includes("huge") || f.startsWith(".incoming"),
      );
      expect(left).toEqual([]);
    } finally {
      await db.$client.execute({
        sql: "update organisations set upload_limit_mb = 200 where id = ?",
        args: [scope.organisationId],
      });
    }
  });

  test("two uploads of the same file at once: one import, one clear refusal", async () => {
    const content = `${HEADER}\nC-1,U-1,2025-07-01,43000,Noise,,,,,,,,,,\n`;
    const results = await Promise.allSettled([
      upload(db, scope, "repairs", "same-1.csv", content),
      upload(db, scope, "repairs", "same-2.csv", content),
    ]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const refused = results.find((r) => r.status === "rejected") as PromiseRejectedResult;
    expect(refused.reason).toBeInstanceOf(DuplicateFileError);
  });

  test("a waiting import can be cancelled, and then uploaded again", async () => {
    const content = `${HEADER}\nD-1,U-1,2025-08-01,44000,Noise,,,,,,,,,,\n`;
    const { importId } = await upload(db, scope, "repairs", "cancel-me.csv", content);
    await cancelImport(db, scope, importId);
    expect((await getImport(db, scope, importId)).status).toBe("cancelled");
    await expect(upload(db, scope, "repairs", "cancel-me.csv", content)).resolves.toHaveProperty(
      "importId",
    );
  });
});

describe("after an import", () => {
  test("the queued recompute runs in a worker, merges repeats, and stores cells", async () => {
    const { startWorker } = await import("@/jobs/worker");
    const queued = await rows<{ id: number }>(
      db,
      "select id from jobs where kind = 'recompute' and status = 'queued' and organisation_id = ?",
      [scope.organisationId],
    );
    expect(queued.length).toBeGreaterThan(1);
    await startWorker({ db, isOneShot: true, log: () => {} });
    const left = await rows(
      db,
      "select id from jobs where kind = 'recompute' and status = 'queued'",
    );
    expect(left).toHaveLength(0);
    const runs = await rows<{ cells: number }>(
      db,
      "select cells from analysis_runs where organisation_id = ?",
      [scope.organisationId],
    );
    expect(runs).toHaveLength(1);
    expect(Number(runs[0]?.cells)).toBeGreaterThan(0);
    const cells = await rows<{ n: number }>(
      db,
      "select count(*) as n from cell_stats where organisation_id = ?",
      [scope.organisationId],
    );
    expect(Number(cells[0]?.n)).toBe(Number(runs[0]?.cells));
  });
});
