import "server-only";
import { asc, eq, ne, sql } from "drizzle-orm";
import type { Db } from "@/db";
import { memberships, organisations, users, type Role } from "@/db/schema";
import { enqueueJob } from "@/jobs/queue";
import { recordAudit } from "./audit";
import { assertCan, ConflictError, NotFoundError, orgWhere, type OrgScope } from "./scope";

export async function getOrganisation(db: Db, scope: OrgScope) {
  const [org] = await db
    .select()
    .from(organisations)
    .where(eq(organisations.id, scope.organisationId))
    .limit(1);
  if (!org) throw new NotFoundError("Organisation not found.");
  return org;
}

export type OrganisationSettings = {
  name: string;
  distanceUnit: "mi" | "km";
  bandWidth: number;
  comebackDays: number;
  comebackDistance: number;
  refuelWindow: number;
  confidenceLevel: number;
  minExposure: number;
  uploadLimitMb: number;
};

/** Settings the statistics are computed with: changing one queues a recompute. */
const STATISTICS_SETTINGS = [
  "distanceUnit",
  "bandWidth",
  "confidenceLevel",
  "minExposure",
] as const;

/** Saves the settings; says whether the statistics are being recomputed for them. */
export async function updateOrganisationSettings(
  db: Db,
  scope: OrgScope,
  settings: OrganisationSettings,
): Promise<{ isRecomputing: boolean }> {
  assertCan(scope, "settings:manage");
  return db.transaction(async (tx) => {
    const [before] = await tx
      .select()
      .from(organisations)
      .where(eq(organisations.id, scope.organisationId));
    if (!before) throw new NotFoundError("Organisation not found.");
    await tx.update(organisations).set(settings).where(eq(organisations.id, scope.organisationId));
    const changed = Object.fromEntries(
      Object.entries(settings).filter(([k, v]) => before[k as keyof typeof before] !== v),
    );
    await recordAudit(tx, scope, {
      action: "settings.update",
      entity: "organisation",
      entityId: scope.organisationId,
      detail: changed,
    });
    const isRecomputing = STATISTICS_SETTINGS.some((k) => k in changed);
    if (isRecomputing) {
      await enqueueJob(tx, {
        kind: "recompute",
        organisationId: scope.organisationId,
        payload: { organisationId: scope.organisationId },
      });
    }
    return { isRecomputing };
  });
}

export async function listMembers(db: Db, scope: OrgScope) {
  assertCan(scope, "members:manage");
  return db
    .select({
      membershipId: memberships.id,
      userId: users.id,
      name: users.name,
      email: users.email,
      role: memberships.role,
      since: memberships.createdAt,
      isDisabled: sql<boolean>`${users.disabledAt} is not null`,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(orgWhere(memberships, scope))
    .orderBy(asc(users.name));
}

/** Changes a member's role; refuses to leave the organisation without an admin. */
export async function changeMemberRole(
  db: Db,
  scope: OrgScope,
  input: { membershipId: number; role: Role },
): Promise<void> {
  assertCan(scope, "members:manage");
  await db.transaction(async (tx) => {
    const [member] = await tx
      .select({ id: memberships.id, role: memberships.role, userId: memberships.userId })
      .from(memberships)
      .where(orgWhere(memberships, scope, eq(memberships.id, input.membershipId)));
    if (!member) throw new NotFoundError("No such member in this organisation.");
    if (member.role === input.role) return;
    if (member.role === "admin") {
      const [others] = await tx
        .select({ n: sql<number>`count(*)` })
        .from(memberships)
        .where(
          orgWhere(
            memberships,
            scope,
            eq(memberships.role, "admin"),
            ne(memberships.id, member.id),
          ),
        );
      if (Number(others?.n ?? 0) === 0) {
        throw new ConflictError("The organisation needs at least one admin.");
      }
    }
    await tx
      .update(memberships)
      .set({ role: input.role })
      .where(orgWhere(memberships, scope, eq(memberships.id, member.id)));
    await recordAudit(tx, scope, {
      action: "member.role",
      entity: "membership",
      entityId: member.id,
      detail: { userId: member.userId, from: member.role, to: input.role },
    });
  });
}

/** Removes a member from the organisation (the account stays); never the last admin. */
export async function removeMember(
  db: Db,
  scope: OrgScope,
  input: { membershipId: number },
): Promise<{ email: string }> {
  assertCan(scope, "members:manage");
  // libSQL transactions begin IMMEDIATE, so two admins removing each other at the same moment
  // are serialised and the second one sees the first removal.
  return db.transaction(async (tx) => {
    const [member] = await tx
      .select({
        id: memberships.id,
        role: memberships.role,
        userId: memberships.userId,
        email: users.email,
      })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(orgWhere(memberships, scope, eq(memberships.id, input.membershipId)));
    if (!member) throw new NotFoundError("No such member in this organisation.");
    if (member.role === "admin") {
      const [others] = await tx
        .select({ n: sql<number>`count(*)` })
        .from(memberships)
        .where(
          orgWhere(
            memberships,
            scope,
            eq(memberships.role, "admin"),
            ne(memberships.id, member.id),
          ),
        );
      if (Number(others?.n ?? 0) === 0) {
        throw new ConflictError(
          "The organisation needs at least one admin: make someone else admin first.",
        );
      }
    }
    await tx.delete(memberships).where(orgWhere(memberships, scope, eq(memberships.id, member.id)));
    await recordAudit(tx, scope, {
      action: "member.remove",
      entity: "membership",
      entityId: member.id,
      detail: { userId: member.userId, email: member.email, role: member.role },
    });
    return { email: member.email };
  });
}
