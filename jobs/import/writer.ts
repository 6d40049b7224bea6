import { join } from "node:path";
import { Worker } from "node:worker_threads";

/** Chunks of SQL queued for the writer before the reader waits for it to catch up. */
const MAX_IN_FLIGHT = 4;

type Reply =
  | { type: "opened" }
  | { type: "rows"; id: number; rows: Record<string, unknown>[] }
  | { type: "committed"; rows: Record<string, unknown>[]; busyMs: Record<string, number> }
  | { type: "rolledBack" }
  | { type: "error"; message: string };

/**
 * The main thread's side of jobs/import/writer-thread.mjs: one write transaction on a local
 * database file, held by a worker thread while this thread reads and checks the file. SQL
 * text is posted in chunks (at most MAX_IN_FLIGHT waiting, so memory stays bounded); nothing
 * is visible to anyone until commit, and a crash or rollback leaves nothing behind.
 */
export class ImportWriter {
  private readonly worker: Worker;
  private failure: Error | null = null;
  private waiters: {
    accept: (r: Reply) => boolean;
    resolve: (r: Reply) => void;
    reject: (e: Error) => void;
  }[] = [];
  /** One promise per queued chunk, settled when the writer has run it. */
  private pending: Promise<unknown>[] = [];
  private nextId = 1;
  private isClosed = false;

  private constructor() {
    // Started by path (not bundled), from the app's folder, so the Next.js server and the
    // command line load the same file.
    this.worker = new Worker(join(process.cwd(), "jobs", "import", "writer-thread.mjs"));
    this.worker.on("message", (msg: Reply) => this.receive(msg));
    this.worker.on("error", (e) => this.fail(e));
    this.worker.on("exit", (code) => {
      if (!this.isClosed) this.fail(new Error(`the import writer stopped (exit code ${code})`));
    });
  }

  /** Opens the file and takes the write lock (BEGIN IMMEDIATE); waits behind other writers. */
  static async open(path: string, cacheKb = 16_384): Promise<ImportWriter> {
    const writer = new ImportWriter();
    try {
      await writer.request({ type: "open", path, cacheKb }, (r) => r.type === "opened");
    } catch (e) {
      await writer.close();
      throw e;
    }
    return writer;
  }

  private receive(msg: Reply) {
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

  private request(message: object, accept: (r: Reply) => boolean): Promise<Reply> {
    if (this.failure) return Promise.reject(this.failure);
    return new Promise<Reply>((resolve, reject) => {
      this.waiters.push({ accept, resolve, reject });
      this.worker.postMessage(message);
    });
  }

  /** Rows of a read inside the transaction (it sees this import's own writes). */
  async query<T>(sql: string): Promise<T[]> {
    const id = this.nextId++;
    const reply = await this.request(
      { type: "query", id, sql },
      (r) => r.type === "rows" && r.id === id,
    );
    return (reply as { rows: T[] }).rows;
  }

  /** Queues SQL text to run in the transaction (an error is reported by the next await). */
  run(sql: string): void {
    if (!this.failure) this.worker.postMessage({ type: "exec", sql });
  }

  /**
   * Queues rows for a prepared multi-row INSERT; `values` holds them one after another, in the
   * order of `columns`. With `where`, each row is inserted only if the condition (on column1,
   * column2, … of the row) holds; with `onConflict`, a row that breaks a unique index is skipped.
   */
  insert(
    table: string,
    columns: readonly string[],
    values: (string | number | null)[],
    opts: { where?: string; onConflict?: boolean } = {},
  ): void {
    if (this.failure || values.length === 0) return;
    this.worker.postMessage({ type: "insert", table, columns, values, ...opts });
  }

  /**
   * Ends a chunk of queued work. Resolves at once unless MAX_IN_FLIGHT chunks are still
   * waiting, then when the writer has caught up by one; rejects if the writer failed.
   */
  async endChunk(): Promise<void> {
    if (this.failure) throw this.failure;
    // The thread answers run and insert with nothing; a trivial query after them marks them done.
    const done = this.query("select 1");
    done.catch(() => {}); // the failure is reported by the next awaited call
    this.pending.push(done);
    if (this.pending.length > MAX_IN_FLIGHT) await this.pending.shift();
  }

  /**
   * Runs the last SQL, reads `query`, and commits. The thread then checkpoints the log and
   * ends by itself; nobody waits for it (it does not keep the process alive either).
   */
  async commit(
    sql: string,
    query?: string,
  ): Promise<{ rows: Record<string, unknown>[]; busyMs: Record<string, number> }> {
    const reply = await this.request({ type: "commit", sql, query }, (r) => r.type === "committed");
    this.isClosed = true;
    this.worker.unref();
    return reply as { rows: Record<string, unknown>[]; busyMs: Record<string, number> };
  }

  /** Abandons everything written; safe to call after a failure. */
  async rollback(): Promise<void> {
    if (!this.failure && !this.isClosed) {
      await this.request({ type: "rollback" }, (r) => r.type === "rolledBack").catch(() => {});
    }
    await this.close();
  }

  private async close() {
    if (this.isClosed) return;
    this.isClosed = true;
    await this.worker.terminate();
  }
}
