import { createHash } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { openDatabase, type Db } from "@/db";
import {
  acceptInvitationAsUser,
  acceptInvitationWithNewAccount,
  findInvitationByToken,
} from "@/db/queries/invitation-accept";
import { createInvitation, listOpenInvitations, revokeInvitation } from "@/db/queries/invitations";
import { changeMemberRole, listMembers, removeMember } from "@/db/queries/organisations";
import { ConflictError, ForbiddenError, NotFoundError, type OrgScope } from "@/db/queries/scope";
import { addUserToOrganisation, createOrganisation } from "@/db/queries/system";
import { auditLog, emailOutbox, invitations, memberships, users } from "@/db/schema";
import { verifyPassword } from "@/lib/auth/password";
import { createInvitationToken, hashInvitationToken } from "@/lib/invitation-token";
import { createTestDb } from "../../support/test-db";

const BASE = "http://recurra.test:3000";
const DAY = 24 * 60 * 60 * 1000;

let db: Db;
let url: string;
let a: OrgScope;
let b: OrgScope;

beforeAll(async () => {
  ({ db, url } = await createTestDb());
  for (const slug of ["inv-a", "inv-b"]) {
    await createOrganisation(db, { slug, name: `Org ${slug}`, kind: "fleet", distanceUnit: "mi" });
  }
  const ua = await addUserToOrganisation(db, {
    organisationSlug: "inv-a",
    email: "admin-a@recurra.example",
    name: "Admin A",
    role: "admin",
    password: "password-a-123",
  });
  const ub = await addUserToOrganisation(db, {
    organisationSlug: "inv-b",
    email: "admin-b@recurra.example",
    name: "Admin B",
    role: "admin",
    password: "password-b-123",
  });
  a = { organisationId: ua.organisationId, userId: ua.user.id, role: "admin" };
  b = { organisationId: ub.organisationId, userId: ub.user.id, role: "admin" };
});

async function invitationRow(id: number) {
  const [row] = await db.select().from(invitations).where(eq(invitations.id, id));
  return row!;
}

async function roleIn(organisationId: number, email: string) {
  const [row] = await db
    .select({ role: memberships.role })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.organisationId, organisationId), eq(users.email, email)));
  return row?.role ?? null;
}

describe("tokens", () => {
  test("the stored hash is SHA-256 in hex", () => {
    // SHA-256("abc"): the FIPS 180-2 example digest.
    expect(hashInvitationToken("abc")).toBe(
      "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad",
    );
  });

  test("tokens are 256 random bits in base64url, each one different", () => {
    const seen = new Set<string>();
    for (let i = 0; i < 50; i++) {
      const { token, tokenHash } = createInvitationToken();
      expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
      expect(Buffer.from(token, "base64url")).toHaveLength(32);
      expect(tokenHash).toBe(createHash("sha256").update(token).digest("hex"));
      seen.add(token);
    }
    expect(seen.size).toBe(50);
  });
});

describe("inviting", () => {
  test("stores only the hash, expires in 7 days, queues the e-mail and audits without the token", async () => {
    const now = new Date("2026-11-20T10:00:00.000Z");
    const inv = await createInvitation(db, a, {
      email: "  New.Tech@Recurra.Example ",
      role: "technician",
      baseUrl: `${BASE}/`,
      now,
    });
    expect(new Date(inv.expiresAt).getTime() - now.getTime()).toBe(7 * DAY);
    const row = await invitationRow(inv.id);
    expect(row).toMatchObject({
      organisationId: a.organisationId,
      email: "new.tech@recurra.example",
      role: "technician",
      invitedBy: a.userId,
      acceptedAt: null,
      revokedAt: null,
    });
    expect(row.tokenHash).toBe(hashInvitationToken(inv.token));
    expect(JSON.stringify(row)).not.toContain(inv.token);

    const [mail] = await db
      .select()
      .from(emailOutbox)
      .where(eq(emailOutbox.toAddress, "new.tech@recurra.example"));
    expect(mail).toMatchObject({ organisationId: a.organisationId, status: "queued" });
    expect(mail?.subject).toBe("Join Org inv-a on Recurra");
    expect(mail?.textBody).toContain(`${BASE}/invite/${inv.token}`);
    expect(mail?.textBody).toContain("Admin A has invited you");
    expect(mail?.htmlBody).toContain(`href="${BASE}/invite/${inv.token}"`);

    const audits = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, "invitation.create"), eq(auditLog.entityId, String(inv.id))));
    expect(audits).toHaveLength(1);
    expect(JSON.stringify(audits)).not.toContain(inv.token);
  });

  test("HTML in the organisation's name is escaped in the e-mail", async () => {
    const org = await createOrganisation(db, {
      slug: "inv-html",
      name: `<img src=x onerror=alert(1)> & Co`,
      kind: "shop",
      distanceUnit: "km",
    });
    const admin = await addUserToOrganisation(db, {
      organisationSlug: "inv-html",
      email: "admin-html@recurra.example",
      role: "admin",
      password: "password-h-123",
    });
    const scope: OrgScope = { organisationId: org.id, userId: admin.user.id, role: "admin" };
    await createInvitation(db, scope, {
      email: "h@recurra.example",
      role: "viewer",
      baseUrl: BASE,
    });
    const [mail] = await db
      .select()
      .from(emailOutbox)
      .where(eq(emailOutbox.toAddress, "h@recurra.example"));
    expect(mail?.htmlBody).toContain("&lt;img src=x onerror=alert(1)&gt; &amp; Co");
    expect(mail?.htmlBody).not.toContain("<img");
  });

  test("an existing member cannot be invited again; a second invitation replaces the first", async () => {
    await expect(
      createInvitation(db, a, { email: "admin-a@recurra.example", role: "viewer", baseUrl: BASE }),
    ).rejects.toBeInstanceOf(ConflictError);
    const first = await createInvitation(db, a, {
      email: "twice@recurra.example",
      role: "viewer",
      baseUrl: BASE,
    });
    const second = await createInvitation(db, a, {
      email: "twice@recurra.example",
      role: "manager",
      baseUrl: BASE,
    });
    expect(second.replaced).toBe(1);
    expect((await findInvitationByToken(db, first.token)).status).toBe("revoked");
    expect(await findInvitationByToken(db, second.token)).toMatchObject({
      status: "open",
      role: "manager",
      hasAccount: false,
    });
    const open = await listOpenInvitations(db, a);
    expect(open.filter((i) => i.email === "twice@recurra.example").map((i) => i.id)).toEqual([
      second.id,
    ]);
  });
});

