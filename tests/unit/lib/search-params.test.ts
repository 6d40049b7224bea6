import { describe, expect, it } from "vitest";
import { z } from "zod";
import { parseOrDefaults, queryValues } from "@/lib/search-params";

describe("queryValues", () => {
  it("keeps one string per key: the first of a repeated key, none for a key without a value", async () => {
    const values = await queryValues(
      Promise.resolve({ a: "1", b: ["2", "3"], c: undefined, d: "", e: [] }),
    );
    expect(values).toEqual({ a: "1", b: "2", d: "" });
  });

  it("leaves out empty values when asked", async () => {
    const values = await queryValues(Promise.resolve({ a: "", b: ["", "x"], c: "y" }), {
      dropEmpty: true,
    });
    expect(values).toEqual({ c: "y" });
  });
});

describe("parseOrDefaults", () => {
  const Query = z.object({
    page: z.coerce.number().int().min(1).default(1),
    view: z.enum(["fault", "fix"]).default("fault"),
  });

  it("parses a good query", () => {
    expect(parseOrDefaults(Query, { page: "3", view: "fix" })).toEqual({
      query: { page: 3, view: "fix" },
      problem: null,
    });
  });

  it("falls back to every default when any value does not parse, and says why", () => {
    const low = parseOrDefaults(Query, { page: "0", view: "fix" });
    expect(low.query).toEqual({ page: 1, view: "fault" });
    expect(low.problem).toMatch(/>=\s*1/);
    const bad = parseOrDefaults(Query, { view: "nonsense" });
    expect(bad.query).toEqual({ page: 1, view: "fault" });
    expect(bad.problem).toMatch(/fault|fix/);
  });
});
