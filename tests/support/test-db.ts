import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { openDatabase } from "@/db";
import { migrateDatabase } from "@/db/migrate";

/** A fresh, migrated file database in a temporary folder. */
export async function createTestDb() {
  const dir = mkdtempSync(join(tmpdir(), "recurra-test-"));
  const url = `file:${join(dir, "test.db")}`;
  const handle = await openDatabase(url);
  await migrateDatabase(handle.db);
  return { ...handle, url, dir };
}
