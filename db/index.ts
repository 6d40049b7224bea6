import { mkdirSync } from "node:fs";
import { dirname } from "node:path";
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { getEnv } from "@/lib/env";
import * as schema from "./schema";

export type Db = LibSQLDatabase<typeof schema> & { $client: Client };
/** A database handle or an open transaction: data-layer functions accept either. */
export type DbOrTx = Db | Parameters<Parameters<Db["transaction"]>[0]>[0];

export function isFileUrl(url: string): boolean {
  return url.startsWith("file:");
}

/**
 * Opens a libSQL client. File databases get WAL (persistent in the file) and a busy timeout so
 * concurrent writers queue instead of failing with SQLITE_BUSY; server URLs are used unchanged.
 */
export async function openDatabase(
  url: string,
  authToken?: string,
): Promise<{ client: Client; db: Db }> {
  if (isFileUrl(url)) {
    const path =
      url
        .slice("file:".length)
        .replace(/^\/\/(localhost)?/, "")
        .split("?")[0] ?? "";
    if (path && path !== ":memory:") mkdirSync(dirname(path), { recursive: true });
  }
  const client = createClient({ url, authToken, timeout: 10_000 });
  if (isFileUrl(url)) {
    await client.execute("PRAGMA journal_mode = WAL");
    await client.execute("PRAGMA synchronous = NORMAL");
  }
  return { client, db: drizzle(client, { schema }) };
}

type Handle = { client: Client; db: Db };
const globalForDb = globalThis as unknown as { recurraDb?: Promise<Handle> };

/** The process-wide database of this server or command, opened once from DATABASE_URL. */
export function getDatabase(): Promise<Handle> {
  if (!globalForDb.recurraDb) {
    const env = getEnv();
    globalForDb.recurraDb = openDatabase(env.DATABASE_URL, env.DATABASE_AUTH_TOKEN);
    globalForDb.recurraDb.catch(() => {
      globalForDb.recurraDb = undefined;
    });
  }
  return globalForDb.recurraDb;
}

export async function getDb(): Promise<Db> {
  return (await getDatabase()).db;
}

export { schema };