describe("accepting", () => {
  test("a new address creates its account with the invited role, once", async () => {
    const { token, id } = await createInvitation(db, a, {
      email: "fresh@recurra.example",
      role: "technician",
      baseUrl: BASE,
    });
    const res = await acceptInvitationWithNewAccount(db, token, {
      name: "Fresh Person",
      password: "a-long-password-1",
    });
    expect(res).toMatchObject({
      email: "fresh@recurra.example",
      organisationId: a.organisationId,
      role: "technician",
    });
    expect(await roleIn(a.organisationId, "fresh@recurra.example")).toBe("technician");
    expect(await roleIn(b.organisationId, "fresh@recurra.example")).toBeNull();
    const [user] = await db.select().from(users).where(eq(users.email, "fresh@recurra.example"));
    expect(user?.name).toBe("Fresh Person");
    expect(await verifyPassword("a-long-password-1", user!.passwordHash)).toBe(true);
    expect((await invitationRow(id)).acceptedAt).not.toBeNull();

    // The link is used up.
    expect((await findInvitationByToken(db, token)).status).toBe("accepted");
    await expect(
      acceptInvitationWithNewAccount(db, token, { name: "Again", password: "a-long-password-2" }),
    ).rejects.toThrow(/already been used/);
    expect(await listOpenInvitations(db, a)).not.toContainEqual(expect.objectContaining({ id }));
  });

  test("expired, revoked and unknown links are refused with their reason", async () => {
    const old = await createInvitation(db, a, {
      email: "late@recurra.example",
      role: "viewer",
      baseUrl: BASE,
      now: new Date(Date.now() - 8 * DAY),
    });
    expect((await findInvitationByToken(db, old.token)).status).toBe("expired");
    expect((await listOpenInvitations(db, a)).find((i) => i.id === old.id)?.status).toBe("expired");
    await expect(
      acceptInvitationWithNewAccount(db, old.token, {
        name: "Late",
        password: "a-long-password-1",
      }),
    ).rejects.toThrow(/expired/);

    const withdrawn = await createInvitation(db, a, {
      email: "withdrawn@recurra.example",
      role: "viewer",
      baseUrl: BASE,
    });
    await revokeInvitation(db, a, withdrawn.id);
    await expect(revokeInvitation(db, a, withdrawn.id)).rejects.toBeInstanceOf(ConflictError);
    expect((await findInvitationByToken(db, withdrawn.token)).status).toBe("revoked");
    await expect(
      acceptInvitationWithNewAccount(db, withdrawn.token, {
        name: "Withdrawn",
        password: "a-long-password-1",
      }),
    ).rejects.toThrow(/withdrawn/);

    expect((await findInvitationByToken(db, createInvitationToken().token)).status).toBe("unknown");
    expect((await findInvitationByToken(db, "short")).status).toBe("unknown");
    expect((await findInvitationByToken(db, "x".repeat(43))).status).toBe("unknown");
    // None of them created an account.
    for (const email of ["late@recurra.example", "withdrawn@recurra.example"]) {
      expect(await db.select().from(users).where(eq(users.email, email))).toHaveLength(0);
    }
  });

  test("an existing account must sign in and joins with the invited role; others cannot use it", async () => {
    const { token } = await createInvitation(db, a, {
      email: "admin-b@recurra.example",
      role: "viewer",
      baseUrl: BASE,
    });
    expect(await findInvitationByToken(db, token)).toMatchObject({
      status: "open",
      hasAccount: true,
    });
    await expect(
      acceptInvitationWithNewAccount(db, token, { name: "B", password: "a-long-password-1" }),
    ).rejects.toThrow(/already exists/);
    // Someone else, signed in, cannot take the invitation.
    await expect(acceptInvitationAsUser(db, token, a.userId!)).rejects.toThrow(/was sent to/);
    expect((await findInvitationByToken(db, token)).status).toBe("open");

    expect(await acceptInvitationAsUser(db, token, b.userId!)).toEqual({
      organisationId: a.organisationId,
      role: "viewer",
      wasMember: false,
    });
    expect(await roleIn(a.organisationId, "admin-b@recurra.example")).toBe("viewer");
    expect(await roleIn(b.organisationId, "admin-b@recurra.example")).toBe("admin");
    await expect(acceptInvitationAsUser(db, token, b.userId!)).rejects.toThrow(/already been used/);
  });

  test("the same link opened twice at the same moment creates one account", async () => {
    const { token } = await createInvitation(db, a, {
      email: "race@recurra.example",
      role: "technician",
      baseUrl: BASE,
    });
    const other = await openDatabase(url);
    const results = await Promise.allSettled([
      acceptInvitationWithNewAccount(db, token, { name: "One", password: "a-long-password-1" }),
      acceptInvitationWithNewAccount(other.db, token, {
        name: "Two",
        password: "a-long-password-2",
      }),
    ]);
    other.client.close();
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    expect(
      await db.select().from(users).where(eq(users.email, "race@recurra.example")),
    ).toHaveLength(1);
  });
});

