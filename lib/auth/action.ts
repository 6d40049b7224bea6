import "server-only";
import { unstable_rethrow } from "next/navigation";
import { z } from "zod";
import { ConflictError, ForbiddenError, NotFoundError } from "@/db/queries/scope";
import { getAuthState, type AuthContext } from "./guard";
import { can, type Capability } from "./roles";

export type ActionResult =
  | { ok: true; message?: string }
  | { ok: false; message: string; fieldErrors?: Record<string, string[] | undefined> };

/** Form fields as a plain object; empty strings become undefined so optional fields stay optional. */
export function formToObject(formData: FormData): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, value] of formData.entries()) {
    if (key.startsWith("$ACTION")) continue;
    out[key] = typeof value === "string" && value.trim() === "" ? undefined : value;
  }
  return out;
}

/**
 * The order every write follows: authenticate → authorise the role → validate with zod → run
 * (the data layer opens the transaction and writes the audit entry) → the caller revalidates.
 * Server actions can be POSTed directly, so this check is the real one.
 */
export async function runAction<S extends z.ZodType>(
  capability: Capability,
  schema: S,
  formData: FormData,
  fn: (input: z.output<S>, auth: AuthContext) => Promise<ActionResult | void>,
): Promise<ActionResult> {
  const state = await getAuthState();
  if (state.status !== "signed-in") {
    return { ok: false, message: "Your session has ended. Sign in again." };
  }
  if (!can(state.auth.role, capability)) {
    return { ok: false, message: `Your role (${state.auth.role}) may not do this.` };
  }
  const parsed = schema.safeParse(formToObject(formData));
  if (!parsed.success) return invalid(parsed.error);
  return settle(() => fn(parsed.data, state.auth));
}

/** Runs the action body; typed data-layer errors become messages, anything else is logged. */
async function settle(fn: () => Promise<ActionResult | void>): Promise<ActionResult> {
  try {
    return (await fn()) ?? { ok: true };
  } catch (e) {
    unstable_rethrow(e);
    if (e instanceof ForbiddenError || e instanceof NotFoundError || e instanceof ConflictError) {
      return { ok: false, message: e.message };
    }
    console.error("[recurra] server action failed:", e);
    return {
      ok: false,
      message: "Something went wrong on our side. It has been logged; try again.",
    };
  }
}

function invalid(error: z.ZodError): ActionResult {
  return {
    ok: false,
    message: "Please correct the fields marked below.",
    fieldErrors: z.flattenError(error).fieldErrors as Record<string, string[]>,
  };
}

/**
 * For the few actions open before sign-in (accepting an invitation, where the token is the
 * authority and the data layer checks it): validate with zod → run → the caller revalidates,
 * with the same result shape and error mapping as runAction.
 */
export async function runPublicAction<S extends z.ZodType>(
  schema: S,
  formData: FormData,
  fn: (input: z.output<S>) => Promise<ActionResult | void>,
): Promise<ActionResult> {
  const parsed = schema.safeParse(formToObject(formData));
  if (!parsed.success) return invalid(parsed.error);
  return settle(() => fn(parsed.data));
}
