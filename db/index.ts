import { mkdirSync } from "node:fs";
import { dirname } from "node:path";
import {
  createClient,
  type Client,
  type InStatement,
  type ResultSet,
  type Transaction,
  type TransactionMode,
} from "@libsql/client";
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
    serialiseWrites(client, path);
    await client.execute("PRAGMA journal_mode = WAL");
    await client.execute("PRAGMA synchronous = NORMAL");
    localFileClients.set(client, path);
  }
  return { client, db: drizzle(client, { schema }) };
}

/** Longest wait for another writer (an import's writer thread, another process) to finish. */
export const BUSY_WAIT_MS = 60_000;
/** Longest wait for this process's earlier writes before giving up. */
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

/** A statement that writes: what a write transaction or a write lock is needed for. */
const WRITE_STATEMENT =
  /^\s*(?:insert|update|delete|replace|create|drop|alter|with\b[\s\S]*?\b(?:insert|update|delete)\b)/i;

const sqlOf = (stmt: InStatement): string => (typeof stmt === "string" ? stmt : stmt.sql);

/**
 * Writes of this process on a local file, one at a time, queued without blocking. The file's
 * driver runs each statement synchronously, and SQLite's busy timeout waits inside that call: a
 * write begun while a write transaction of this process is open would hold the event loop, so
 * the transaction could never reach its commit, and both would stall for the whole timeout
 * before one failed with SQLITE_BUSY. So a write transaction, a write statement or a batch
 * waits here (as a promise) for its turn — until the process's earlier writes have ended (a
 * transaction's at its commit or rollback) — and then (writeLockWaiter) until no other thread or
 * process holds the write lock. Reads and read transactions go straight through: in WAL mode
 * they do not wait for writers.
 */
function serialiseWrites(client: Client, path: string): void {
  const lock = path === ":memory:" ? null : writeLockWaiter(path);
  const closeClient = client.close.bind(client);
  client.close = () => {
    lock?.close();
    closeClient();
  };
  let queue: Promise<void> = Promise.resolve();
  /** Waits for this write's turn and the file's write lock; returns what ends the turn. */
  const takeTurn = async (): Promise<() => void> => {
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
      await lock?.wait();
    } catch (e) {
      release();
      throw e;
    } finally {
      clearTimeout(timer);
    }
    return release;
  };
  const inTurn = async <T>(work: () => Promise<T>): Promise<T> => {
    const release = await takeTurn();
    try {
      return await work();
    } finally {
      release();
    }
  };

  const execute = client.execute.bind(client) as (...args: unknown[]) => Promise<ResultSet>;
  client.execute = ((...args: unknown[]) => {
    const stmt = args[0] as InStatement;
    return WRITE_STATEMENT.test(sqlOf(stmt)) ? inTurn(() => execute(...args)) : execute(...args);
  }) as Client["execute"];
  const batch = client.batch.bind(client);
  client.batch = ((stmts: InStatement[], mode?: TransactionMode) =>
    mode === "read" || !stmts.some((st) => WRITE_STATEMENT.test(sqlOf(st)))
      ? batch(stmts, mode)
      : inTurn(() => batch(stmts, mode))) as Client["batch"];

  const begin = client.transaction.bind(client);
  client.transaction = async (mode?: TransactionMode) => {
    if (mode === "read") return begin(mode);
    const release = await takeTurn();
    let tx: Transaction;
    try {
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
