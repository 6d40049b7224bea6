import { beforeAll, describe, expect, test } from "vitest";
import diagnostics_channel from "node:diagnostics_channel";
import { join } from "node:path";
import type { Db } from "@/db";
import { cancelImport, getImport, startImport } from "@/db/queries/imports";
import type { OrgScope } from "@/db/queries/scope";
import { mappingByName } from "@/jobs/import/inspect";
import { IMPORT_THREADS_CHANNEL, type ImportThreadsMessage } from "@/jobs/import/run-import";
import { ImportWriter } from "@/jobs/import/writer";
import { startWorker } from "@/jobs/worker";
import { importText, rows, scratch, setUpOrganisation, upload } from "../../support/import-helpers";
import { createTestDb, isServerRun } from "../../support/test-db";

process.env.RECURRA_DATA_DIR = scratch;

/**
 * The direct path of imports on a local database file (jobs/import/direct.ts): one write
 * transaction held by a writer thread. A libSQL server run uses the staging path instead.
 */
describe.skipIf(isServerRun())("imports in one transaction on a local file", () => {
  let db: Db;
  let dir: string;
  let scope: OrgScope;

  beforeAll(async () => {
    ({ db, dir } = await createTestDb());
    scope = await setUpOrganisation(db, "direct");
  });

  const HEADER = "RO number,Unit,Opened,Odometer,Complaint,DTC codes,Make,Model,Year";

  test("orders, lines, codes and new vehicles land with consistent references", async () => {
    // Lines of one RO apart from each other, a new vehicle named twice, DTC lists.
    const file = [
      HEADER,
      "D-1,U-1,2025-05-01,42000,Stalls after filling up,P0496 P0441,,,",
      "D-2,NEW-1,2025-05-02,900,No crank,,Aurel,Merlin,2022",
      "D-1,U-1,2025-05-01,42000,Lamp on,P0455,,,",
      "D-3,NEW-1,2025-06-02,2100,Noise,,Aurel,Merlin,2022",
      "D-1,U-1,2025-05-01,,Fuel smell,,,,",
    ].join("\n");
    const { importId, result } = await importText(db, scope, "repairs", file);
    expect(result).toMatchObject({
      status: "done",
      rowsTotal: 5,
      rowsImported: 5,
      vehiclesCreated: 1,
    });
    // The writer thread loads with per-row foreign-key checks off: integrity must hold anyway.
    expect(await rows(db, "pragma foreign_key_check")).toEqual([]);
    const lines = await rows<{ ro: string; line_no: number; odometer_mi: number; unit: string }>(
      db,
      `select o.ro_number as ro, l.line_no, l.odometer_mi, v.unit_number as unit
         from repair_lines l join repair_orders o on o.id = l.repair_order_id
         join vehicles v on v.id = l.vehicle_id
        where l.import_id = ? order by l.id`,
      [importId],
    );
    expect(lines).toEqual([
      { ro: "D-1", line_no: 1, odometer_mi: 42000, unit: "U-1" },
      { ro: "D-2", line_no: 1, odometer_mi: 900, unit: "NEW-1" },
      { ro: "D-1", line_no: 2, odometer_mi: 42000, unit: "U-1" },
      { ro: "D-3", line_no: 1, odometer_mi: 2100, unit: "NEW-1" },
      // No odometer on the line: the order's.
      { ro: "D-1", line_no: 3, odometer_mi: 42000, unit: "U-1" },
    ]);
    const codes = await rows<{ dtc: string }>(
      db,
      `select c.dtc from repair_line_codes c join repair_lines l on l.id = c.repair_line_id
        where l.import_id = ? order by c.id`,
      [importId],
    );
    expect(codes.map((c) => c.dtc)).toEqual(["P0496", "P0441", "P0455"]);
    const [vehicle] = await rows<{ last_odometer_mi: number; last_odometer_on: string }>(
      db,
      "select last_odometer_mi, last_odometer_on from vehicles where unit_number = 'NEW-1' and organisation_id = ?",
      [scope.organisationId],
    );
    expect(vehicle).toEqual({ last_odometer_mi: 2100, last_odometer_on: "2025-06-02" });
    // The side files of the run are gone.
    const imp = await rows<{ stored_path: string }>(
      db,
      "select stored_path from imports where id = ?",
      [importId],
    );
    const { existsSync } = await import("node:fs");
    expect(existsSync(`${imp[0]?.stored_path}.progress.json`)).toBe(false);
  });

  test("after its commit the import publishes how long each thread was busy", async () => {
    const messages: ImportThreadsMessage[] = [];
    const listen = (m: unknown) => messages.push(m as ImportThreadsMessage);
    diagnostics_channel.subscribe(IMPORT_THREADS_CHANNEL, listen);
    try {
      const file = [HEADER, "T-1,U-1,2025-05-01,42000,Stalls after filling up,P0496,,,"].join("\n");
      const { importId, result } = await importText(db, scope, "repairs", file);
      expect(result.status).toBe("done");
      expect(messages).toHaveLength(1);
      const [m] = messages;
      expect(m).toMatchObject({ importId, rows: 1 });
      expect(m!.readerBusyMs).toBeGreaterThanOrEqual(0);
      expect(m!.seconds).toBeGreaterThan(0);
      // The writer's time by kind of work: the tables it inserted into and the commit.
      expect(Object.keys(m!.writerBusyMs)).toEqual(
        expect.arrayContaining(["repair_orders", "repair_lines", "commit"]),
      );
    } finally {
      diagnostics_channel.unsubscribe(IMPORT_THREADS_CHANNEL, listen);
    }
  });

  test("a file of several chunks lands whole: every order, line and code, in file order", async () => {
    // 4,500 lines: past the sink's chunks (2,000 lines) and its pieces (300 rows), with orders
    // of one to three lines, some lines of an order coming back after other orders.
    const body: string[] = [];
    const expected = {
      orders: new Set<string>(),
      lines: 0,
      codes: 0,
      lineNo: new Map<string, number>(),
    };
    for (let i = 0; body.length < 4_500; i++) {
      const ro = i % 10 === 9 ? `K-${i - 5}` : `K-${i}`; // every tenth: a late line of an earlier order
      const codes = i % 4 === 0 ? "P0171 P0174" : i % 4 === 1 ? "B1000" : "";
      for (let l = 0; l < 1 + (i % 3) && body.length < 4_500; l++) {
        body.push(
          `${ro},U-${(i % 3) + 1},2025-08-01,${60_000 + i},Rough idle ${i}.${l},${codes},,,`,
        );
        expected.orders.add(ro);
        expected.lines++;
        expected.codes += codes ? codes.split(" ").length : 0;
        expected.lineNo.set(ro, (expected.lineNo.get(ro) ?? 0) + 1);
      }
    }
    const { importId, result } = await importText(
      db,
      scope,
      "repairs",
      [HEADER, ...body].join("\n"),
    );
    expect(result).toMatchObject({ status: "done", rowsTotal: 4_500, rowsImported: 4_500 });
    const [counts] = await rows<{ orders: number; lines: number; codes: number }>(
      db,
      `select (select count(*) from repair_orders where import_id = ?1) as orders,
              (select count(*) from repair_lines where import_id = ?1) as lines,
              (select count(*) from repair_line_codes c join repair_lines l on l.id = c.repair_line_id
                where l.import_id = ?1) as codes`,
      [importId],
    );
    expect(counts).toEqual({
      orders: expected.orders.size,
      lines: expected.lines,
      codes: expected.codes,
    });
    // Each order's lines are numbered 1, 2, … in file order, and the highest is its line count.
    const numbering = await rows<{ ro: string; lines: number; top: number; gaps: number }>(
      db,
      `select o.ro_number as ro, count(*) as lines, max(l.line_no) as top,
              sum(l.line_no <> (select count(*) from repair_lines x
                                 where x.repair_order_id = o.id and x.id <= l.id)) as gaps
         from repair_orders o join repair_lines l on l.repair_order_id = o.id
        where o.import_id = ? group by o.id`,
      [importId],
    );
    expect(numbering.filter((n) => n.gaps !== 0 || n.top !== n.lines)).toEqual([]);
    expect(new Map(numbering.map((n) => [n.ro, n.lines]))).toEqual(expected.lineNo);
    expect(await rows(db, "pragma foreign_key_check")).toEqual([]);
  });

  test("a cancel while the transaction is open rolls everything back and is audited", async () => {
    const body = Array.from(
      { length: 40_000 },
      (_, i) => `C-${i},U-${(i % 3) + 1},2025-07-01,${50_000 + i},Rattle,,,,`,
    );
    const { importId, inspection } = await upload(
      db,
      scope,
      "repairs",
      "cancel-me.csv",
      [HEADER, ...body].join("\n"),
    );
    const { jobId } = await startImport(db, scope, importId, {
      delimiter: inspection.delimiter,
      headers: inspection.headers,
      mapping: mappingByName(inspection.headers, inspection.mapping),
      read: inspection.read,
    });
    const worker = startWorker({ db, jobId, isOneShot: true, log: () => {} });
    // The import's row says nothing until commit; its progress comes from the side file.
    let progress = await getImport(db, scope, importId);
    for (let i = 0; i < 400 && !(progress.status === "reading" && progress.rowsTotal > 0); i++) {
      await new Promise((r) => setTimeout(r, 5));
      progress = await getImport(db, scope, importId);
    }
    expect(progress.status).toBe("reading");
    expect(progress.rowsTotal).toBeGreaterThan(0);
    const [stored] = await rows<{ rows_total: number }>(
      db,
      "select rows_total from imports where id = ?",
      [importId],
    );
    expect(stored?.rows_total).toBe(0);

    await cancelImport(db, scope, importId);
    expect((await getImport(db, scope, importId)).cancelRequestedAt).not.toBeNull();
    await worker;
    const result = await getImport(db, scope, importId);
    expect(result.status).toBe("cancelled");
    const [left] = await rows<{ n: number }>(
      db,
      "select count(*) as n from repair_orders where import_id = ?",
      [importId],
    );
    expect(left?.n).toBe(0);
    const audit = await rows<{ user_id: number }>(
      db,
      "select user_id from audit_log where action = 'import.cancel' and entity_id = ?",
      [String(importId)],
    );
    expect(audit).toEqual([{ user_id: scope.userId }]);
  });

  test("the writer reports a failing statement, and a rollback leaves nothing", async () => {
    const file = join(dir, "test.db");
    const writer = await ImportWriter.open(file);
    writer.insert(
      "import_rejects",
      ["organisation_id", "import_id", "row_number", "severity", "column", "reason", "raw"],
      [scope.organisationId, 999_999, 2, "rejected", "x", "written, then rolled back", "raw"],
    );
    writer.run("insert into no_such_table values (1)");
    await expect(writer.endChunk().then(() => writer.query("select 1"))).rejects.toThrow(
      /no such table/,
    );
    await writer.rollback();
    const [n] = await rows<{ n: number }>(
      db,
      "select count(*) as n from import_rejects where import_id = 999999",
    );
    expect(n?.n).toBe(0);
  });

  test("while the writer holds the lock, readers see the data as it was", async () => {
    const writer = await ImportWriter.open(join(dir, "test.db"));
    try {
      writer.run("update organisations set name = 'Renamed' where id = " + scope.organisationId);
      await writer.endChunk();
      expect(
        await writer.query<{ name: string }>(
          `select name from organisations where id = ${scope.organisationId}`,
        ),
      ).toEqual([{ name: "Renamed" }]);
      const [outside] = await rows<{ name: string }>(
        db,
        "select name from organisations where id = ?",
        [scope.organisationId],
      );
      expect(outside?.name).toBe("Org direct");
    } finally {
      await writer.rollback();
    }
  });
});
