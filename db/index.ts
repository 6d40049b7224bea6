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

/** An embedded replica: a local file kept in step with a libSQL server (see README). */
export type ReplicaOptions = { syncUrl: string; syncIntervalSeconds?: number };

/** Clients whose database engine runs in this process on a plain local file, and its path. */
const localFileClients = new WeakMap<Client, string>();

/**
 * True when the database is a plain local file in this process, where connection PRAGMAs
 * (page cache, heap limit) apply. False for a libSQL server and for an embedded replica, whose
 * writes go to the server: the server refuses those PRAGMAs.
 */
export function isLocalFileDatabase(db: Db | Client): boolean {
  return localFileClients.has("$client" in db ? db.$client : db);
}

/**
 * The file of a local file database (as opened, relative to the working folder), so another
 * thread can open its own connection to it; null for a server, a replica or `:memory:`.
 */
export function localDatabasePath(db: Db | Client): string | null {
  const path = localFileClients.get("$client" in db ? db.$client : db);
  return path && path !== ":memory:" ? path : null;
}

/**
 * Opens a libSQL client. File databases get WAL (persistent in the file) and a busy timeout so
 * concurrent writers queue instead of failing with SQLITE_BUSY; server URLs are used unchanged.
 * With `replica`, the file is an embedded replica of the server at `replica.syncUrl`: reads are
 * served from the file, writes go to the server, and the file is synced when opened, after each
 * write (read-your-writes) and every `syncIntervalSeconds`.
 */
export async function openDatabase(
  url: string,
  authToken?: string,
  replica?: ReplicaOptions,
): Promise<{ client: Client; db: Db }> {
  if (replica && !isFileUrl(url)) {
    throw new Error("An embedded replica needs a file: DATABASE_URL next to DATABASE_SYNC_URL.");
  }
  let path = "";
  if (isFileUrl(url)) {
    path =
      url
        .slice("file:".length)
        .replace(/^\/\/(localhost)?/, "")
        .split("?")[0] ?? "";
    if (path && path !== ":memory:") mkdirSync(dirname(path), { recursive: true });
  }
  const client = createClient({
    url,
    authToken,
    timeout: 10_000,
    ...(replica
      ? {
          syncUrl: replica.syncUrl,
          syncInterval: replica.syncIntervalSeconds,
          readYourWrites: true,
        }
      : {}),
  });
  if (replica) {
    await client.sync();
  } else if (isFileUrl(url)) {
    await client.execute("PRAGMA journal_mode = WAL");
    await client.execute("PRAGMA synchronous = NORMAL");
    localFileClients.set(client, path);
  }
  return { client, db: drizzle(client, { schema }) };
}

type Handle = { client: Client; db: Db };
const globalForDb = globalThis as unknown as { recurraDb?: Promise<Handle> };

/** The process-wide database of this server or command, opened once from DATABASE_URL. */
export function getDatabase(): Promise<Handle> {
  if (!globalForDb.recurraDb) {
    const env = getEnv();
    globalForDb.recurraDb = openDatabase(
      env.DATABASE_URL,
      env.DATABASE_AUTH_TOKEN,
      env.DATABASE_SYNC_URL
        ? { syncUrl: env.DATABASE_SYNC_URL, syncIntervalSeconds: env.DATABASE_SYNC_INTERVAL }
        : undefined,
    );
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
