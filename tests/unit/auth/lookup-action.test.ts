import { beforeEach, describe, expect, test, vi } from "vitest";
import type { AuthState } from "@/lib/auth/guard";

// The action's own checks, with the session, the database and the data layer stood in for
// (the data layer's refusals are tested on the demo in tests/unit/db/lookup.test.ts).
const state = vi.hoisted(() => ({ current: { status: "signed-out" } as AuthState }));
const recordFinding = vi.hoisted(() =>
  vi.fn(async () => ({ findingId: 9, roNumber: "F-9", repairLineId: 4, emailed: 0 })),
);
const revalidatePath = vi.hoisted(() => vi.fn());
vi.mock("@/lib/auth/guard", () => ({ getAuthState: async () => state.current }));
vi.mock("@/db", () => ({ getDb: async () => ({}) }));
vi.mock("@/db/queries/lookup", () => ({ recordFinding }));
vi.mock("next/cache", () => ({ revalidatePath }));

const { recordFindingAction } = await import("@/app/(app)/lookup/actions");

function signedIn(role: "admin" | "manager" | "technician" | "viewer"): AuthState {
  const organisation = {
    organisationId: 7,
    slug: "t",
    name: "T",
    kind: "shop" as const,
    distanceUnit: "mi" as const,
    role,
  };
  return {
    status: "signed-in",
    auth: {
      organisationId: 7,
      userId: 3,
      role,
      user: { id: 3, email: "u@x.example", name: "U" },
      organisation,
      memberships: [organisation],
    },
  };
}

const form = (fields: Record<string, string>) => {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.set(k, v);
  return fd;
};
const confirmed = { vehicleId: "12", knownIssueId: "5", outcome: "confirmed", dtcCodes: "P0496" };

describe("recordFindingAction", () => {
  beforeEach(() => {
    recordFinding.mockClear();
    revalidatePath.mockClear();
  });

  test("a viewer is refused and nothing is written", async () => {
    state.current = signedIn("viewer");
    const r = await recordFindingAction(null, form(confirmed));
    expect(r).toEqual({ ok: false, message: "Your role (viewer) may not do this." });
    expect(recordFinding).not.toHaveBeenCalled();
  });

  test("signed out: refused", async () => {
    state.current = { status: "signed-out" };
    expect((await recordFindingAction(null, form(confirmed))).ok).toBe(false);
    expect(recordFinding).not.toHaveBeenCalled();
  });

  test("bad input: field messages, nothing written", async () => {
    state.current = signedIn("technician");
    const r = await recordFindingAction(
      null,
      form({ vehicleId: "12", outcome: "something-else", dtcCodes: "P0496 nope" }),
    );
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(Object.keys(r.fieldErrors ?? {}).sort()).toEqual(["cause", "dtcCodes"]);
    expect(recordFinding).not.toHaveBeenCalled();
  });

  test("a technician records it with the session's organisation; lookup and issue revalidated", async () => {
    state.current = signedIn("technician");
    const r = await recordFindingAction(null, form({ ...confirmed, organisationId: "99" }));
    expect(r).toMatchObject({ ok: true, message: expect.stringContaining("F-9") });
    const [, scope, input] = recordFinding.mock.calls[0] as unknown as [
      unknown,
      { organisationId: number; role: string },
      Record<string, unknown>,
    ];
    expect(scope).toMatchObject({ organisationId: 7, role: "technician" });
    expect(input).toMatchObject({ vehicleId: 12, knownIssueId: 5, outcome: "confirmed" });
    expect(input).not.toHaveProperty("organisationId");
    expect(revalidatePath.mock.calls.map((c) => c[0])).toEqual(["/lookup", "/known-issues/5"]);
  });
});
