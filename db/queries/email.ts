import "server-only";
import type { DbOrTx } from "@/db";
import { emailOutbox } from "@/db/schema";

/**
 * Queues an e-mail in the outbox, in the caller's transaction, so that mail goes out only if the
 * change that caused it was committed. The worker delivers it.
 */
export async function queueEmail(
  db: DbOrTx,
  mail: { organisationId: number | null; to: string; subject: string; text: string; html?: string },
): Promise<number> {
  const [row] = await db
    .insert(emailOutbox)
    .values({
      organisationId: mail.organisationId,
      toAddress: mail.to,
      subject: mail.subject,
      textBody: mail.text,
      htmlBody: mail.html ?? null,
    })
    .returning({ id: emailOutbox.id });
  if (!row) throw new Error("queueEmail: insert returned no row");
  return row.id;
}
