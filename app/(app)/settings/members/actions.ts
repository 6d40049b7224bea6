"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { createInvitation, revokeInvitation } from "@/db/queries/invitations";
import { changeMemberRole, removeMember } from "@/db/queries/organisations";
import { ROLES } from "@/db/schema/organisations";
import { runAction, type ActionResult } from "@/lib/auth/action";
import { getBaseUrl } from "@/lib/base-url";

const MEMBERS_PATH = "/settings/members";

const RoleChange = z.object({
  membershipId: z.coerce.number().int().positive(),
  role: z.enum(ROLES, { error: "Choose a role." }),
});

export async function changeRoleAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("members:manage", RoleChange, formData, async (input, auth) => {
    await changeMemberRole(await getDb(), auth, input);
    revalidatePath(MEMBERS_PATH);
    return { ok: true, message: "Role changed." };
  });
}

const MemberRef = z.object({ membershipId: z.coerce.number().int().positive() });

export async function removeMemberAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("members:manage", MemberRef, formData, async (input, auth) => {
    const { email } = await removeMember(await getDb(), auth, input);
    revalidatePath(MEMBERS_PATH);
    return { ok: true, message: `${email} was removed from the organisation.` };
  });
}

const Invite = z.object({
  email: z
    .string({ error: "Enter an e-mail address." })
    .trim()
    .toLowerCase()
    .max(254, "At most 254 characters.")
    .pipe(z.email("Enter a valid e-mail address.")),
  role: z.enum(ROLES, { error: "Choose a role." }),
});

export async function inviteAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("members:manage", Invite, formData, async (input, auth) => {
    const { expiresAt, replaced } = await createInvitation(await getDb(), auth, {
      ...input,
      baseUrl: await getBaseUrl(),
    });
    revalidatePath(MEMBERS_PATH);
    const until = `${expiresAt.slice(0, 10)}`;
    return {
      ok: true,
      message:
        replaced > 0
          ? `A new invitation is on its way to ${input.email} (valid until ${until}); the earlier link no longer works.`
          : `Invitation sent to ${input.email}; the link is valid until ${until}.`,
    };
  });
}

const InvitationRef = z.object({ invitationId: z.coerce.number().int().positive() });

export async function revokeInvitationAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("members:manage", InvitationRef, formData, async (input, auth) => {
    await revokeInvitation(await getDb(), auth, input.invitationId);
    revalidatePath(MEMBERS_PATH);
    return { ok: true, message: "Invitation revoked; its link no longer works." };
  });
}
