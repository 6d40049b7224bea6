import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { listAuditLog } from "@/db/queries/audit";
import {
  changeMemberRole,
  listMembers,
  updateOrganisationSettings,
  getOrganisation,
} from "@/db/queries/organisations";
import { getOverview } from "@/db/queries/overview";
import { ConflictError, ForbiddenError, NotFoundError, type OrgScope } from "@/db/queries/scope";
import { addUserToOrganisation, createOrganisation } from "@/db/queries/system";
import { createVehicle, getVehicle, listVehicles } from "@/db/queries/vehicles";
import { repairLines, repairOrders } from "@/db/schema";
import { createTestDb } from "../../support/test-db";

let db: Db;
let a: OrgScope;
let b: OrgScope;
let aVehicle: number;
let bVehicle: number;

beforeAll(async () => {
  ({ db } = await createTestDb());
  const orgA = await createOrganisation(db, {
    slug: "org-a",
    name: "Org A",
    kind: "fleet",
    distanceUnit: "mi",
  });
  const orgB = await createOrganisation(db, {
    slug: "org-b",
    name: "Org B",
    kind: "shop",
    distanceUnit: "km",
  });
  const ua = await addUserToOrganisation(db, {
    organisationSlug: "org-a",
    email: "a@x.example",
    role: "admin",
    password: "password-a-123",
  });
  const ub = await addUserToOrganisation(db, {
    organisationSlug: "org-b",
    email: "b@x.example",
    role: "admin",
    password: "password-b-123",
  });
  a = { organisationId: orgA.id, userId: ua.user.id, role: "admin" };
  b = { organisationId: orgB.id, userId: ub.user.id, role: "admin" };
  aVehicle = (
    await createVehicle(db, a, {
      unitNumber: "A-1",
      make: "Aurel",
      model: "Kestrel",
      modelYear: 2016,
      odometerUnit: "mi",
    })
  ).id;
  await createVehicle(db, a, {
    unitNumber: "A-2",
    make: "Aurel",
    model: "Merlin",
    modelYear: 2019,
    odometerUnit: "mi",
  });
  bVehicle = (
    await createVehicle(db, b, {
      vin: "1M8GDM9AXKP042788",
      make: "Ostra",
      model: "Wren",
      modelYear: 2019,
      odometerUnit: "km",
    })
  ).id;
  // One repair order in B, none in A.
  const [ro] = await db
    .insert(repairOrders)
    .values({
      organisationId: b.organisationId,
      vehicleId: bVehicle,
      roNumber: "B-100",
      openedOn: "2025-01-02",
    })
    .returning();
  await db.insert(repairLines).values({
    organisationId: b.organisationId,
    repairOrderId: ro!.id,
    vehicleId: bVehicle,
    openedOn: "2025-01-02",
    complaint: "noise",
  });
});

describe("org scoping in the data layer", () => {
  test("lists and counts see only the caller's organisation", async () => {
    expect((await listVehicles(db, a, { page: 1, pageSize: 50 })).total).toBe(2);
    expect((await listVehicles(db, b, { page: 1, pageSize: 50 })).total).toBe(1);
    const search = await listVehicles(db, a, { q: "Wren", page: 1, pageSize: 50 });
    expect(search.total).toBe(0);
    expect(await getOverview(db, a)).toMatchObject({ vehicles: 2, repairOrders: 0 });
    expect(await getOverview(db, b)).toMatchObject({ vehicles: 1, repairOrders: 1 });
  });

  test("another organisation's record reads as missing", async () => {
    expect(await getVehicle(db, a, bVehicle)).toBeNull();
    expect((await getVehicle(db, b, bVehicle))?.counts.repairOrders).toBe(1);
    expect((await getVehicle(db, a, aVehicle))?.make).toBe("Aurel");
  });

  test("members, settings and audit stay within the organisation", async () => {
    expect((await listMembers(db, a)).map((m) => m.email)).toEqual(["a@x.example"]);
    const [bMember] = await listMembers(db, b);
    await expect(
      changeMemberRole(db, a, { membershipId: bMember!.membershipId, role: "viewer" }),
    ).rejects.toBeInstanceOf(NotFoundError);
    const audit = await listAuditLog(db, a, { page: 1, pageSize: 100 });
    expect(audit.rows.length).toBeGreaterThan(0);
    expect(
      audit.rows.every((r) => !JSON.stringify(r.detail ?? "").includes("1M8GDM9AXKP042788")),
    ).toBe(true);
    const org = await getOrganisation(db, a);
    const recomputes = async (scope: OrgScope) =>
      Number(
        (
          await db.$client.execute({
            sql: "select count(*) as n from jobs where kind = 'recompute' and organisation_id = ?",
            args: [scope.organisationId],
          })
        ).rows[0]?.n,
      );
    const before = await recomputes(a);
    // The comeback window is not used by the statistics: nothing to recompute.
    expect(await updateOrganisationSettings(db, a, { ...org, comebackDays: 40 })).toEqual({
      isRecomputing: false,
    });
    expect((await getOrganisation(db, a)).comebackDays).toBe(40);
    expect((await getOrganisation(db, b)).comebackDays).toBe(30);
    expect(await recomputes(a)).toBe(before);
    // The bands are: a new width (or unit, level, least exposure) queues a recompute, for A only.
    const otherBefore = await recomputes(b);
    const org2 = await getOrganisation(db, a);
    expect(
      await updateOrganisationSettings(db, a, { ...org2, bandWidth: org2.bandWidth + 5000 }),
    ).toEqual({ isRecomputing: true });
    expect(await recomputes(a)).toBe(before + 1);
    expect(await recomputes(b)).toBe(otherBefore);
  });

  test("the last admin cannot be demoted", async () => {
    const [only] = await listMembers(db, a);
    await expect(
      changeMemberRole(db, a, { membershipId: only!.membershipId, role: "viewer" }),
    ).rejects.toBeInstanceOf(ConflictError);
  });

  test("roles are checked in the data layer too", async () => {
    const viewer: OrgScope = { ...a, role: "viewer" };
    const technician: OrgScope = { ...a, role: "technician" };
    await expect(
      createVehicle(db, viewer, {
        unitNumber: "A-3",
        make: "X",
        model: "Y",
        modelYear: 2020,
        odometerUnit: "mi",
      }),
    ).rejects.toBeInstanceOf(ForbiddenError);
    await expect(listVehicles(db, viewer, { page: 1, pageSize: 5 })).rejects.toBeInstanceOf(
      ForbiddenError,
    );
    await expect(listMembers(db, technician)).rejects.toBeInstanceOf(ForbiddenError);
    await expect(listAuditLog(db, technician, { page: 1, pageSize: 5 })).rejects.toBeInstanceOf(
      ForbiddenError,
    );
    await expect(getOverview(db, viewer)).resolves.toMatchObject({ vehicles: 2 });
  });

  test("a duplicate unit number is refused within an organisation, allowed across", async () => {
    await expect(
      createVehicle(db, a, {
        unitNumber: "A-1",
        make: "Aurel",
        model: "Kestrel",
        modelYear: 2016,
        odometerUnit: "mi",
      }),
    ).rejects.toBeInstanceOf(ConflictError);
    await expect(
      createVehicle(db, b, {
        unitNumber: "A-1",
        make: "Aurel",
        model: "Kestrel",
        modelYear: 2016,
        odometerUnit: "mi",
      }),
    ).resolves.toHaveProperty("id");
  });
});

