import "server-only";
import { and, asc, eq, isNull } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { memberships, organisations, users, type Role } from "@/db/schema";

/**
 * Account lookups made before anyone is signed in (sign-in, session checks). They read the
 * users and memberships of one user only, so they take a user, not an organisation scope.
 */

export async function findActiveUserByEmail(db: DbOrTx, email: string) {
  const [user] = await db
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      passwordHash: users.passwordHash,
    })
    .from(users)
    .where(and(eq(users.email, email.trim().toLowerCase()), isNull(users.disabledAt)))
    .limit(1);
  return user ?? null;
}

export type MembershipSummary = {
  organisationId: number;
  slug: string;
  name: string;
  kind: "fleet" | "shop";
  distanceUnit: "mi" | "km";
  role: Role;
};

/** Organisations the user belongs to, oldest membership first; empty for a disabled user. */
export async function listMembershipsOfUser(
  db: DbOrTx,
  userId: number,
): Promise<{
  user: { id: number; email: string; name: string } | null;
  memberships: MembershipSummary[];
}> {
  const rows = await db
    .select({
      userId: users.id,
      email: users.email,
      userName: users.name,
      organisationId: organisations.id,
      slug: organisations.slug,
      name: organisations.name,
      kind: organisations.kind,
      distanceUnit: organisations.distanceUnit,
      role: memberships.role,
    })
    .from(users)
    .leftJoin(memberships, eq(memberships.userId, users.id))
    .leftJoin(organisations, eq(organisations.id, memberships.organisationId))
    .where(and(eq(users.id, userId), isNull(users.disabledAt)))
    .orderBy(asc(memberships.id));
  const first = rows[0];
  if (!first) return { user: null, memberships: [] };
  return {
    user: { id: first.userId, email: first.email, name: first.userName },
    memberships: rows.flatMap((r) =>
      r.organisationId !== null && r.slug && r.name && r.kind && r.distanceUnit && r.role
        ? [
            {
              organisationId: r.organisationId,
              slug: r.slug,
              name: r.name,
              kind: r.kind,
              distanceUnit: r.distanceUnit,
              role: r.role,
            },
          ]
        : [],
    ),
  };
}

/** A user's display name (for messages about what they did). */
export async function findUserName(db: DbOrTx, userId: number): Promise<string | null> {
  const [u] = await db.select({ name: users.name }).from(users).where(eq(users.id, userId));
  return u?.name ?? null;
}
