import "server-only";
import { and, eq, gt, isNull } from "drizzle-orm";
import type { Db, DbOrTx } from "@/db";
import { invitations, memberships, organisations, users, type Role } from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { hashInvitationToken, INVITATION_TOKEN_PATTERN } from "@/lib/invitation-token";
import { recordAudit } from "./audit";
import { ConflictError } from "./scope";

/**
 * Accepting an invitation, before (or without) an organisation scope: the token found by its
 * SHA-256 is the authority, and it names the organisation and the role. Every way to accept
 * marks the invitation accepted with one guarded UPDATE (open, unrevoked, unexpired), so a link
 * works exactly once even when opened twice at the same moment.
 */

export type ClosedStatus = "unknown" | "expired" | "revoked" | "accepted";

export type InvitationLookup =
  | { status: ClosedStatus; organisationName: string | null }
  | {
      status: "open";
      invitationId: number;
      organisationId: number;
      organisationName: string;
      email: string;
      role: Role;
      expiresAt: string;
      hasAccount: boolean;
    };

/** What the invitee is told for each state of a link that cannot be used. */
export function closedInvitationMessage(status: ClosedStatus, organisationName: string | null) {
  const org = organisationName ?? "the organisation";
  switch (status) {
    case "unknown":
      return "This invitation link is not valid. Check that the whole link was copied, or ask an admin for a new invitation.";
    case "expired":
      return `This invitation has expired. Ask an admin of ${org} to send a new one.`;
    case "revoked":
      return `This invitation was withdrawn by an admin of ${org}. Ask them for a new one if you still need access.`;
    case "accepted":
      return `This invitation has already been used. Sign in to open ${org}.`;
  }
}

async function lookUp(db: DbOrTx, token: string, now: Date): Promise<InvitationLookup> {
  if (!INVITATION_TOKEN_PATTERN.test(token)) return { status: "unknown", organisationName: null };
  const [inv] = await db
    .select({
      id: invitations.id,
      organisationId: invitations.organisationId,
      organisationName: organisations.name,
      email: invitations.email,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      acceptedAt: invitations.acceptedAt,
      revokedAt: invitations.revokedAt,
    })
    .from(invitations)
    .innerJoin(organisations, eq(organisations.id, invitations.organisationId))
    .where(eq(invitations.tokenHash, hashInvitationToken(token)));
  if (!inv) return { status: "unknown", organisationName: null };
  const closed = (status: ClosedStatus) => ({ status, organisationName: inv.organisationName });
  if (inv.acceptedAt) return closed("accepted");
  if (inv.revokedAt) return closed("revoked");
  if (inv.expiresAt <= now.toISOString()) return closed("expired");
  const [account] = await db.select({ id: users.id }).from(users).where(eq(users.email, inv.email));
  return {
    status: "open",
    invitationId: inv.id,
    organisationId: inv.organisationId,
    organisationName: inv.organisationName,
    email: inv.email,
    role: inv.role,
    expiresAt: inv.expiresAt,
    hasAccount: Boolean(account),
  };
}

/** The invitation behind a token, and whether it can still be used. */
export function findInvitationByToken(db: Db, token: string, now = new Date()) {
  return lookUp(db, token, now);
}

/** Marks the invitation accepted if it is still open; throws a ConflictError saying why not. */
async function claimInvitation(tx: DbOrTx, token: string, now: Date, email?: string) {
  const tokenHash = hashInvitationToken(token);
  const [inv] = INVITATION_TOKEN_PATTERN.test(token)
    ? await tx
        .update(invitations)
        .set({ acceptedAt: now.toISOString() })
        .where(
          and(
            eq(invitations.tokenHash, tokenHash),
            isNull(invitations.acceptedAt),
            isNull(invitations.revokedAt),
            gt(invitations.expiresAt, now.toISOString()),
            email === undefined ? undefined : eq(invitations.email, email),
          ),
        )
        .returning({
          id: invitations.id,
          organisationId: invitations.organisationId,
          email: invitations.email,
          role: invitations.role,
        })
    : [];
  if (inv) return inv;
  const state = await lookUp(tx, token, now);
  if (state.status === "open") {
    throw new ConflictError(
      `This invitation was sent to ${state.email}; you are signed in with another account. Sign out, then open the link again.`,
    );
  }
  throw new ConflictError(closedInvitationMessage(state.status, state.organisationName));
}

/** Creates the invitee's account (new e-mail only) and its membership with the invited role. */
export async function acceptInvitationWithNewAccount(
  db: Db,
  token: string,
  input: { name: string; password: string },
  now = new Date(),
): Promise<{ userId: number; email: string; organisationId: number; role: Role }> {
  const passwordHash = await hashPassword(input.password);
  return db.transaction(async (tx) => {
    const inv = await claimInvitation(tx, token, now);
    const [existing] = await tx
      .select({ id: users.id })
      .from(users)
      .where(eq(users.email, inv.email));
    if (existing) {
      throw new ConflictError(
        `An account for ${inv.email} already exists. Sign in with it to accept the invitation.`,
      );
    }
    const [user] = await tx
      .insert(users)
      .values({ email: inv.email, name: input.name, passwordHash })
      .returning({ id: users.id });
    if (!user) throw new Error("acceptInvitationWithNewAccount: insert returned no row");
    await tx
      .insert(memberships)
      .values({ organisationId: inv.organisationId, userId: user.id, role: inv.role });
    await recordAudit(
      tx,
      { organisationId: inv.organisationId, userId: user.id, role: inv.role },
      {
        action: "invitation.accept",
        entity: "invitation",
        entityId: inv.id,
        detail: { email: inv.email, role: inv.role, isNewAccount: true },
      },
    );
    return {
      userId: user.id,
      email: inv.email,
      organisationId: inv.organisationId,
      role: inv.role,
    };
  });
}

/**
 * The signed-in user accepts an invitation sent to their own e-mail. A user who is already a
 * member keeps the role they have (an invitation never demotes anyone).
 */
export async function acceptInvitationAsUser(
  db: Db,
  token: string,
  userId: number,
  now = new Date(),
): Promise<{ organisationId: number; role: Role; wasMember: boolean }> {
  return db.transaction(async (tx) => {
    const [user] = await tx
      .select({ id: users.id, email: users.email })
      .from(users)
      .where(and(eq(users.id, userId), isNull(users.disabledAt)));
    if (!user) throw new ConflictError("Your account is not active. Ask an admin for help.");
    const inv = await claimInvitation(tx, token, now, user.email);
    const inserted = await tx
      .insert(memberships)
      .values({ organisationId: inv.organisationId, userId: user.id, role: inv.role })
      .onConflictDoNothing()
      .returning({ id: memberships.id });
    const wasMember = inserted.length === 0;
    const [membership] = await tx
      .select({ role: memberships.role })
      .from(memberships)
      .where(
        and(eq(memberships.organisationId, inv.organisationId), eq(memberships.userId, user.id)),
      );
    await recordAudit(
      tx,
      { organisationId: inv.organisationId, userId: user.id, role: membership?.role ?? inv.role },
      {
        action: "invitation.accept",
        entity: "invitation",
        entityId: inv.id,
        detail: { email: inv.email, role: inv.role, isNewAccount: false, wasMember },
      },
    );
    return { organisationId: inv.organisationId, role: membership?.role ?? inv.role, wasMember };
  });
}
