import "server-only";
import { asc, desc, eq, or, sql } from "drizzle-orm";
import type { Db } from "@/db";
import { auditLog, components, knownIssueParts, parts, users } from "@/db/schema";
import type {
  CountPartsInput,
  NewPartInput,
  PartUpdateInput,
  ReceivePartsInput,
} from "@/lib/part-input";
import { recordAudit } from "./audit";
import { componentIdOfSlug, listComponentCatalogue } from "./reference";
import {
  assertCan,
  ConflictError,
  containsPattern,
  countRows,
  inOrg,
  isUniqueViolation,
  NotFoundError,
  orgWhere,
  type OrgScope,
} from "./scope";

/**
 * The organisation's parts list (the shelf): what the stocking plan counts as on hand, with the
 * cost and lead time it plans with. Managers and admins keep it (parts:manage): add a part,
 * change its details, book a delivery, record a stock count, remove it. Every change is audited.
 */

const componentLabel = sql<
  string | null
>`case when ${components.id} is null then null else ${components.system} || ' → ' || ${components.name} end`;

export async function listParts(
  db: Db,
  scope: OrgScope,
  query: { q?: string; page: number; pageSize: number },
) {
  assertCan(scope, "parts:manage");
  const pattern = containsPattern(query.q);
  const search = pattern
    ? or(
        sql`${parts.partNumber} like ${pattern} escape '\\'`,
        sql`${parts.description} like ${pattern} escape '\\'`,
        sql`(${components.system} || ' ' || ${components.name}) like ${pattern} escape '\\'`,
      )
    : undefined;
  const where = orgWhere(parts, scope, search);
  const rows = await db
    .select({
      id: parts.id,
      partNumber: parts.partNumber,
      description: parts.description,
      component: componentLabel,
      onHand: parts.onHand,
      unitCostCents: parts.unitCostCents,
      leadTimeDays: parts.leadTimeDays,
    })
    .from(parts)
    .leftJoin(components, eq(components.id, parts.componentId))
    .where(where)
    .orderBy(asc(parts.partNumber), asc(parts.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  const [total] = await db
    .select({ n: sql<number>`count(*)` })
    .from(parts)
    .leftJoin(components, eq(components.id, parts.componentId))
    .where(where);
  return {
    rows,
    total: Number(total?.n ?? 0),
    all: await countRows(db, parts, orgWhere(parts, scope)),
  };
}

/** One part of the organisation with its last changes (newest first); null for another's. */
export async function getPart(db: Db, scope: OrgScope, partId: number) {
  assertCan(scope, "parts:manage");
  const [part] = await db
    .select({
      id: parts.id,
      partNumber: parts.partNumber,
      description: parts.description,
      componentSlug: components.slug,
      component: componentLabel,
      onHand: parts.onHand,
      unitCostCents: parts.unitCostCents,
      leadTimeDays: parts.leadTimeDays,
      importId: parts.importId,
      createdAt: parts.createdAt,
    })
    .from(parts)
    .leftJoin(components, eq(components.id, parts.componentId))
    .where(orgWhere(parts, scope, eq(parts.id, partId)));
  if (!part) return null;
  const changes = await db
    .select({
      action: auditLog.action,
      detail: auditLog.detail,
      createdAt: auditLog.createdAt,
      userName: users.name,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.userId))
    .where(
      orgWhere(auditLog, scope, eq(auditLog.entity, "part"), eq(auditLog.entityId, String(partId))),
    )
    .orderBy(desc(auditLog.id))
    .limit(20);
  return { ...part, changes };
}

/** The components a part can be filed under (shared reference data), by system and name. */
export async function listComponentChoices(db: Db, scope: OrgScope) {
  assertCan(scope, "parts:manage");
  return listComponentCatalogue(db);
}

/** The part as it is now, or NotFoundError (another organisation's part reads as missing). */
async function requirePart(tx: Pick<Db, "select">, scope: OrgScope, partId: number) {
  const [part] = await tx
    .select({ id: parts.id, partNumber: parts.partNumber, onHand: parts.onHand })
    .from(parts)
    .where(orgWhere(parts, scope, eq(parts.id, partId)));
  if (!part) throw new NotFoundError("No such part in this organisation.");
  return part;
}

const duplicateNumber = (partNumber: string) =>
  new ConflictError(`Part ${partNumber} is already on the list.`);

export async function createPart(db: Db, scope: OrgScope, input: NewPartInput) {
  assertCan(scope, "parts:manage");
  try {
    return await db.transaction(async (tx) => {
      const [existing] = await tx
        .select({ id: parts.id })
        .from(parts)
        .where(
          orgWhere(
            parts,
            scope,
            sql`lower(${parts.partNumber}) = ${input.partNumber.toLowerCase()}`,
          ),
        );
      if (existing) throw duplicateNumber(input.partNumber);
      const [created] = await tx
        .insert(parts)
        .values(
          inOrg(scope, {
            partNumber: input.partNumber,
            description: input.description,
            componentId: await componentIdOfSlug(tx, input.componentSlug ?? null),
            onHand: input.onHand,
            unitCostCents: input.unitCostCents ?? null,
            leadTimeDays: input.leadTimeDays ?? null,
          }),
        )
        .returning({ id: parts.id });
      if (!created) throw new Error("createPart: insert returned no row");
      await recordAudit(tx, scope, {
        action: "part.create",
        entity: "part",
        entityId: created.id,
        detail: { partNumber: input.partNumber, onHand: input.onHand },
      });
      return created;
    });
  } catch (e) {
    // Two managers adding the same number at once: the unique index decides.
    if (isUniqueViolation(e)) throw duplicateNumber(input.partNumber);
    throw e;
  }
}

export async function updatePart(db: Db, scope: OrgScope, input: PartUpdateInput) {
  assertCan(scope, "parts:manage");
  await db.transaction(async (tx) => {
    const part = await requirePart(tx, scope, input.partId);
    const values = {
      description: input.description,
      componentId: await componentIdOfSlug(tx, input.componentSlug ?? null),
      unitCostCents: input.unitCostCents ?? null,
      leadTimeDays: input.leadTimeDays ?? null,
    };
    await tx
      .update(parts)
      .set(values)
      .where(orgWhere(parts, scope, eq(parts.id, part.id)));
    await recordAudit(tx, scope, {
      action: "part.update",
      entity: "part",
      entityId: part.id,
      detail: { partNumber: part.partNumber, ...values },
    });
  });
}

/** Adds a delivery to what is on hand (an addition in the database, not a value read earlier). */
export async function receiveParts(db: Db, scope: OrgScope, input: ReceivePartsInput) {
  assertCan(scope, "parts:manage");
  return db.transaction(async (tx) => {
    const part = await requirePart(tx, scope, input.partId);
    const [after] = await tx
      .update(parts)
      .set({ onHand: sql`${parts.onHand} + ${input.quantity}` })
      .where(orgWhere(parts, scope, eq(parts.id, part.id)))
      .returning({ onHand: parts.onHand });
    if (!after) throw new NotFoundError("No such part in this organisation.");
    await recordAudit(tx, scope, {
      action: "part.receive",
      entity: "part",
      entityId: part.id,
      detail: {
        partNumber: part.partNumber,
        quantity: input.quantity,
        from: after.onHand - input.quantity,
        to: after.onHand,
      },
    });
    return after;
  });
}

/** Replaces what is on hand with a count of the shelf. */
export async function countParts(db: Db, scope: OrgScope, input: CountPartsInput) {
  assertCan(scope, "parts:manage");
  await db.transaction(async (tx) => {
    const part = await requirePart(tx, scope, input.partId);
    await tx
      .update(parts)
      .set({ onHand: input.onHand })
      .where(orgWhere(parts, scope, eq(parts.id, part.id)));
    await recordAudit(tx, scope, {
      action: "part.count",
      entity: "part",
      entityId: part.id,
      detail: { partNumber: part.partNumber, from: part.onHand, to: input.onHand },
    });
  });
}

/**
 * Removes a part from the list. Known issues that name it keep its part number (their link to
 * the list row is cleared); repair history is untouched (it names parts by number).
 */
export async function deletePart(db: Db, scope: OrgScope, partId: number) {
  assertCan(scope, "parts:manage");
  await db.transaction(async (tx) => {
    const part = await requirePart(tx, scope, partId);
    await tx
      .update(knownIssueParts)
      .set({ partId: null })
      .where(orgWhere(knownIssueParts, scope, eq(knownIssueParts.partId, part.id)));
    await tx.delete(parts).where(orgWhere(parts, scope, eq(parts.id, part.id)));
    await recordAudit(tx, scope, {
      action: "part.delete",
      entity: "part",
      entityId: part.id,
      detail: { partNumber: part.partNumber, onHand: part.onHand },
    });
  });
}
