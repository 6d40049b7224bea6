import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { openDatabase, type Db } from "@/db";
import { getImport } from "@/db/queries/imports";
import type { OrgScope } from "@/db/queries/scope";
import { listOrganisations } from "@/db/queries/system";
import { migrateDatabase } from "@/db/migrate";
import { importText, rows, scratch, setUpOrganisation } from "../support/import-helpers";
import { startSqld, type SqldServer } from "../support/sqld";

process.env.RECURRA_DATA_DIR = scratch;

/**
 * A libSQL primary and a replica (sqld --grpc-listen-addr / --primary-grpc-url), and an
 * embedded replica (a local file synced from the primary). Writes go to the primary; the
 * replicas serve reads from their own copy once they have caught up.
 */

let primary: SqldServer;
let replica: SqldServer;
let onPrimary: Db;
let onReplica: Db;
let scope: OrgScope;
const closers: (() => void)[] = [];

/** Polls `read` until it returns `expected` (replication is asynchronous), or times out. */
async function eventually<T>(read: () => Promise<T>, expected: T, timeoutMs = 15_000) {
  const until = Date.now() + timeoutMs;
  let last: T | undefined;
  while (Date.now() < until) {
    last = await read();
    if (JSON.stringify(last) === JSON.stringify(expected)) return last;
    await new Promise((r) => setTimeout(r, 100));
  }
  return last;
}

const countLines = async (db: Db, importId: number) =>
  Number(
    (
      await rows<{ n: number }>(db, "select count(*) as n from repair_lines where import_id = ?", [
        importId,
      ])
    )[0]?.n,
  );

function repairsCsv(n: number, prefix: string): string {
  const lines = ["ro_number,unit_number,opened_on,odometer,complaint,dtc_codes"];
  for (let i = 0; i < n; i++)
    lines.push(
      `${prefix}-${i},U-${(i % 3) + 1},2025-02-${String((i % 28) + 1).padStart(2, "0")},${50000 + i},Stalls at idle,P0300`,
    );
  return lines.join("\n");
}

beforeAll(async () => {
  primary = await startSqld({ isPrimary: true });
  // A folder of its own that outlives a stop, so the replica can be restarted on it.
  replica = await startSqld({
    dbPath: join(mkdtempSync(join(tmpdir(), "recurra-replica-")), "db.sqld"),
    primaryGrpcUrl: primary.grpcUrl ?? "",
  });
  const p = await openDatabase(primary.url);
  const r = await openDatabase(replica.url);
  closers.push(
    () => p.client.close(),
    () => r.client.close(),
  );
  onPrimary = p.db;
  onReplica = r.db;
  await migrateDatabase(onPrimary);
  scope = await setUpOrganisation(onPrimary, "replicated");
});

afterAll(async () => {
  for (const close of closers) close();
  await replica?.stop();
  await primary?.stop();
});

describe("primary and replica", () => {
  test("an import written through the primary is read from the replica once it has synced", async () => {
    const { importId, result } = await importText(
      onPrimary,
      scope,
      "repairs",
      repairsCsv(2_000, "R"),
    );
    expect(result).toMatchObject({ status: "done", rowsImported: 2_000 });
    expect(await countLines(onPrimary, importId)).toBe(2_000);
    // The replica catches up on its own; the import's status and rows arrive together.
    expect(await eventually(() => countLines(onReplica, importId), 2_000)).toBe(2_000);
    expect(await getImport(onReplica, scope, importId)).toMatchObject({
      status: "done",
      rowsImported: 2_000,
    });
  });

  test("a write sent to the replica is forwarded to the primary", async () => {
    await onReplica.$client.execute({
      sql: "update organisations set name = ? where id = ?",
      args: ["Renamed via the replica", scope.organisationId],
    });
    const [row] = await rows<{ name: string }>(
      onPrimary,
      "select name from organisations where id = ?",
      [scope.organisationId],
    );
    expect(row?.name).toBe("Renamed via the replica");
  });

  test("a replica that was down catches up with the writes it missed when it comes back", async () => {
    await replica.stop();
    await onPrimary.$client.execute({
      sql: "update organisations set name = ? where id = ?",
      args: ["Renamed while the replica was down", scope.organisationId],
    });
    // The same folder, so it resumes from the frames it already had.
    replica = await startSqld({ dbPath: replica.dbPath, primaryGrpcUrl: primary.grpcUrl ?? "" });
    const { client, db } = await openDatabase(replica.url);
    closers.push(() => client.close());
    const nameOn = async (target: Db) =>
      (
        await rows<{ name: string }>(target, "select name from organisations where id = ?", [
          scope.organisationId,
        ])
      )[0]?.name;
    expect(await eventually(() => nameOn(db), "Renamed while the replica was down")).toBe(
      "Renamed while the replica was down",
    );
    expect(await listOrganisations(db)).toEqual(await listOrganisations(onPrimary));
  });
});

describe("embedded replica", () => {
  test("a local file synced from the server: reads after a sync see the server's writes", async () => {
    const server = await startSqld();
    const { client: direct, db: onServer } = await openDatabase(server.url);
    const dir = mkdtempSync(join(tmpdir(), "recurra-embedded-"));
    try {
      await migrateDatabase(onServer);
      const org = await setUpOrganisation(onServer, "embedded");
      // Opening syncs once: the migrated schema and the organisation are in the local file.
      const { client, db: local } = await openDatabase(
        `file:${join(dir, "replica.db")}`,
        undefined,
        {
          syncUrl: server.url,
          syncIntervalSeconds: 3600,
        },
      );
      try {
        expect((await listOrganisations(local)).map((o) => o.slug)).toEqual(["embedded"]);

        // A write made on the server by another node is not in the local file until it syncs.
        await direct.execute({
          sql: "update organisations set name = ? where id = ?",
          args: ["Written elsewhere", org.organisationId],
        });
        const nameIn = async (db: Db) =>
          (
            await rows<{ name: string }>(db, "select name from organisations where id = ?", [
              org.organisationId,
            ])
          )[0]?.name;
        expect(await nameIn(local)).toBe("Org embedded");
        await client.sync();
        expect(await nameIn(local)).toBe("Written elsewhere");

        // Writes through the embedded replica go to the server and are read back at once.
        const { importId, result } = await importText(local, org, "repairs", repairsCsv(300, "E"));
        expect(result).toMatchObject({ status: "done", rowsImported: 300 });
        expect(await countLines(onServer, importId)).toBe(300);
        expect(await countLines(local, importId)).toBe(300);
      } finally {
        client.close();
      }
    } finally {
      direct.close();
      await server.stop();
    }
  });
});
