import { mkdirSync } from "node:fs";
import { dirname } from "node:path";
import { createClient, type Client, type Transaction, type TransactionMode } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import Database from "libsql";
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
  const isPlainFile = isFileUrl(url) && !replica;
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
  } else if (isPlainFile) {
    serialiseWriteTransactions(client, path);
    await client.execute("PRAGMA journal_mode = WAL");
    await client.execute("PRAGMA synchronous = NORMAL");
    localFileClients.set(client, path);
  }
  return { client, db: drizzle(client, { schema }) };
}

/** Longest wait for another writer (an import's writer thread, another process) to finish. */
export const BUSY_WAIT_MS = 60_000;
/** Longest wait for this process's earlier write transactions before giving up. */
export const TRANSACTION_WAIT_MS = 90_000;

const isBusyError = (e: unknown): boolean => {
  let err = e as { code?: unknown; cause?: unknown } | undefined;
  for (let depth = 0; err && depth < 4; depth++) {
    if (typeof err.code === "string" && err.code.startsWith("SQLITE_BUSY")) return true;
    err = err.cause as typeof err;
  }
  return false;
};

/**
 * Waits, as a promise, until no other connection holds the file's write lock (an import's
 * writer thread holds it for the whole import; another process may too), for at most
 * BUSY_WAIT_MS: a connection of its own tries to take the lock without SQLite's busy wait and
 * lets it go at once, every 5 ms, then twice as long each time up to 200 ms. SQLite's busy
 * timeout would wait inside the driver's synchronous call and hold the event loop, so the rest
 * of the server would stop meanwhile. Another writer can still come in between; the
 * transaction's own BEGIN then waits as before (up to the client's timeout).
 */
function writeLockWaiter(path: string): { wait: () => Promise<void>; close: () => void } {
  let probe: Database.Database | null = null;
  const close = () => {
    probe?.close();
    probe = null;
  };
  const wait = async () => {
    probe ??= new Database(path, { timeout: 0 });
    const deadline = performance.now() + BUSY_WAIT_MS;
    for (let delay = 5; ; delay = Math.min(delay * 2, 200)) {
      try {
        // exec finalises its statement even when it fails, so nothing is left running.
        probe.exec("begin immediate");
        probe.exec("rollback");
        return;
      } catch (e) {
        if (!isBusyError(e) || performance.now() + delay > deadline) return;
        await new Promise((resolve) => setTimeout(resolve, delay));
      }
    }
  };
  return { wait, close };
}

/**
 * Write transactions of this process on a local file, one at a time, queued without blocking.
 * The file's driver runs each statement synchronously, and SQLite's busy timeout waits inside
 * that call: a second write transaction begun while another of this process is open would hold
 * the event loop, so the first could never reach its commit, and both would stall for the whole
 * timeout before one failed with SQLITE_BUSY. So a write transaction waits here (as a promise)
 * until the process's earlier ones have committed or rolled back, and then (writeLockWaiter)
 * until no other thread or process holds the write lock. Read transactions and single
 * statements are not queued; a single write statement still waits in SQLite's busy handler.
 */
function serialiseWriteTransactions(client: Client, path: string): void {
  const begin = client.transaction.bind(client);
  const lock = path === ":memory:" ? null : writeLockWaiter(path);
  const closeClient = client.close.bind(client);
  client.close = () => {
    lock?.close();
    closeClient();
  };
  let queue: Promise<void> = Promise.resolve();
  client.transaction = async (mode?: TransactionMode) => {
    if (mode === "read") return begin(mode);
    let release!: () => void;
    const turn = new Promise<void>((resolve) => (release = resolve));
    const before = queue;
    queue = before.then(() => turn);
    let timer: ReturnType<typeof setTimeout> | undefined;
    try {
      await Promise.race([
        before,
        new Promise<never>((_, reject) => {
          timer = setTimeout(
            () => reject(new Error("The database stayed busy with other changes; try again.")),
            TRANSACTION_WAIT_MS,
          );
        }),
      ]);
    } catch (e) {
      release();
      throw e;
    } finally {
      clearTimeout(timer);
    }
    let tx: Transaction;
    try {
      await lock?.wait();
      tx = await begin(mode);
    } catch (e) {
      release();
      throw e;
    }
    const commit = tx.commit.bind(tx);
    const rollback = tx.rollback.bind(tx);
    const close = tx.close.bind(tx);
    tx.commit = () => commit().finally(release);
    tx.rollback = () => rollback().finally(release);
    tx.close = () => {
      try {
        close();
      } finally {
        release();
      }
    };
    return tx;
  };
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
