import { describe, expect, test } from "vitest";
import {
  cellHref,
  cellsQuery,
  explorerParams,
  viewParams,
} from "@/components/patterns/query-strings";

const cell = {
  make: "Aurel",
  model: "Kestrel",
  generation: "K2",
  bandFrom: 60_000,
  bandTo: 80_000,
  dtc: "P0496",
  component: null,
};

describe("explorer query strings", () => {
  test("viewParams keeps only the period and vendor keys that are set", () => {
    expect(viewParams({})).toEqual({});
    expect(viewParams({ from: "2025-01-01", to: "", vendor: "Bay 2" })).toEqual({
      from: "2025-01-01",
      vendor: "Bay 2",
    });
  });

  test("a cell's address names its cohort, band number and fault, and carries the view", () => {
    const plain = new URL(cellHref(cell), "http://x");
    expect(plain.pathname).toBe("/patterns/cell");
    expect(Object.fromEntries(plain.searchParams)).toEqual({
      make: "Aurel",
      model: "Kestrel",
      generation: "K2",
      band: "3", // 60,000–80,000 is the fourth band of 20,000 (from 0)
      fault: "P0496",
    });
    const viewed = new URL(
      cellHref(
        { ...cell, dtc: null, component: "fuel-vapour/purge-valve" },
        {
          from: "2025-01-01",
          to: "2025-06-30",
          vendor: "Harbour & Sons",
        },
      ),
      "http://x",
    );
    expect(viewed.searchParams.get("fault")).toBe("fuel-vapour/purge-valve");
    expect(viewed.searchParams.get("vendor")).toBe("Harbour & Sons");
    expect(viewed.searchParams.get("from")).toBe("2025-01-01");
    expect(viewed.searchParams.get("to")).toBe("2025-06-30");
  });

  test("the explorer's state falls back to known views and metrics, and pages by 25", () => {
    const p = explorerParams({ view: "nonsense", metric: "ratio", page: "3", junk: "x" });
    expect(p).toMatchObject({ view: "cohorts", metric: "ratio", page: "3" });
    expect(p).not.toHaveProperty("junk");
    const q = new URLSearchParams(cellsQuery(p));
    expect(q.get("limit")).toBe("25");
    expect(q.get("offset")).toBe("50");
  });
});
