import { createClient } from "@libsql/client";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { getImport, startImport } from "@/db/queries/imports";
import { getOverview } from "@/db/queries/overview";
import type { OrgScope } from "@/db/queries/scope";
import type { ImportKind } from "@/db/schema";
import { mappingByName } from "@/jobs/import/inspect";
import { failImport, runImport, type RunImportHooks } from "@/jobs/import/run-import";
import { rows, scratch, setUpOrganisation, upload } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

/**
 * The staged apply of the large kinds (repairs, fault codes, fill-ups) in committed chunks:
 * what lands is the same as in one chunk, the rows stay hidden from readers until the last
 * chunk marks the import done, a crash between chunks leaves nothing visible and the retry
 * lands every row once, and the write lock is free between chunks. Runs on a file (the staged
 * path forced) and, in `npm run test:server`, on a libSQL server, where it is the real path.
 */

process.env.RECURRA_DATA_DIR = scratch;

let db: Db;
let url: string;

beforeAll(async () => {
  ({ db, url } = await createTestDb());
});

/** Upload and start an import, then run its job here with the given hooks. */
async function runWith(
  scope: OrgScope,
  kind: ImportKind,
  content: string,
  hooks: RunImportHooks = {},
) {
  const name = `${kind}-${Math.random().toString(36).slice(2)}.csv`;
  const { importId, inspection } = await upload(db, scope, kind, name, content);
  await startImport(db, scope, importId, {
    delimiter: inspection.delimiter,
    headers: inspection.headers,
    mapping: mappingByName(inspection.headers, inspection.mapping),
    read: inspection.read as never,
  });
  const run = () => runImport(db, importId, { isStagedOnFile: true, ...hooks });
  return { importId, run };
}

// Lines of one RO are spread over the file, an RO has more lines than a chunk holds, R-9 is
// already in the data, and one line repeats an earlier one word for word.
const REPAIRS = [
  "RO number,Unit,Opened,Odometer,Complaint,DTC codes,Make,Model,Year",
  "R-3,U-1,2025-03-03,41300,Rough idle,P0300,,,",
  "R-1,U-1,2025-03-01,41000,Stalls after fill-up,P0496 P0441,,,",
  "R-2,U-2,2025-03-02,52000,No crank,,,,",
  "R-1,U-1,2025-03-01,41000,Lamp on,P0455,,,",
  "R-4,NEW-1,2025-03-04,900,Noise,,Aurel,Merlin,2022",
  "R-3,U-1,2025-03-03,41300,Misfire cyl 2,P0302,,,",
  "R-9,U-3,2025-03-09,30000,Squeal,,,,",
  "R-1,U-1,2025-03-01,41000,Battery light,P0562,,,",
  "R-5,U-2,2025-03-05,52400,Shift flare,P0700,,,",
  "R-3,U-1,2025-03-03,41300,Rough idle,P0300,,,",
  "R-6,NEW-1,2025-03-06,1500,Wipers dead,,Aurel,Merlin,2022",
].join("\n");

const FAULTS = [
  "unit_number,occurred_at,odometer,dtc,mil_on,status",
  "U-1,2025-06-01 08:00,42000,P0441,yes,confirmed",
  "U-2,2025-06-01 09:00,52100,P0300,yes,confirmed",
  "U-3,2025-06-01 10:00,30100,P0171,no,pending",
  "U-1,2025-06-01 08:00,42000,P0441,no,pending",
  "U-1,2025-06-02 08:00,42050,P0441,yes,confirmed",
  "U-2,2025-06-02 09:00,52150,P0302,yes,confirmed",
  "U-3,2025-06-02 10:00,30150,P0171,yes,confirmed",
].join("\n");

