import { describe, expect, it } from "vitest";
import { memoText } from "@/lib/import/memo";

describe("memoText", () => {
  it("works each text out once, including texts whose answer is null", () => {
    const calls: string[] = [];
    const lookup = memoText((t: string) => {
      calls.push(t);
      return t.startsWith("x") ? null : t.length;
    });
    expect([lookup("abc"), lookup("xy"), lookup("abc"), lookup("xy")]).toEqual([3, null, 3, null]);
    expect(calls).toEqual(["abc", "xy"]);
  });

  it("starts again past its limit and still answers the same", () => {
    const calls: string[] = [];
    const lookup = memoText((t: string) => {
      calls.push(t);
      return t.toUpperCase();
    }, 2);
    expect(["a", "b", "c", "a"].map(lookup)).toEqual(["A", "B", "C", "A"]);
    // "c" found the memo full (a, b) and started it again, so "a" was worked out twice.
    expect(calls).toEqual(["a", "b", "c", "a"]);
  });
});
