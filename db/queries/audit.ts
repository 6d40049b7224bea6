import "server-only";
import { desc, eq } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { auditLog, users } from "@/db/schema";
import { assertCan, countRows, orgWhere, type OrgScope } from "./scope";

export async function recordAudit(
  tx: DbOrTx,
  scope: OrgScope,
  entry: { action: string; entity: string; entityId?: string | number; detail?: unknown },
): Promise<void> {
  await tx.insert(auditLog).values({
    organisationId: scope.organisationId,
    userId: scope.userId,
    action: entry.action,
    entity: entry.entity,
    entityId: entry.entityId === undefined ? null : String(entry.entityId),
    detail: entry.detail ?? null,
  });
}

export async function listAuditLog(
  db: DbOrTx,
  scope: OrgScope,
  opts: { page: number; pageSize: number },
) {
  assertCan(scope, "audit:read");
  const rows = await db
    .select({
      id: auditLog.id,
      action: auditLog.action,
      entity: auditLog.entity,
      entityId: auditLog.entityId,
      detail: auditLog.detail,
      createdAt: auditLog.createdAt,
      userName: users.name,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.userId))
    .where(orgWhere(auditLog, scope))
    .orderBy(desc(auditLog.id))
    .limit(opts.pageSize)
    .offset((opts.page - 1) * opts.pageSize);
  return { rows, total: await countRows(db, auditLog, orgWhere(auditLog, scope)) };
}
