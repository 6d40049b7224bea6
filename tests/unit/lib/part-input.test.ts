import { describe, expect, test } from "vitest";
import { describePartChange } from "@/lib/part-changes";
import {
  CostCents,
  CountPartsInput,
  DeletePartInput,
  NewPartInput,
  ReceivePartsInput,
} from "@/lib/part-input";

const issues = (r: {
  success: boolean;
  error?: { issues: { path: PropertyKey[]; message: string }[] };
}) => Object.fromEntries((r.error?.issues ?? []).map((i) => [String(i.path[0]), i.message]));

describe("part form input (Recurra's own rules)", () => {
  test("a unit cost is read as people type money, in whole cents", () => {
    expect(CostCents.parse("12.5")).toBe(1250);
    expect(CostCents.parse("1,234.50")).toBe(123450);
    expect(CostCents.parse(" $0.29 ")).toBe(29);
    expect(CostCents.parse("")).toBeUndefined();
    // More than two decimals, a decimal comma and words are refused, not rounded or misread.
    for (const bad of ["12.345", "1,5", "twelve", "-3"]) {
      expect(CostCents.safeParse(bad).success, bad).toBe(false);
    }
  });

  test("a new part: number, description, whole quantities; blank on hand is 0", () => {
    expect(
      NewPartInput.parse({ partNumber: " PV-100 ", description: "Purge valve", onHand: "" }),
    ).toEqual({
      partNumber: "PV-100",
      description: "Purge valve",
      componentSlug: undefined,
      unitCostCents: undefined,
      leadTimeDays: undefined,
      onHand: 0,
    });
    // A server action's form data leaves an empty field out altogether.
    expect(NewPartInput.parse({ partNumber: "PV-1", description: "x" }).onHand).toBe(0);
    expect(
      NewPartInput.parse({
        partNumber: "A/B 7.2_x",
        description: "x",
        onHand: "1,200",
        leadTimeDays: "14",
      }),
    ).toMatchObject({ onHand: 1200, leadTimeDays: 14 });
    const bad = NewPartInput.safeParse({
      partNumber: "=HYPERLINK(1)",
      description: " ",
      onHand: "2.5",
      leadTimeDays: "400",
    });
    expect(issues(bad)).toEqual({
      partNumber: expect.stringMatching(/starting with a letter or digit/),
      description: "Enter a description.",
      onHand: "A whole number.",
      leadTimeDays: "At most 365.",
    });
  });

  test("a delivery is at least 1; a count may be 0; removing needs the tick", () => {
    expect(ReceivePartsInput.safeParse({ partId: "3", quantity: "0" }).success).toBe(false);
    expect(ReceivePartsInput.parse({ partId: "3", quantity: "12" })).toEqual({
      partId: 3,
      quantity: 12,
    });
    expect(issues(ReceivePartsInput.safeParse({ partId: "3" }))).toEqual({
      quantity: "Enter the quantity received.",
    });
    expect(CountPartsInput.parse({ partId: "3", onHand: "0" })).toEqual({ partId: 3, onHand: 0 });
    expect(issues(DeletePartInput.safeParse({ partId: "3" }))).toEqual({
      confirm: "Tick the box to confirm.",
    });
  });

  test("a part's changes in words", () => {
    expect(describePartChange("part.receive", { quantity: 6, from: 4, to: 10 })).toBe(
      "received 6 (4 → 10 on hand)",
    );
    expect(describePartChange("part.count", { from: 13, to: 11 })).toBe(
      "counted 11 on hand (the list said 13)",
    );
    expect(describePartChange("part.create", { onHand: 1200 })).toBe("added, 1,200 on hand");
    expect(describePartChange("part.count", null)).toBe("counted ? on hand (the list said ?)");
  });
});
