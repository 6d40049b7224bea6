// A connection to a local database file in a worker thread, holding one transaction, so that
// database work runs on a second core beside the main thread:
// - an import's writer (jobs/import/writer.ts): ONE write transaction for the whole import,
//   so parsing and checking (main thread) and writing (here) overlap, and the import lands
//   whole or not at all (a killed process never commits);
// - a reader (readInThread in jobs/db-thread.ts): a few queries on one read snapshot while the main
//   thread does other work (the recompute counts events while it works out exposure).
//
// Plain JavaScript on purpose: it is started by path from both the Next.js server and the
// command line, so it must not need a TypeScript loader or a bundler. It talks in messages:
//   { type: "open", path, cacheKb, mode }
//                                     → { type: "opened" }: BEGIN IMMEDIATE (mode "write") or
//                                       a read transaction (mode "read") on the file
//   { type: "query", id, sql, args? } → { type: "rows", id, rows }
//   { type: "exec", sql }             → nothing (an error is reported and ends the thread)
//   { type: "insert", table, columns, values, fixed?, where?, onConflict? }
//                                     → nothing; values is flat, row after row; fixed is
//                                       [[column, integer], …], the same for every row; see
//                                       insertRows
//   { type: "commit", sql, query }    → { type: "committed", rows, busyMs }: runs sql, reads
//                                       query, commits; busyMs says where the thread's time
//                                       went (for the import's log)
//   { type: "rollback" }              → { type: "rolledBack" }
// Any error answers { type: "error", message } after rolling back.
import { parentPort } from "node:worker_threads";
import Database from "libsql";

if (!parentPort) throw new Error("db-worker.mjs runs as a worker thread");
const port = parentPort;
let db = null;
let isOpen = false;
/** Prepared multi-row INSERTs by shape (table, columns, condition, rows per statement). */
const statements = new Map();

/** Rows per prepared INSERT: few enough parameters, large enough to bind in bulk. */
const ROWS_PER_STATEMENT = 100;
const IDENTIFIER = /^[a-z_][a-z0-9_]*$/;

function prepared(msg, rows) {
  const fixed = msg.fixed ?? [];
  const key = `${msg.table}|${msg.columns.join(",")}|${fixed.join(",")}|${msg.where ?? ""}|${msg.onConflict ? 1 : 0}|${rows}`;
  let statement = statements.get(key);
  if (!statement) {
    const names = [...msg.columns, ...fixed.map(([c]) => c)];
    if (!IDENTIFIER.test(msg.table) || !names.every((c) => IDENTIFIER.test(c))) {
      throw new Error("insert: table and column names must be plain identifiers");
    }
    if (!fixed.every(([, v]) => Number.isSafeInteger(v))) {
      throw new Error("insert: fixed values must be integers");
    }
    // Fixed values (the organisation's and the import's ids) are written into the statement,
    // after the bound ones: every bound value costs the binding about 0.1 µs or more.
    const tuple = `(${[...msg.columns.map(() => "?"), ...fixed.map(([, v]) => String(v))].join(",")})`;
    const list = Array.from({ length: rows }, () => tuple).join(",");
    const head = `insert into ${msg.table} (${names.join(",")})`;
    // Columns of a VALUES list are named column1, column2, … (for the condition).
    const sql = msg.where
      ? `${head} select * from (values ${list}) where ${msg.where}`
      : `${head} values ${list}${msg.onConflict ? " on conflict do nothing" : ""}`;
    statement = db.prepare(sql);
    statements.set(key, statement);
  }
  return statement;
}

/**
 * Inserts rows given as one flat array through prepared statements with bound parameters:
 * several times cheaper for SQLite than compiling the same values as SQL text.
 */
