import "server-only";
import { eq } from "drizzle-orm";
import type { Db } from "@/db";
import { memberships } from "@/db/schema";
import { recordAudit } from "./audit";
import { assertCan, NotFoundError, orgWhere, type OrgScope } from "./scope";

/** Whether the signed-in member receives this organisation's weekly digest. */
export async function getDigestOptIn(db: Db, scope: OrgScope): Promise<boolean> {
  assertCan(scope, "dashboard:read");
  if (scope.userId === null) return false;
  const [m] = await db
    .select({ wants: memberships.wantsDigest })
    .from(memberships)
    .where(orgWhere(memberships, scope, eq(memberships.userId, scope.userId)));
  return Boolean(m?.wants);
}

/** Opts the signed-in member in or out of this organisation's weekly digest. */
export async function setDigestOptIn(db: Db, scope: OrgScope, wants: boolean): Promise<void> {
  assertCan(scope, "dashboard:read");
  if (scope.userId === null) throw new NotFoundError("Only a signed-in member has preferences.");
  const userId = scope.userId;
  await db.transaction(async (tx) => {
    const updated = await tx
      .update(memberships)
      .set({ wantsDigest: wants })
      .where(orgWhere(memberships, scope, eq(memberships.userId, userId)))
      .returning({ id: memberships.id });
    if (updated.length === 0) throw new NotFoundError("You are not a member of this organisation.");
    await recordAudit(tx, scope, {
      action: wants ? "digest.opt-in" : "digest.opt-out",
      entity: "membership",
      entityId: updated[0]!.id,
    });
  });
}
