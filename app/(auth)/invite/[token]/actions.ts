"use server";

import { z } from "zod";
import { getDb } from "@/db";
import {
  acceptInvitationAsUser,
  acceptInvitationWithNewAccount,
} from "@/db/queries/invitation-accept";
import { runPublicAction, type ActionResult } from "@/lib/auth/action";
import { getAuthState } from "@/lib/auth/guard";
import { MIN_PASSWORD_LENGTH } from "@/lib/auth/password";

const Token = z.string({ error: "The invitation link is incomplete." }).max(200);

const NewAccount = z
  .object({
    token: Token,
    name: z
      .string({ error: "Enter your name." })
      .trim()
      .min(2, "Enter your name (at least 2 characters).")
      .max(120, "At most 120 characters."),
    password: z
      .string({ error: `Choose a password of at least ${MIN_PASSWORD_LENGTH} characters.` })
      .min(MIN_PASSWORD_LENGTH, `At least ${MIN_PASSWORD_LENGTH} characters.`)
      .max(200, "At most 200 characters."),
    confirm: z.string({ error: "Type the password again." }),
  })
  .refine((v) => v.password === v.confirm, {
    path: ["confirm"],
    message: "The two passwords differ.",
  });

// No revalidatePath here: every page reads the session and the database per request, so nothing
// cached goes stale, and re-rendering this page would replace the form (the link is now used)
// before it signs the invitee in.

/**
 * Creates the invitee's account and membership. The token is the authority (checked and used
 * up in the data layer's transaction, which writes the audit entry); the form then signs in
 * with the password the person just chose. Nothing typed is echoed back.
 */
export async function acceptWithNewAccountAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runPublicAction(NewAccount, formData, async (input) => {
    await acceptInvitationWithNewAccount(await getDb(), input.token, {
      name: input.name,
      password: input.password,
    });
    return { ok: true, message: "Your account is ready. Signing you in…" };
  });
}

const Join = z.object({ token: Token });

/** The signed-in invitee joins; the data layer checks that the invitation is for them. */
export async function joinWithAccountAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  const state = await getAuthState();
  const user =
    state.status === "signed-in"
      ? state.auth.user
      : state.status === "no-organisation"
        ? state.user
        : null;
  if (!user) return { ok: false, message: "Your session has ended. Sign in again." };
  return runPublicAction(Join, formData, async (input) => {
    const { wasMember } = await acceptInvitationAsUser(await getDb(), input.token, user.id);
    return {
      ok: true,
      message: wasMember ? "You were already a member; your role is unchanged." : "Joined.",
    };
  });
}
