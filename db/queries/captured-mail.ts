import "server-only";
import { desc } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { capturedMail } from "@/db/schema";
import { assertCan, countRows, orgWhere, type OrgScope } from "./scope";

/**
 * Mail held by the local SMTP capture (demo and development), for the organisation's admins:
 * only the messages that came from this organisation's outbox.
 */
export async function listCapturedMail(
  db: DbOrTx,
  scope: OrgScope,
  opts: { page: number; pageSize: number },
) {
  assertCan(scope, "settings:manage");
  const rows = await db
    .select({
      id: capturedMail.id,
      fromAddress: capturedMail.fromAddress,
      toAddresses: capturedMail.toAddresses,
      subject: capturedMail.subject,
      textBody: capturedMail.textBody,
      htmlBody: capturedMail.htmlBody,
      sizeBytes: capturedMail.sizeBytes,
      createdAt: capturedMail.createdAt,
    })
    .from(capturedMail)
    .where(orgWhere(capturedMail, scope))
    .orderBy(desc(capturedMail.id))
    .limit(opts.pageSize)
    .offset((opts.page - 1) * opts.pageSize);
  return { rows, total: await countRows(db, capturedMail, orgWhere(capturedMail, scope)) };
}
