import { sql } from "drizzle-orm";
import { integer, text } from "drizzle-orm/sqlite-core";

/** Integer surrogate key; SQLite rowid alias, so inserts stay cheap on million-row imports. */
export const id = () => integer("id").primaryKey({ autoIncrement: true });

/** ISO-8601 UTC timestamp, set by the database so every node writes the same format. */
export const createdAt = () =>
  text("created_at")
    .notNull()
    .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`);

/** Money is always integer cents. */
export const cents = (name: string) => integer(name);