/** What landed, in a form that does not depend on row ids. */
async function landedRepairs(importId: number) {
  return rows<{ ro: string; line_no: number; complaint: string; codes: string | null }>(
    db,
    `select o.ro_number as ro, l.line_no, l.complaint,
            (select group_concat(dtc, ' ') from (select c.dtc from repair_line_codes c
              where c.repair_line_id = l.id and c.import_id = l.import_id order by c.dtc)) as codes
       from repair_lines l join repair_orders o on o.id = l.repair_order_id
      where l.import_id = ? order by o.ro_number, l.line_no`,
    [importId],
  );
}

async function landedFaults(importId: number) {
  return rows<{ unit: string; occurred_at: string; dtc: string; mil_on: number }>(
    db,
    `select v.unit_number as unit, f.occurred_at, f.dtc, f.mil_on from fault_events f
       join vehicles v on v.id = f.vehicle_id where f.import_id = ? order by f.occurred_at, v.unit_number`,
    [importId],
  );
}

const tableCount = async (table: string, importId: number) =>
  Number(
    (
      await rows<{ n: number }>(db, `select count(*) as n from ${table} where import_id = ?`, [
        importId,
      ])
    )[0]?.n,
  );

async function seedExistingRo(scope: OrgScope) {
  const { run } = await runWith(
    scope,
    "repairs",
    "RO number,Unit,Opened,Odometer,Complaint\nR-9,U-3,2025-01-09,29000,Earlier visit",
  );
  await run();
}

describe("applying in chunks", () => {
  test("repairs: chunks of two rows land exactly what one chunk lands", async () => {
    const whole = await setUpOrganisation(db, "chunks-whole");
    const small = await setUpOrganisation(db, "chunks-small");
    await seedExistingRo(whole);
    await seedExistingRo(small);
    const a = await runWith(whole, "repairs", REPAIRS);
    await a.run();
    const chunks: number[] = [];
    const b = await runWith(small, "repairs", REPAIRS, {
      apply: { chunkRows: 2, beforeChunk: (c) => void chunks.push(c) },
    });
    await b.run();
    expect(chunks.length).toBeGreaterThan(3);

    const expected = await landedRepairs(a.importId);
    expect(await landedRepairs(b.importId)).toEqual(expected);
    // Checked by hand: R-1's three lines in file order with their codes, R-3's repeated line
    // dropped, R-9 skipped (already in the data), NEW-1 created once for.
    expect(expected.filter((l) => l.ro === "R-1")).toEqual([
      { ro: "R-1", line_no: 1, complaint: "Stalls after fill-up", codes: "P0441 P0496" },
      { ro: "R-1", line_no: 2, complaint: "Lamp on", codes: "P0455" },
      { ro: "R-1", line_no: 3, complaint: "Battery light", codes: "P0562" },
    ]);
    expect(expected.map((l) => l.ro)).not.toContain("R-9");
    for (const { importId, scope } of [
      { importId: a.importId, scope: whole },
      { importId: b.importId, scope: small },
    ]) {
      expect(await getImport(db, scope, importId)).toMatchObject({
        status: "done",
        rowsTotal: 11,
        rowsImported: 9,
        rowsDuplicate: 2,
        vehiclesCreated: 1,
      });
    }
    // Nothing is left staged once the import is done.
    expect(await tableCount("staged_repairs", b.importId)).toBe(0);
  });

  test("fault codes: the first of two equal rows wins across a chunk boundary", async () => {
    const whole = await setUpOrganisation(db, "faults-whole");
    const small = await setUpOrganisation(db, "faults-small");
    const a = await runWith(whole, "faults", FAULTS);
    await a.run();
    const b = await runWith(small, "faults", FAULTS, { apply: { chunkRows: 2 } });
    await b.run();
    const expected = await landedFaults(a.importId);
    expect(await landedFaults(b.importId)).toEqual(expected);
    // Row 4 repeats row 1 (same vehicle, moment and code) from the next chunk: row 1 stays.
    expect(
      expected.filter((f) => f.unit === "U-1" && f.occurred_at.startsWith("2025-06-01")),
    ).toHaveLength(1);
    expect(expected.find((f) => f.unit === "U-1")?.mil_on).toBe(1);
    expect(await getImport(db, small, b.importId)).toMatchObject({
      status: "done",
      rowsImported: 6,
      rowsDuplicate: 1,
    });
  });
});

