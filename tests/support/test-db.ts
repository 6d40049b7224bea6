import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { openDatabase } from "@/db";
import { migrateDatabase } from "@/db/migrate";
import { startSqld } from "./sqld";

/** True when the suite runs against a libSQL server (`npm run test:server`). */
export function isServerRun(): boolean {
  return process.env.RECURRA_TEST_DATABASE === "server";
}

/**
 * A fresh, empty database URL: a file in a temporary folder, or, in a server run, a libSQL
 * server (sqld) of its own on a loopback port.
 */
export async function createTestDatabaseUrl(): Promise<{
  url: string;
  dir: string;
  stop: () => Promise<void>;
}> {
  if (isServerRun()) {
    const server = await startSqld();
    return { url: server.url, dir: dirname(server.dbPath), stop: server.stop };
  }
  const dir = mkdtempSync(join(tmpdir(), "recurra-test-"));
  return { url: `file:${join(dir, "test.db")}`, dir, stop: async () => {} };
}

/** A fresh, migrated database: a temporary file, or a libSQL server in a server run. */
export async function createTestDb() {
  const { url, dir, stop } = await createTestDatabaseUrl();
  const handle = await openDatabase(url);
  await migrateDatabase(handle.db);
  return { ...handle, url, dir, stop };
}
