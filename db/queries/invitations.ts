import "server-only";
import { desc, eq, isNull } from "drizzle-orm";
import type { Db } from "@/db";
import { invitations, memberships, organisations, users, type Role } from "@/db/schema";
import { createInvitationToken, INVITATION_DAYS } from "@/lib/invitation-token";
import { buildInvitationEmail } from "@/lib/mail/invitation-email";
import { recordAudit } from "./audit";
import { queueEmail } from "./email";
import { assertCan, ConflictError, NotFoundError, orgWhere, type OrgScope } from "./scope";

/**
 * Invitations of the caller's organisation (admins). Accepting one happens before sign-in, by
 * token, in invitation-accept.ts.
 */

export type InvitationStatus = "pending" | "expired";

/** Invitations neither accepted nor revoked, newest first; expired ones are flagged. */
export async function listOpenInvitations(db: Db, scope: OrgScope, now = new Date()) {
  assertCan(scope, "members:manage");
  const rows = await db
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      createdAt: invitations.createdAt,
      invitedBy: users.name,
    })
    .from(invitations)
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .where(
      orgWhere(invitations, scope, isNull(invitations.acceptedAt), isNull(invitations.revokedAt)),
    )
    .orderBy(desc(invitations.id))
    .limit(200);
  const iso = now.toISOString();
  return rows.map((r) => ({
    ...r,
    status: (r.expiresAt > iso ? "pending" : "expired") as InvitationStatus,
  }));
}

/**
 * Invites an address with a role: stores the token's hash and expiry, revokes any earlier open
 * invitation of the same address (its link stops working) and queues the e-mail, all in one
 * transaction with the audit entry. The token is returned for the e-mail only: never show it.
 */
export async function createInvitation(
  db: Db,
  scope: OrgScope,
  input: { email: string; role: Role; baseUrl: string; days?: number; now?: Date },
): Promise<{ id: number; expiresAt: string; token: string; replaced: number }> {
  assertCan(scope, "members:manage");
  const email = input.email.trim().toLowerCase();
  const now = input.now ?? new Date();
  const expiresAt = new Date(
    now.getTime() + (input.days ?? INVITATION_DAYS) * 24 * 60 * 60 * 1000,
  ).toISOString();
  const { token, tokenHash } = createInvitationToken();
  // Transactions on libSQL begin IMMEDIATE: the checks below and the writes cannot interleave
  // with another invitation or membership change.
  return db.transaction(async (tx) => {
    const [org] = await tx
      .select({ name: organisations.name })
      .from(organisations)
      .where(eq(organisations.id, scope.organisationId));
    if (!org) throw new NotFoundError("Organisation not found.");
    const [member] = await tx
      .select({ id: memberships.id })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(orgWhere(memberships, scope, eq(users.email, email)));
    if (member) throw new ConflictError(`${email} is already a member of this organisation.`);
    const replaced = await tx
      .update(invitations)
      .set({ revokedAt: now.toISOString() })
      .where(
        orgWhere(
          invitations,
          scope,
          eq(invitations.email, email),
          isNull(invitations.acceptedAt),
          isNull(invitations.revokedAt),
        ),
      );
    const [row] = await tx
      .insert(invitations)
      .values({
        organisationId: scope.organisationId,
        email,
        role: input.role,
        tokenHash,
        invitedBy: scope.userId,
        expiresAt,
      })
      .returning({ id: invitations.id });
    if (!row) throw new Error("createInvitation: insert returned no row");
    const [inviter] = scope.userId
      ? await tx
          .select({ name: users.name })
          .from(memberships)
          .innerJoin(users, eq(users.id, memberships.userId))
          .where(orgWhere(memberships, scope, eq(memberships.userId, scope.userId)))
      : [];
    const mail = buildInvitationEmail({
      organisationName: org.name,
      inviterName: inviter?.name ?? "An admin",
      role: input.role,
      acceptUrl: `${input.baseUrl.replace(/\/+$/, "")}/invite/${token}`,
      expiresAt,
    });
    const outboxId = await queueEmail(tx, {
      organisationId: scope.organisationId,
      to: email,
      ...mail,
    });
    await recordAudit(tx, scope, {
      action: "invitation.create",
      entity: "invitation",
      entityId: row.id,
      detail: { email, role: input.role, expiresAt, outboxId, replaced: replaced.rowsAffected },
    });
    return { id: row.id, expiresAt, token, replaced: replaced.rowsAffected };
  });
}

/** Revokes an open invitation of the caller's organisation; its link stops working at once. */
export async function revokeInvitation(
  db: Db,
  scope: OrgScope,
  invitationId: number,
  now = new Date(),
): Promise<void> {
  assertCan(scope, "members:manage");
  await db.transaction(async (tx) => {
    const [inv] = await tx
      .select({
        id: invitations.id,
        email: invitations.email,
        acceptedAt: invitations.acceptedAt,
        revokedAt: invitations.revokedAt,
      })
      .from(invitations)
      .where(orgWhere(invitations, scope, eq(invitations.id, invitationId)));
    if (!inv) throw new NotFoundError("No such invitation in this organisation.");
    if (inv.acceptedAt) throw new ConflictError("That invitation has already been accepted.");
    if (inv.revokedAt) throw new ConflictError("That invitation was already revoked.");
    await tx
      .update(invitations)
      .set({ revokedAt: now.toISOString() })
      .where(
        orgWhere(invitations, scope, eq(invitations.id, inv.id), isNull(invitations.acceptedAt)),
      );
    await recordAudit(tx, scope, {
      action: "invitation.revoke",
      entity: "invitation",
      entityId: inv.id,
      detail: { email: inv.email },
    });
  });
}
