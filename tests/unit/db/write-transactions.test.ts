import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Worker } from "node:worker_threads";
import { sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { openDatabase, type Db } from "@/db";
import type { Client } from "@libsql/client";

const pause = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Two write transactions of one process on a local file (db/index.ts serialiseWrites):
 * without the queue the second one's BEGIN waits inside a synchronous call, the first can never
 * commit, and after the 10 s busy timeout one fails with SQLITE_BUSY.
 */
describe("write transactions of one process on a file", () => {
  let db: Db;
  let client: Client;
  beforeAll(async () => {
    const dir = mkdtempSync(join(tmpdir(), "recurra-tx-"));
    ({ db, client } = await openDatabase(`file:${join(dir, "tx.db")}`));
    await db.run(sql`create table t (n integer)`);
  });
  afterAll(() => client.close());

  test("run one after the other, each whole, without waiting out the busy timeout", async () => {
    const order: string[] = [];
    const started = performance.now();
    const write = (name: string, n: number) =>
      db.transaction(async (tx) => {
        order.push(`${name} begins`);
        await tx.run(sql`insert into t values (${n})`);
        await pause(50); // other work of the process runs meanwhile
        await tx.run(sql`insert into t values (${n + 1})`);
        order.push(`${name} commits`);
      });
    await Promise.all([write("a", 1), write("b", 10), write("c", 100)]);
    expect(performance.now() - started).toBeLessThan(2_000);
    expect(order).toEqual([
      "a begins",
      "a commits",
      "b begins",
      "b commits",
      "c begins",
      "c commits",
    ]);
    const rows = await db.all<{ n: number }>(sql`select n from t order by n`);
    expect(rows.map((r) => r.n)).toEqual([1, 2, 10, 11, 100, 101]);
  });

  test("a rolled-back transaction lets the next one in, and its rows are gone", async () => {
    await db.run(sql`delete from t`);
    const failing = db.transaction(async (tx) => {
      await tx.run(sql`insert into t values (7)`);
      await pause(20);
      throw new Error("changed my mind");
    });
    const next = db.transaction(async (tx) => {
      await tx.run(sql`insert into t values (8)`);
    });
    await expect(failing).rejects.toThrow("changed my mind");
    await next;
    expect(await db.all(sql`select n from t`)).toEqual([{ n: 8 }]);
  });

  test("a write statement or batch outside the transaction waits for its commit, not the busy timeout", async () => {
    await db.run(sql`delete from t`);
    const order: string[] = [];
    let finish!: () => void;
    const held = new Promise<void>((resolve) => (finish = resolve));
    const writing = db.transaction(async (tx) => {
      await tx.run(sql`insert into t values (20)`);
      await held;
      order.push("transaction commits");
    });
    await pause(10);
    const single = db.run(sql`insert into t values (21)`).then(() => order.push("statement"));
    const batch = db
      .batch([db.run(sql`insert into t values (22)`), db.run(sql`update t set n = n where n = 22`)])
      .then(() => order.push("batch"));
    await pause(50);
    expect(order).toEqual([]); // both wait, and the event loop runs meanwhile
    const started = performance.now();
    finish();
    await Promise.all([writing, single, batch]);
    expect(performance.now() - started).toBeLessThan(1_000);
    expect(order).toEqual(["transaction commits", "statement", "batch"]);
    const rows = await db.all<{ n: number }>(sql`select n from t order by n`);
    expect(rows.map((r) => r.n)).toEqual([20, 21, 22]);
  });

  test("reads are not queued behind an open write transaction", async () => {
    await db.run(sql`delete from t`);
    await db.run(sql`insert into t values (8)`);
    let release!: () => void;
    const held = new Promise<void>((resolve) => (release = resolve));
    const writing = db.transaction(async (tx) => {
      await tx.run(sql`insert into t values (9)`);
      await held;
    });
    try {
      await pause(20);
      const started = performance.now();
      // The committed rows, not the open transaction's (WAL: readers see the last commit).
      expect(await db.all(sql`select n from t order by n`)).toEqual([{ n: 8 }]);
      expect(await client.execute("select count(*) as c from t")).toMatchObject({
        rows: [{ c: 1 }],
      });
      expect(performance.now() - started).toBeLessThan(500);
    } finally {
      release();
      await writing;
    }
  });

  test("a writer in another thread: a transaction waits for it without holding the event loop", async () => {
    // Another thread takes the write lock for 400 ms (as an import's writer thread does).
    const path = (await client.execute("pragma database_list")).rows[0]!.file as string;
    const holder = new Worker(
      `const { parentPort, workerData } = require("node:worker_threads");
       const Database = require("libsql");
       const db = new Database(workerData);
       db.exec("begin immediate");
       db.exec("insert into t values (500)");
       parentPort.postMessage("locked");
       setTimeout(() => { db.exec("commit"); db.close(); parentPort.postMessage("released"); }, 400);`,
      { eval: true, workerData: path },
    );
    const messages: string[] = [];
    const locked = new Promise<void>((resolve) =>
      holder.on("message", (m: string) => {
        messages.push(m);
        if (m === "locked") resolve();
      }),
    );
    await locked;
    let ticks = 0;
    const ticker = setInterval(() => ticks++, 20);
    try {
      const started = performance.now();
      await db.transaction(async (tx) => {
        await tx.run(sql`insert into t values (501)`);
      });
      const waited = performance.now() - started;
      // It went in after the other thread's commit, and the loop kept running meanwhile.
      expect(messages).toEqual(["locked", "released"]);
      expect(waited).toBeGreaterThan(300);
      expect(waited).toBeLessThan(5_000);
      expect(ticks).toBeGreaterThan(5);
    } finally {
      clearInterval(ticker);
      await holder.terminate();
    }
    const rows = await db.all<{ n: number }>(sql`select n from t where n >= 500 order by n`);
    expect(rows.map((r) => r.n)).toEqual([500, 501]);
  });
});
