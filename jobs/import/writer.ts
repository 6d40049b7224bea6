import { DbThread } from "../db-thread";

/** Chunks of SQL queued for the writer before the reader waits for it to catch up. */
const MAX_IN_FLIGHT = 4;

/**
 * The main thread's side of jobs/db-worker.mjs in write mode: one write transaction on a local
 * database file, held by a worker thread while this thread reads and checks the file. SQL
 * text is posted in chunks (at most MAX_IN_FLIGHT waiting, so memory stays bounded); nothing
 * is visible to anyone until commit, and a crash or rollback leaves nothing behind.
 */
export class ImportWriter extends DbThread {
  /** One promise per queued chunk, settled when the writer has run it. */
  private pending: Promise<unknown>[] = [];

  /**
   * Opens the file and takes the write lock (BEGIN IMMEDIATE); waits behind other writers. The
   * page cache holds the indexes that a large import inserts into at scattered places; at 1M
   * repair lines (bench:import, three alternating runs each) 16 MB gave 30,800 rows/s, 32 MB
   * 39,600 and 48 MB 36,000, with peak RSS 240–247, 262–270 and 278–283 MB.
   */
  static open(path: string, cacheKb = 32_768): Promise<ImportWriter> {
    return DbThread.start(new ImportWriter(), path, "write", cacheKb);
  }

  /** Queues SQL text to run in the transaction (an error is reported by the next await). */
  run(sql: string): void {
    if (!this.failure) this.worker.postMessage({ type: "exec", sql });
  }

  /**
   * Queues rows for a prepared multi-row INSERT; `values` holds them one after another, in the
   * order of `columns`; `fixed` columns take the same integer in every row (written into the
   * statement, not bound). With `where`, each row is inserted only if the condition (on column1,
   * column2, … of the row, the fixed ones last) holds; with `onConflict`, a row that breaks a
   * unique index is skipped.
   */
  insert(
    table: string,
    columns: readonly string[],
    values: (string | number | null)[],
    opts: { fixed?: [string, number][]; where?: string; onConflict?: boolean } = {},
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
}