describe("tenancy and roles", () => {
  test("another organisation can neither see nor revoke an invitation", async () => {
    const inv = await createInvitation(db, a, {
      email: "private@recurra.example",
      role: "viewer",
      baseUrl: BASE,
    });
    expect((await listOpenInvitations(db, b)).map((i) => i.email)).not.toContain(
      "private@recurra.example",
    );
    expect((await listOpenInvitations(db, a)).map((i) => i.email)).toContain(
      "private@recurra.example",
    );
    await expect(revokeInvitation(db, b, inv.id)).rejects.toBeInstanceOf(NotFoundError);
    expect((await findInvitationByToken(db, inv.token)).status).toBe("open");
  });

  test("only admins manage invitations and members, in the data layer too", async () => {
    for (const role of ["manager", "technician", "viewer"] as const) {
      const scope: OrgScope = { ...a, role };
      await expect(
        createInvitation(db, scope, {
          email: `${role}-x@recurra.example`,
          role: "admin",
          baseUrl: BASE,
        }),
      ).rejects.toBeInstanceOf(ForbiddenError);
      await expect(listOpenInvitations(db, scope)).rejects.toBeInstanceOf(ForbiddenError);
      await expect(revokeInvitation(db, scope, 1)).rejects.toBeInstanceOf(ForbiddenError);
      await expect(removeMember(db, scope, { membershipId: 1 })).rejects.toBeInstanceOf(
        ForbiddenError,
      );
    }
    expect(
      await db
        .select()
        .from(invitations)
        .where(eq(invitations.email, "technician-x@recurra.example")),
    ).toHaveLength(0);
  });

  test("the last admin can be neither removed nor demoted; another admin can be", async () => {
    const org = await createOrganisation(db, {
      slug: "inv-admins",
      name: "Admins",
      kind: "fleet",
      distanceUnit: "mi",
    });
    const first = await addUserToOrganisation(db, {
      organisationSlug: "inv-admins",
      email: "first-admin@recurra.example",
      role: "admin",
      password: "password-f-123",
    });
    const scope: OrgScope = { organisationId: org.id, userId: first.user.id, role: "admin" };
    const [only] = await listMembers(db, scope);
    await expect(removeMember(db, scope, { membershipId: only!.membershipId })).rejects.toThrow(
      /at least one admin/,
    );
    await expect(
      changeMemberRole(db, scope, { membershipId: only!.membershipId, role: "manager" }),
    ).rejects.toBeInstanceOf(ConflictError);

    await addUserToOrganisation(db, {
      organisationSlug: "inv-admins",
      email: "second-admin@recurra.example",
      role: "admin",
      password: "password-s-123",
    });
    const second = (await listMembers(db, scope)).find(
      (m) => m.email === "second-admin@recurra.example",
    )!;
    // A member of another organisation is not found from here.
    const [bMember] = await listMembers(db, b);
    await expect(
      removeMember(db, scope, { membershipId: bMember!.membershipId }),
    ).rejects.toBeInstanceOf(NotFoundError);

    await expect(removeMember(db, scope, { membershipId: second.membershipId })).resolves.toEqual({
      email: "second-admin@recurra.example",
    });
    expect((await listMembers(db, scope)).map((m) => m.email)).toEqual([
      "first-admin@recurra.example",
    ]);
    await expect(removeMember(db, scope, { membershipId: only!.membershipId })).rejects.toThrow(
      /at least one admin/,
    );
    const audits = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.organisationId, org.id), eq(auditLog.action, "member.remove")));
    expect(audits).toHaveLength(1);
  });
});
