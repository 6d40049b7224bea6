import "server-only";
import { getServerSession } from "next-auth";
import { cookies } from "next/headers";
import { forbidden, redirect } from "next/navigation";
import { cache } from "react";
import { getDb } from "@/db";
import { listMembershipsOfUser, type MembershipSummary } from "@/db/queries/accounts";
import { ConflictError, ForbiddenError, NotFoundError, type OrgScope } from "@/db/queries/scope";
import { getAuthOptions } from "./options";
import { can, type Capability } from "./roles";

export type AuthContext = OrgScope & {
  userId: number;
  user: { id: number; email: string; name: string };
  organisation: MembershipSummary;
  memberships: MembershipSummary[];
};

export type AuthState =
  | { status: "signed-in"; auth: AuthContext }
  | { status: "signed-out" | "expired" }
  /** Signed in, but a member of no organisation (yet): may still accept an invitation. */
  | { status: "no-organisation"; user: { id: number; email: string; name: string } };

const SESSION_COOKIES = ["next-auth.session-token", "__Secure-next-auth.session-token"];

/**
 * The one server-side guard: who is signed in, in which organisation, with which role. The
 * role is read from the database on every request (never trusted from the token). Cached for
 * the duration of one request.
 */
export const getAuthState = cache(async (): Promise<AuthState> => {
  // Read the cookies first: it marks the page dynamic before anything touches the secret, and
  // next-auth deletes an invalid session cookie while reading it.
  const jar = await cookies();
  const hadSession = jar
    .getAll()
    .some((c) => SESSION_COOKIES.some((name) => c.name === name || c.name.startsWith(`${name}.`)));
  const session = await getServerSession(getAuthOptions());
  if (!session?.userId) return { status: hadSession ? "expired" : "signed-out" };
  const { user, memberships } = await listMembershipsOfUser(await getDb(), session.userId);
  if (!user) return { status: "signed-out" };
  const organisation =
    memberships.find((m) => m.organisationId === session.organisationId) ?? memberships[0];
  if (!organisation) return { status: "no-organisation", user };
  return {
    status: "signed-in",
    auth: {
      organisationId: organisation.organisationId,
      userId: user.id,
      role: organisation.role,
      user,
      organisation,
      memberships,
    },
  };
});

export async function getAuthContext(): Promise<AuthContext | null> {
  const state = await getAuthState();
  return state.status === "signed-in" ? state.auth : null;
}

/** For pages and layouts: signs the visitor in first, and answers 403 for a role that may not. */
export async function requirePage(capability?: Capability): Promise<AuthContext> {
  const state = await getAuthState();
  if (state.status !== "signed-in") {
    redirect(state.status === "signed-out" ? "/sign-in" : `/sign-in?reason=${state.status}`);
  }
  if (capability && !can(state.auth.role, capability)) forbidden();
  return state.auth;
}

/** JSON error body used by every route handler. */
export function jsonError(status: number, error: string, issues?: unknown): Response {
  return Response.json(issues === undefined ? { error } : { error, issues }, { status });
}

/** Maps data-layer errors to responses; anything unexpected is logged and answered generically. */
export function errorResponse(e: unknown): Response {
  if (e instanceof ForbiddenError) return jsonError(403, e.message);
  if (e instanceof NotFoundError) return jsonError(404, e.message);
  if (e instanceof ConflictError) return jsonError(409, e.message);
  console.error("[recurra] route handler failed:", e);
  return jsonError(500, "Something went wrong on our side. It has been logged; try again.");
}

type RouteContext<P> = { params: Promise<P> };

/**
 * Wraps a route handler: 401 when signed out, 403 when the role lacks the capability, mapped
 * errors otherwise. The handler receives the caller's organisation scope.
 */
export function apiRoute<P = Record<string, never>>(
  capability: Capability,
  handler: (req: Request, auth: AuthContext, params: P) => Promise<Response>,
) {
  return async (req: Request, ctx: RouteContext<P>): Promise<Response> => {
    try {
      const state = await getAuthState();
      if (state.status !== "signed-in") {
        return jsonError(
          401,
          state.status === "expired" ? "Your session has ended; sign in again." : "Sign in first.",
        );
      }
      if (!can(state.auth.role, capability)) {
        return jsonError(403, `The ${state.auth.role} role may not do this.`);
      }
      return await handler(req, state.auth, await ctx.params);
    } catch (e) {
      return errorResponse(e);
    }
  };
}
