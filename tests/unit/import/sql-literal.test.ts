import { createClient } from "@libsql/client";
import { afterAll, describe, expect, test } from "vitest";
import { insertStatements, sqlInt, sqlLiteral } from "@/jobs/import/sql-literal";

// SQLite itself reads the literals back: what goes into SQL text must come out unchanged.
const client = createClient({ url: ":memory:" });
afterAll(() => client.close());

async function readBack(literal: string): Promise<unknown> {
  const rs = await client.execute(`select ${literal} as v`);
  return rs.rows[0]?.v;
}

describe("sqlLiteral", () => {
  test("text comes back from SQLite exactly, quotes and all", async () => {
    const cases = [
      "plain",
      "it's",
      "''",
      "'; drop table vehicles; --",
      '=HYPERLINK("x")',
      "line\nbreak",
      "back\\slash",
      "ünïcode ✓",
      "",
    ];
    for (const text of cases) expect(await readBack(sqlLiteral(text))).toBe(text);
  });

  test("NUL characters are dropped (they cannot travel in SQL text)", async () => {
    expect(await readBack(sqlLiteral("a\u0000b'c"))).toBe("ab'c");
  });

  test("numbers, booleans and missing values", async () => {
    expect(await readBack(sqlLiteral(42))).toBe(42);
    expect(await readBack(sqlLiteral(-1.25))).toBe(-1.25);
    expect(await readBack(sqlLiteral(true))).toBe(1);
    expect(await readBack(sqlLiteral(false))).toBe(0);
    expect(await readBack(sqlLiteral(null))).toBeNull();
    expect(await readBack(sqlLiteral(undefined))).toBeNull();
  });

  test("what cannot be stored is refused", () => {
    expect(() => sqlLiteral(Number.NaN)).toThrow();
    expect(() => sqlLiteral(Number.POSITIVE_INFINITY)).toThrow();
    expect(() => sqlLiteral({} as unknown as string)).toThrow();
  });
});

describe("sqlInt", () => {
  test("safe whole numbers at or above the minimum pass; anything else is refused", () => {
    expect(sqlInt(0)).toBe(0);
    expect(sqlInt(7, 1)).toBe(7);
    expect(() => sqlInt(0, 1)).toThrow();
    expect(() => sqlInt(-1)).toThrow();
    expect(() => sqlInt(1.5)).toThrow();
    expect(() => sqlInt(Number.NaN)).toThrow();
    expect(() => sqlInt(2 ** 53)).toThrow();
  });
});

describe("insertStatements", () => {
  test("rows are split into statements that SQLite runs as written", async () => {
    await client.execute("create table t (a integer, b text)");
    const rows = Array.from({ length: 7 }, (_, i) => [i, `it's ${i}`]);
    const statements = insertStatements("t", ["a", "b"], rows, 3);
    expect(statements).toHaveLength(3);
    for (const s of statements) await client.execute(s);
    const rs = await client.execute("select a, b from t order by a");
    expect(rs.rows.map((r) => [r.a, r.b])).toEqual(rows);
  });

  test("names must be plain identifiers, and rows must match the columns", () => {
    expect(() => insertStatements("t; drop", ["a"], [[1]])).toThrow();
    expect(() => insertStatements("t", ["a b"], [[1]])).toThrow();
    expect(() => insertStatements("t", ["a", "b"], [[1]])).toThrow();
    expect(insertStatements("t", ["a"], [])).toEqual([]);
  });
});
