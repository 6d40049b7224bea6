import { resolve } from "node:path";
import { sql } from "drizzle-orm";
import { migrate } from "drizzle-orm/libsql/migrator";
import journal from "./migrations/meta/_journal.json";
import type { Db } from "./index";

export const MIGRATIONS_FOLDER = resolve(process.cwd(), "db/migrations");

/** Applies every committed migration that the database has not seen yet. */
export async function migrateDatabase(db: Db): Promise<void> {
  await migrate(db, { migrationsFolder: MIGRATIONS_FOLDER });
}

export type MigrationStatus = { applied: number; expected: number; isCurrent: boolean };

/** Compares the migrations recorded in the database with the committed journal. */
export async function getMigrationStatus(db: Db): Promise<MigrationStatus> {
  const expected = journal.entries.length;
  const last = journal.entries.at(-1)?.when ?? 0;
  let applied = 0;
  let newest = 0;
  try {
    const rows = await db.all<{ n: number; newest: number | null }>(
      sql`select count(*) as n, max(created_at) as newest from __drizzle_migrations`,
    );
    applied = Number(rows[0]?.n ?? 0);
    newest = Number(rows[0]?.newest ?? 0);
  } catch {
    applied = 0; // no migrations table yet
  }
  return { applied, expected, isCurrent: applied >= expected && newest >= last };
}