function insertRows(msg) {
  const width = msg.columns.length;
  const count = msg.values.length / width;
  if (!Number.isInteger(count)) throw new Error("insert: values do not fill whole rows");
  let at = 0;
  const full = Math.floor(count / ROWS_PER_STATEMENT);
  if (full > 0) {
    const statement = prepared(msg, ROWS_PER_STATEMENT);
    const size = ROWS_PER_STATEMENT * width;
    for (let i = 0; i < full; i++, at += size) statement.run(msg.values.slice(at, at + size));
  }
  const rest = count - full * ROWS_PER_STATEMENT;
  if (rest > 0) prepared(msg, rest).run(msg.values.slice(at));
}

function rollback() {
  if (db && isOpen) {
    try {
      db.exec("rollback");
    } catch {
      // nothing was written, or the connection is gone: either way nothing is committed
    }
  }
  isOpen = false;
}

function close() {
  rollback();
  statements.clear();
  busyMs = {};
  try {
    db?.close();
  } catch {
    // already closed
  }
  db = null;
}

/** Milliseconds spent per kind of work, reported at commit. */
let busyMs = {};
function timed(what, work) {
  const started = performance.now();
  const result = work();
  busyMs[what] = Math.round((busyMs[what] ?? 0) + performance.now() - started);
  return result;
}

port.on("message", (msg) => {
  try {
    switch (msg.type) {
      case "open":
        db = new Database(msg.path);
        if (msg.mode === "read") {
          db.exec("pragma busy_timeout = 10000");
          // A read transaction: every query sees the same snapshot of the data.
          db.exec("begin");
          db.prepare("select 1 from sqlite_schema limit 1").all();
          isOpen = true;
          port.postMessage({ type: "opened" });
          break;
        }
        // Another import may hold the write lock for a while: wait for it here, off the main
        // thread, rather than fail the job.
        db.exec("pragma busy_timeout = 60000");
        // As the app's own connections (db/index.ts): WAL's commit without a sync of the log.
        db.exec("pragma synchronous = normal");
        // No checkpoint inside the commit: it runs after the import is reported committed
        // (see "commit" below), so nobody waits for the log to be copied into the database.
        db.exec("pragma wal_autocheckpoint = 0");
        // Rows reference only ids this import gave out or read under its write lock, so
        // referential integrity holds by construction (tests check it with foreign_key_check);
        // per-row foreign-key lookups would cost a third of the writing time.
        db.exec("pragma foreign_keys = off");
        // A larger page cache for this one connection: index inserts of a large import touch
        // many pages, and SQLite's default (2 MB) makes it spill and re-read them.
        db.exec(`pragma cache_size = -${Math.max(2048, Math.trunc(msg.cacheKb))}`);
        db.exec("begin immediate");
        isOpen = true;
        port.postMessage({ type: "opened" });
        break;
      case "query":
        port.postMessage({
          type: "rows",
          id: msg.id,
          rows: db.prepare(msg.sql).all(msg.args ?? []),
        });
        break;
      case "exec":
        timed("sql", () => db.exec(msg.sql));
        break;
      case "insert":
        timed(msg.table, () => insertRows(msg));
        break;
      case "commit": {
        if (msg.sql) timed("final", () => db.exec(msg.sql));
        const rows = msg.query ? db.prepare(msg.query).all() : [];
        timed("commit", () => db.exec("commit"));
        isOpen = false;
        port.postMessage({ type: "committed", rows, busyMs });
        // The import is in and visible; now copy the write-ahead log into the database file
        // (what SQLite's automatic checkpoint would do at commit), then end the thread.
        try {
          db.exec("pragma wal_checkpoint(passive)");
        } catch {
          // a later commit of any connection checkpoints instead
        }
        close();
        port.close();
        break;
      }
      case "rollback":
        close();
        port.postMessage({ type: "rolledBack" });
        break;
      default:
        throw new Error(`unknown message ${msg.type}`);
    }
  } catch (e) {
    close();
    port.postMessage({ type: "error", message: e instanceof Error ? e.message : String(e) });
  }
});
