import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import {
  countParts,
  createPart,
  deletePart,
  getPart,
  listComponentChoices,
  listParts,
  receiveParts,
  updatePart,
} from "@/db/queries/parts";
import { ConflictError, ForbiddenError, NotFoundError, type OrgScope } from "@/db/queries/scope";
import { NewPartInput } from "@/lib/part-input";
import { setUpOrganisation } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

let db: Db;
let shop: OrgScope;
let other: OrgScope;
let slug: string;

const newPart = (over: Record<string, string> = {}) =>
  NewPartInput.parse({ partNumber: "PV-100", description: "Purge valve", onHand: "2", ...over });

async function auditOf(partId: number) {
  return db.all<{ action: string; detail: string }>(sql`
    select action, detail from audit_log where entity = 'part' and entity_id = ${String(partId)}
     order by id`);
}

beforeAll(async () => {
  ({ db } = await createTestDb());
  shop = await setUpOrganisation(db, "parts-shop");
  other = await setUpOrganisation(db, "parts-other");
  const [first] = await listComponentChoices(db, shop);
  slug = first!.slug;
});

describe("the parts list (parts:manage)", () => {
  test("a part is added, listed, found by number, description or component, and audited", async () => {
    const { id } = await createPart(db, shop, { ...newPart(), componentSlug: slug });
    const part = await getPart(db, shop, id);
    expect(part).toMatchObject({ partNumber: "PV-100", onHand: 2, componentSlug: slug });
    for (const q of ["pv-1", "purge", part!.component!.split(" → ")[1]!]) {
      const { rows, total } = await listParts(db, shop, { q, page: 1, pageSize: 50 });
      expect(
        rows.map((r) => r.partNumber),
        q,
      ).toEqual(["PV-100"]);
      expect(total).toBe(1);
    }
    // LIKE wildcards in a search are literal characters.
    expect((await listParts(db, shop, { q: "%", page: 1, pageSize: 50 })).rows).toEqual([]);
    expect((await auditOf(id)).map((a) => a.action)).toEqual(["part.create"]);
  });

  test("the same number again (any case) is a conflict; an unknown component writes nothing", async () => {
    await expect(createPart(db, shop, newPart({ partNumber: "pv-100" }))).rejects.toThrow(
      ConflictError,
    );
    await expect(
      createPart(db, shop, { ...newPart({ partNumber: "PV-200" }), componentSlug: "no/such" }),
    ).rejects.toThrow(NotFoundError);
    expect((await listParts(db, shop, { q: "PV-200", page: 1, pageSize: 50 })).total).toBe(0);
    // Another organisation may use the same number.
    await expect(createPart(db, other, newPart())).resolves.toMatchObject({
      id: expect.any(Number),
    });
  });

  test("a delivery adds to what is on hand, a count replaces it; both audited with before and after", async () => {
    const { id } = await createPart(db, shop, newPart({ partNumber: "PV-300", onHand: "4" }));
    expect(await receiveParts(db, shop, { partId: id, quantity: 6 })).toEqual({ onHand: 10 });
    // Two deliveries booked at once both count.
    await Promise.all([
      receiveParts(db, shop, { partId: id, quantity: 1 }),
      receiveParts(db, shop, { partId: id, quantity: 2 }),
    ]);
    expect((await getPart(db, shop, id))!.onHand).toBe(13);
    await countParts(db, shop, { partId: id, onHand: 11 });
    const part = await getPart(db, shop, id);
    expect(part!.onHand).toBe(11);
    const audit = await auditOf(id);
    expect(audit.map((a) => a.action)).toEqual([
      "part.create",
      "part.receive",
      "part.receive",
      "part.receive",
      "part.count",
    ]);
    expect(JSON.parse(audit[1]!.detail)).toMatchObject({ quantity: 6, from: 4, to: 10 });
    expect(JSON.parse(audit[4]!.detail)).toMatchObject({ from: 13, to: 11 });
    // The part's page shows them newest first.
    expect(part!.changes.map((c) => c.action)[0]).toBe("part.count");
  });

  test("details change; the part number stays", async () => {
    const { id } = await createPart(db, shop, newPart({ partNumber: "PV-400" }));
    await updatePart(db, shop, {
      partId: id,
      description: "Purge valve, updated",
      componentSlug: slug,
      unitCostCents: 4_250,
      leadTimeDays: 9,
    });
    expect(await getPart(db, shop, id)).toMatchObject({
      partNumber: "PV-400",
      description: "Purge valve, updated",
      componentSlug: slug,
      unitCostCents: 4_250,
      leadTimeDays: 9,
    });
  });

  test("removing a part keeps the known issues' part numbers and clears their link", async () => {
    const { id } = await createPart(db, shop, newPart({ partNumber: "PV-500" }));
    const [issue] = await db.all<{ id: number }>(sql`
      insert into known_issues (organisation_id, title, state, created_by)
      values (${shop.organisationId}, 'Stalls after fill-ups', 'watching', ${shop.userId})
      returning id`);
    await db.run(sql`
      insert into known_issue_parts (organisation_id, known_issue_id, part_id, part_number)
      values (${shop.organisationId}, ${issue!.id}, ${id}, 'PV-500')`);
    await deletePart(db, shop, id);
    expect(await getPart(db, shop, id)).toBeNull();
    expect(
      await db.all(
        sql`select part_id, part_number from known_issue_parts where known_issue_id = ${issue!.id}`,
      ),
    ).toEqual([{ part_id: null, part_number: "PV-500" }]);
    expect((await auditOf(id)).map((a) => a.action).at(-1)).toBe("part.delete");
  });
});

describe("parts are the organisation's own, and only managers and admins keep them", () => {
  test("another organisation's part reads as missing and cannot be changed", async () => {
    const { id } = await createPart(db, other, newPart({ partNumber: "OTHER-1" }));
    expect(await getPart(db, shop, id)).toBeNull();
    expect((await listParts(db, shop, { q: "OTHER-1", page: 1, pageSize: 50 })).total).toBe(0);
    await expect(receiveParts(db, shop, { partId: id, quantity: 5 })).rejects.toThrow(
      NotFoundError,
    );
    await expect(countParts(db, shop, { partId: id, onHand: 0 })).rejects.toThrow(NotFoundError);
    await expect(
      updatePart(db, shop, { partId: id, description: "x", unitCostCents: undefined }),
    ).rejects.toThrow(NotFoundError);
    await expect(deletePart(db, shop, id)).rejects.toThrow(NotFoundError);
    expect((await getPart(db, other, id))!.onHand).toBe(2);
  });

  test("technicians and viewers are refused every read and write", async () => {
    const { id } = await createPart(db, shop, newPart({ partNumber: "PV-600" }));
    for (const role of ["technician", "viewer"] as const) {
      const scope = { ...shop, role };
      await expect(listParts(db, scope, { page: 1, pageSize: 50 })).rejects.toThrow(ForbiddenError);
      await expect(getPart(db, scope, id)).rejects.toThrow(ForbiddenError);
      await expect(createPart(db, scope, newPart({ partNumber: "PV-601" }))).rejects.toThrow(
        ForbiddenError,
      );
      await expect(receiveParts(db, scope, { partId: id, quantity: 1 })).rejects.toThrow(
        ForbiddenError,
      );
      await expect(countParts(db, scope, { partId: id, onHand: 0 })).rejects.toThrow(
        ForbiddenError,
      );
      await expect(deletePart(db, scope, id)).rejects.toThrow(ForbiddenError);
    }
    expect((await getPart(db, shop, id))!.onHand).toBe(2);
  });
});