describe("an import half applied", () => {
  test("is hidden from readers until its last chunk, and the write lock is free in between", async () => {
    const scope = await setUpOrganisation(db, "hidden");
    const before = await getOverview(db, scope);
    const other = createClient({ url });
    const seen: { overview: Awaited<ReturnType<typeof getOverview>>; rowsSoFar: number }[] = [];
    const waits: number[] = [];
    const { importId, run } = await runWith(scope, "repairs", REPAIRS, {
      apply: {
        chunkRows: 2,
        beforeChunk: async (c) => {
          if (c < 2) return;
          seen.push({
            overview: await getOverview(db, scope),
            rowsSoFar: await tableCount("repair_orders", importId),
          });
          // Another client writes between two chunks, and does not wait for the apply.
          const t0 = performance.now();
          await other.execute({
            sql: "insert into audit_log (organisation_id, action, entity) values (?, 'test.ping', 'test')",
            args: [scope.organisationId],
          });
          waits.push(performance.now() - t0);
        },
      },
    });
    await run();
    other.close();
    expect(seen.length).toBeGreaterThan(0);
    for (const s of seen) {
      expect(s.rowsSoFar).toBeGreaterThan(0); // rows are in the table …
      expect(s.overview.repairOrders).toBe(before.repairOrders); // … but no reader sees them
    }
    expect(Math.max(...waits)).toBeLessThan(2000);
    const after = await getOverview(db, scope);
    expect(after.repairOrders - before.repairOrders).toBe(7); // R-1 …
    expect((await getImport(db, scope, importId)).status).toBe("done");
  });

  test("a crash between chunks leaves nothing visible; the retry lands every row once", async () => {
    const scope = await setUpOrganisation(db, "crash");
    await seedExistingRo(scope);
    const before = await getOverview(db, scope);
    let isCrashing = true;
    const { importId, run } = await runWith(scope, "repairs", REPAIRS, {
      apply: {
        chunkRows: 2,
        beforeChunk: (c) => {
          if (isCrashing && c === 2) throw new Error("worker stopped (test)");
        },
      },
    });
    await expect(run()).rejects.toThrow(/worker stopped/);
    expect((await getImport(db, scope, importId)).status).toBe("applying");
    expect(await tableCount("repair_lines", importId)).toBeGreaterThan(0);
    expect(await getOverview(db, scope)).toMatchObject({ repairOrders: before.repairOrders });

    isCrashing = false;
    await run();
    expect(await getImport(db, scope, importId)).toMatchObject({
      status: "done",
      rowsImported: 9,
      rowsDuplicate: 2,
    });
    expect(await tableCount("repair_lines", importId)).toBe(9);
    expect(await tableCount("repair_line_codes", importId)).toBe(7);
    expect((await getOverview(db, scope)).repairOrders - before.repairOrders).toBe(6);
  });

  test("an import that fails for good after a partial apply leaves nothing behind", async () => {
    const scope = await setUpOrganisation(db, "given-up");
    const { importId, run } = await runWith(scope, "faults", FAULTS, {
      apply: {
        chunkRows: 2,
        beforeChunk: (c) => {
          if (c === 2) throw new Error("worker stopped (test)");
        },
      },
    });
    await expect(run()).rejects.toThrow(/worker stopped/);
    expect(await tableCount("fault_events", importId)).toBeGreaterThan(0);
    await failImport(db, importId, "No attempts left.");
    expect((await getImport(db, scope, importId)).status).toBe("failed");
    expect(await tableCount("fault_events", importId)).toBe(0);
    expect(await tableCount("staged_faults", importId)).toBe(0);
    expect((await getOverview(db, scope)).faultEvents).toBe(0);
  });
});
