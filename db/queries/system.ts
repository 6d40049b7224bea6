import "server-only";
import { asc, eq, sql } from "drizzle-orm";
import type { Db } from "@/db";
import {
  auditLog,
  memberships,
  organisations,
  users,
  type DistanceUnit,
  type Role,
} from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { ConflictError, NotFoundError } from "./scope";

/**
 * System operations for the command line, run by whoever operates the server. They are not
 * reachable from any page or route handler, which go through org-scoped modules instead.
 */

export async function createOrganisation(
  db: Db,
  input: { slug: string; name: string; kind: "fleet" | "shop"; distanceUnit: DistanceUnit },
) {
  return db.transaction(async (tx) => {
    const [existing] = await tx
      .select({ id: organisations.id })
      .from(organisations)
      .where(eq(organisations.slug, input.slug));
    if (existing) throw new ConflictError(`An organisation with slug "${input.slug}" exists.`);
    const [org] = await tx
      .insert(organisations)
      .values({
        ...input,
        bandWidth: input.distanceUnit === "km" ? 40_000 : 25_000,
        comebackDistance: input.distanceUnit === "km" ? 5_000 : 3_000,
        refuelWindow: input.distanceUnit === "km" ? 32 : 20,
        minExposure: input.distanceUnit === "km" ? 32_000 : 20_000,
      })
      .returning();
    if (!org) throw new Error("createOrganisation: insert returned no row");
    await tx.insert(auditLog).values({
      organisationId: org.id,
      action: "organisation.create",
      entity: "organisation",
      entityId: String(org.id),
      detail: { slug: org.slug, via: "cli" },
    });
    return org;
  });
}

export async function listOrganisations(db: Db) {
  return db
    .select({
      id: organisations.id,
      slug: organisations.slug,
      name: organisations.name,
      kind: organisations.kind,
      distanceUnit: organisations.distanceUnit,
      isDemo: organisations.isDemo,
      // Correlated subqueries spelt out: Drizzle leaves column names unqualified inside sql``.
      members: sql<number>`(select count(*) from memberships m where m.organisation_id = organisations.id)`,
      vehicles: sql<number>`(select count(*) from vehicles v where v.organisation_id = organisations.id)`,
      createdAt: organisations.createdAt,
    })
    .from(organisations)
    .orderBy(asc(organisations.slug));
}

/**
 * Adds a user to an organisation with a role, creating the account when the e-mail is new
 * (a password is then required). An existing member gets the new role.
 */
export async function addUserToOrganisation(
  db: Db,
  input: {
    organisationSlug: string;
    email: string;
    name?: string;
    role: Role;
    password?: string;
    /** Use the password only when the account is new; never reset an existing one. */
    isPasswordForNewUserOnly?: boolean;
  },
) {
  const email = input.email.trim().toLowerCase();
  const passwordHash = input.password ? await hashPassword(input.password) : undefined;
  return db.transaction(async (tx) => {
    const [org] = await tx
      .select({ id: organisations.id })
      .from(organisations)
      .where(eq(organisations.slug, input.organisationSlug));
    if (!org) throw new NotFoundError(`No organisation with slug "${input.organisationSlug}".`);
    let [user] = await tx
      .select({ id: users.id, email: users.email, name: users.name })
      .from(users)
      .where(eq(users.email, email));
    const isNewUser = !user;
    if (!user) {
      if (!passwordHash) throw new ConflictError("A new user needs a password.");
      [user] = await tx
        .insert(users)
        .values({ email, name: input.name ?? email.split("@")[0] ?? email, passwordHash })
        .returning({ id: users.id, email: users.email, name: users.name });
      if (!user) throw new Error("addUserToOrganisation: insert returned no row");
    } else if (passwordHash && !input.isPasswordForNewUserOnly) {
      await tx.update(users).set({ passwordHash }).where(eq(users.id, user.id));
    }
    await tx
      .insert(memberships)
      .values({ organisationId: org.id, userId: user.id, role: input.role })
      .onConflictDoUpdate({
        target: [memberships.organisationId, memberships.userId],
        set: { role: input.role },
      });
    await tx.insert(auditLog).values({
      organisationId: org.id,
      action: "member.add",
      entity: "user",
      entityId: String(user.id),
      detail: { email, role: input.role, via: "cli" },
    });
    return { user, organisationId: org.id, role: input.role, isNewUser };
  });
}

export async function findOrganisationBySlug(db: Db, slug: string) {
  const [org] = await db.select().from(organisations).where(eq(organisations.slug, slug)).limit(1);
  if (!org) throw new NotFoundError(`No organisation with slug "${slug}".`);
  return org;
}