describe("the schema keeps every tenant row in one organisation", () => {
  // Reference data shared by all organisations, and the identity tables themselves.
  const GLOBAL = new Set([
    "organisations",
    "users",
    "components",
    "dtc_codes",
    "__drizzle_migrations",
  ]);
  // System-level rows that may belong to no organisation (a CLI action, a system job or mail).
  // captured_mail: the local SMTP capture files a message under the organisation of the outbox
  // row it came from, and under none when it came from elsewhere.
  const OPTIONAL_ORG = new Set(["audit_log", "jobs", "email_outbox", "captured_mail"]);

  test("every other table has a NOT NULL organisation_id", async () => {
    const tables = await db.all<{ name: string }>(
      sql`select name from sqlite_master where type = 'table' and name not like 'sqlite_%'`,
    );
    expect(tables.length).toBeGreaterThan(25);
    for (const { name } of tables) {
      if (GLOBAL.has(name)) continue;
      const cols = await db.all<{ name: string; notnull: number }>(
        sql.raw(`pragma table_info(${name})`),
      );
      const org = cols.find((c) => c.name === "organisation_id");
      expect(org, `${name} has organisation_id`).toBeDefined();
      if (!OPTIONAL_ORG.has(name))
        expect(org?.notnull, `${name}.organisation_id is NOT NULL`).toBe(1);
    }
  });
});

describe("no query in the tenant data layer forgets the organisation", () => {
  const dir = join(process.cwd(), "db/queries");
  // accounts.ts reads one user's own memberships; system.ts is the CLI's; scope.ts defines orgWhere;
  // reference.ts reads the shared reference tables (components, DTCs) that belong to no
  // organisation; email.ts only inserts into the outbox for the organisation its caller names
  // (it reads nothing); invitation-accept.ts works before sign-in, where the invitation found by
  // its token hash names the organisation.
  const EXEMPT = new Set([
    "accounts.ts",
    "system.ts",
    "scope.ts",
    "reference.ts",
    "email.ts",
    "invitation-accept.ts",
  ]);
  const files = readdirSync(dir).filter((f) => f.endsWith(".ts") && !EXEMPT.has(f));

  test("there are tenant query modules to check", () => {
    expect(files.length).toBeGreaterThanOrEqual(4);
  });

  for (const file of files) {
    test(`${file}: every WHERE is built with orgWhere or pins the organisation`, () => {
      const text = readFileSync(join(dir, file), "utf8");
      const wheres = [...text.matchAll(/\.where\(\s*([^\n]*)/g)].map((m) => m[1] ?? "");
      for (const w of wheres) {
        const ok =
          w.startsWith("orgWhere(") ||
          w.startsWith("where)") || // a variable assigned from orgWhere(...) in the same module
          w.includes("scope.organisationId") ||
          // a row of Recurra's shared component list (no organisation; its kinds are joined on
          // the organisation's own, component-kinds.ts)
          w.startsWith("eq(components.") ||
          w === "";
        expect(ok, `${file}: .where(${w}`).toBe(true);
      }
      if (/\bconst where = /.test(text)) expect(text).toMatch(/const where = orgWhere\(/);
      // Raw SQL read with db.all must pin the organisation from the scope itself.
      if (/\bdb\.all</.test(text))
        expect(text).toMatch(/organisation_id = \$\{scope\.organisationId\}/);
      // Every exported function takes the scope (or is the audit writer that receives it).
      for (const m of text.matchAll(/export async function (\w+)\(([^)]*)/g)) {
        expect(m[2], `${file}: ${m[1]} takes an OrgScope`).toMatch(/scope: OrgScope/);
      }
    });
  }
});
