import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { listFaultNames } from "@/db/queries/reference";
import { loadReferenceData } from "@/db/seed/reference";
import { createTestDb } from "../../support/test-db";

let db: Db;

beforeAll(async () => {
  ({ db } = await createTestDb());
  await loadReferenceData(db);
}, 60_000);

describe("listFaultNames (the shared catalogue's names for cells' faults)", () => {
  test("a DTC with its description, a component as system → name, keyed like fault keys", async () => {
    const names = await listFaultNames(db, [
      { dtc: "P0496", component: null },
      { dtc: null, component: "power-distribution/body-ground" },
      { dtc: "P0496", component: null },
    ]);
    expect(Object.fromEntries(names)).toEqual({
      "dtc:P0496": "P0496 — Purge flow seen while the purge valve should be shut",
      "component:power-distribution/body-ground": "Power distribution → Body ground strap",
    });
  });

  test("codes and slugs outside the catalogue keep a readable name; none asked, none read", async () => {
    const names = await listFaultNames(db, [
      { dtc: "P3999", component: null },
      { dtc: null, component: "made-up/odd-part" },
    ]);
    expect(names.get("dtc:P3999")).toBe("P3999");
    expect(names.get("component:made-up/odd-part")).toBe("Made up → Odd part");
    expect((await listFaultNames(db, [])).size).toBe(0);
  });
});
