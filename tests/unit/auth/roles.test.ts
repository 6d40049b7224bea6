import { describe, expect, test } from "vitest";
import { ROLES } from "@/db/schema";
import { can, CAPABILITIES, type Capability } from "@/lib/auth/roles";

// Expected matrix written out from the product brief's "Roles" table (product.md):
// admin everything; manager imports, known issues, parts, campaigns, digests; technician
// lookup, vehicles, findings, comments; viewer read-only dashboards.
const EXPECTED: Record<(typeof ROLES)[number], Capability[]> = {
  admin: Object.keys(CAPABILITIES) as Capability[],
  manager: [
    "dashboard:read",
    "patterns:read",
    "known-issues:read",
    "known-issues:comment",
    "known-issues:manage",
    "refuel:read",
    "vehicles:read",
    "vehicles:write",
    "lookup:use",
    "findings:record",
    "stocking:read",
    "comebacks:read",
    "parts:manage",
    "imports:read",
    "imports:write",
    "campaigns:manage",
  ],
  technician: [
    "dashboard:read",
    "patterns:read",
    "known-issues:read",
    "known-issues:comment",
    "vehicles:read",
    "lookup:use",
    "findings:record",
  ],
  viewer: ["dashboard:read", "patterns:read", "known-issues:read", "refuel:read"],
};

describe("role capabilities", () => {
  for (const role of ROLES) {
    test(`${role} has exactly its capabilities`, () => {
      const granted = (Object.keys(CAPABILITIES) as Capability[]).filter((c) => can(role, c));
      expect(granted.sort()).toEqual([...EXPECTED[role]].sort());
    });
  }

  test("a viewer can change nothing", () => {
    const writes = (Object.keys(CAPABILITIES) as Capability[]).filter((c) => !c.endsWith(":read"));
    expect(writes.length).toBeGreaterThan(5);
    for (const c of writes) expect(can("viewer", c), c).toBe(false);
  });

  test("only admins manage members and settings", () => {
    for (const role of ROLES) {
      expect(can(role, "members:manage")).toBe(role === "admin");
      expect(can(role, "settings:manage")).toBe(role === "admin");
    }
  });
});
