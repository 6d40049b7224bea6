import { beforeEach, describe, expect, test, vi } from "vitest";
import { z } from "zod";
import { ConflictError, ForbiddenError } from "@/db/queries/scope";
import type { AuthState } from "@/lib/auth/guard";

const state = vi.hoisted(() => ({ current: { status: "signed-out" } as AuthState }));
vi.mock("@/lib/auth/guard", () => ({ getAuthState: async () => state.current }));

const { runAction, runPublicAction, formToObject } = await import("@/lib/auth/action");

function signedIn(role: "admin" | "manager" | "technician" | "viewer"): AuthState {
  const organisation = {
    organisationId: 7,
    slug: "t",
    name: "T",
    kind: "fleet" as const,
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

const Schema = z.object({ name: z.string().min(2), count: z.coerce.number().int() });
const form = (fields: Record<string, string>) => {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.set(k, v);
  return fd;
};

describe("runAction: authenticate → authorise → validate → run", () => {
  const fn = vi.fn(async () => ({ ok: true as const, message: "done" }));
  beforeEach(() => fn.mockClear());

  test("signed out: refused before anything runs", async () => {
    state.current = { status: "signed-out" };
    const r = await runAction("vehicles:write", Schema, form({ name: "ab", count: "1" }), fn);
    expect(r).toEqual({ ok: false, message: "Your session has ended. Sign in again." });
    expect(fn).not.toHaveBeenCalled();
  });

  test("expired session: refused the same way", async () => {
    state.current = { status: "expired" };
    const r = await runAction("vehicles:write", Schema, form({ name: "ab", count: "1" }), fn);
    expect(r.ok).toBe(false);
    expect(fn).not.toHaveBeenCalled();
  });

  test("a viewer posting a write is refused, even with valid input", async () => {
    state.current = signedIn("viewer");
    const r = await runAction("vehicles:write", Schema, form({ name: "ab", count: "1" }), fn);
    expect(r).toEqual({ ok: false, message: "Your role (viewer) may not do this." });
    expect(fn).not.toHaveBeenCalled();
  });

  test("invalid input returns field errors and runs nothing", async () => {
    state.current = signedIn("manager");
    const r = await runAction("vehicles:write", Schema, form({ name: "a", count: "x" }), fn);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(Object.keys(r.fieldErrors ?? {}).sort()).toEqual(["count", "name"]);
    expect(fn).not.toHaveBeenCalled();
  });

  test("valid input runs with the parsed values and the caller's scope", async () => {
    state.current = signedIn("manager");
    const r = await runAction("vehicles:write", Schema, form({ name: "ab", count: "12" }), fn);
    expect(r).toEqual({ ok: true, message: "done" });
    expect(fn).toHaveBeenCalledWith(
      { name: "ab", count: 12 },
      expect.objectContaining({ organisationId: 7, role: "manager" }),
    );
  });

  test("known data-layer errors become messages; unknown ones a generic message", async () => {
    state.current = signedIn("admin");
    const conflict = await runAction(
      "vehicles:write",
      Schema,
      form({ name: "ab", count: "1" }),
      async () => {
        throw new ConflictError("Already exists.");
      },
    );
    expect(conflict).toEqual({ ok: false, message: "Already exists." });
    const forbidden = await runAction(
      "vehicles:write",
      Schema,
      form({ name: "ab", count: "1" }),
      async () => {
        throw new ForbiddenError("No.");
      },
    );
    expect(forbidden).toEqual({ ok: false, message: "No." });
    const spy = vi.spyOn(console, "error").mockImplementation(() => {});
    const crash = await runAction(
      "vehicles:write",
      Schema,
      form({ name: "ab", count: "1" }),
      async () => {
        throw new Error("SQLITE_CONSTRAINT: secret detail");
      },
    );
    spy.mockRestore();
    expect(crash.ok).toBe(false);
    expect(JSON.stringify(crash)).not.toContain("SQLITE");
  });

  test("formToObject drops empty strings so optional fields stay optional", () => {
    expect(formToObject(form({ a: " ", b: "x" }))).toEqual({ a: undefined, b: "x" });
  });
});

describe("runPublicAction: validate → run, for the invitation link", () => {
  test("needs no session, still validates, and maps errors like runAction", async () => {
    state.current = { status: "signed-out" };
    const fn = vi.fn(async () => ({ ok: true as const }));
    const bad = await runPublicAction(Schema, form({ name: "a", count: "1" }), fn);
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(Object.keys(bad.fieldErrors ?? {})).toEqual(["name"]);
    expect(fn).not.toHaveBeenCalled();
    expect(await runPublicAction(Schema, form({ name: "ab", count: "1" }), fn)).toEqual({
      ok: true,
    });
    expect(fn).toHaveBeenCalledWith({ name: "ab", count: 1 });
    const used = await runPublicAction(Schema, form({ name: "ab", count: "1" }), async () => {
      throw new ConflictError("This invitation has already been used.");
    });
    expect(used).toEqual({ ok: false, message: "This invitation has already been used." });
    const spy = vi.spyOn(console, "error").mockImplementation(() => {});
    const crash = await runPublicAction(Schema, form({ name: "ab", count: "1" }), async () => {
      throw new Error("SQLITE_BUSY: database is locked");
    });
    spy.mockRestore();
    expect(JSON.stringify(crash)).not.toContain("SQLITE");
  });
});
