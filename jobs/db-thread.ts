import { join } from "node:path";
import { Worker } from "node:worker_threads";

export type ThreadReply =
  | { type: "opened" }
  | { type: "rows"; id: number; rows: Record<string, unknown>[] }
  | { type: "committed"; rows: Record<string, unknown>[]; busyMs: Record<string, number> }
  | { type: "rolledBack" }
  | { type: "error"; message: string };

/**
 * The main thread's side of jobs/db-worker.mjs: a connection to a local database file in a
 * worker thread, holding one transaction (a write one for an import, jobs/import/writer.ts; a
 * read snapshot for queries that should run beside other work, readInThread below). Messages
 * are answered in order; the first error fails every later request.
 */
export class DbThread {
  protected readonly worker: Worker;
  protected failure: Error | null = null;
  protected isClosed = false;
  private waiters: {
    accept: (r: ThreadReply) => boolean;
    resolve: (r: ThreadReply) => void;
    reject: (e: Error) => void;
  }[] = [];
  private nextId = 1;

  protected constructor() {
    // Started by path (not bundled), from the app's folder, so the Next.js server and the
    // command line load the same file.
    this.worker = new Worker(join(process.cwd(), "jobs", "db-worker.mjs"));
    this.worker.on("message", (msg: ThreadReply) => this.receive(msg));
    this.worker.on("error", (e) => this.fail(e));
    this.worker.on("exit", (code) => {
      if (!this.isClosed) this.fail(new Error(`the database thread stopped (exit code ${code})`));
    });
  }

  /** Opens the file in the thread: BEGIN IMMEDIATE ("write"; waits behind other writers) or a
   * read snapshot ("read"). */
  protected static async start<T extends DbThread>(
    thread: T,
    path: string,
    mode: "read" | "write",
    cacheKb = 16_384,
  ): Promise<T> {
    try {
      await thread.request({ type: "open", path, cacheKb, mode }, (r) => r.type === "opened");
    } catch (e) {
      await thread.close();
      throw e;
    }
    return thread;
  }

  private receive(msg: ThreadReply) {
    if (msg.type === "error") {
      this.fail(new Error(msg.message));
      return;
    }
    const at = this.waiters.findIndex((w) => w.accept(msg));
    if (at >= 0) {
      const [w] = this.waiters.splice(at, 1);
      w?.resolve(msg);
    }
  }

  private fail(e: Error) {
    this.failure ??= e;
    for (const w of this.waiters.splice(0)) w.reject(this.failure);
  }

  protected request(message: object, accept: (r: ThreadReply) => boolean): Promise<ThreadReply> {
    if (this.failure) return Promise.reject(this.failure);
    return new Promise<ThreadReply>((resolve, reject) => {
      this.waiters.push({ accept, resolve, reject });
      this.worker.postMessage(message);
    });
  }

  /** Rows of a query inside the thread's transaction (a write one sees its own writes). */
  async query<T>(sql: string, args: (string | number | null)[] = []): Promise<T[]> {
    const id = this.nextId++;
    const reply = await this.request(
      { type: "query", id, sql, args },
      (r) => r.type === "rows" && r.id === id,
    );
    return (reply as { rows: T[] }).rows;
  }

  /** Ends the transaction without committing; safe to call after a failure. */
  async rollback(): Promise<void> {
    if (!this.failure && !this.isClosed) {
      await this.request({ type: "rollback" }, (r) => r.type === "rolledBack").catch(() => {});
    }
    await this.close();
  }

  protected async close() {
    if (this.isClosed) return;
    this.isClosed = true;
    await this.worker.terminate();
  }
}

class DbReader extends DbThread {
  /**
   * Opens a read snapshot and runs the queries, all posted at once: the thread runs them back
   * to back, without waiting for this thread (which may be busy meanwhile) to ask for each.
   */
  static async run(
    path: string,
    statements: { sql: string; args?: (string | number | null)[] }[],
  ): Promise<Record<string, unknown>[][]> {
    const reader = new DbReader();
    try {
      const opened = reader.request(
        { type: "open", path, cacheKb: 16_384, mode: "read" },
        (r) => r.type === "opened",
      );
      const rows = statements.map((s) => reader.query<Record<string, unknown>>(s.sql, s.args));
      for (const r of rows) r.catch(() => {}); // a failure is reported through `opened` or below
      await opened;
      return await Promise.all(rows);
    } finally {
      await reader.rollback();
    }
  }
}

/**
 * Runs read queries on one snapshot of a local database file in a worker thread, so that the
 * database works on a second core while this thread does something else; resolves with each
 * query's rows.
 */
export function readInThread(
  path: string,
  statements: { sql: string; args?: (string | number | null)[] }[],
): Promise<Record<string, unknown>[][]> {
  return DbReader.run(path, statements);
}
