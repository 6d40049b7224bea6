import "server-only";
import { z } from "zod";
import type { DbOrTx } from "@/db";
import { emailOutbox } from "@/db/schema";

/**
 * The outbox. Mail is queued in the same transaction as the change that causes it (pass the
 * transaction), so it goes out exactly when the change commits and never for a rolled-back one.
 * The worker's delivery sweep (jobs/mail/outbox.ts) sends it. The organisation is whichever the
 * caller's change belongs to (null for system mail); this module reads nothing, so it takes no
 * scope.
 */

const OutgoingMail = z.object({
  organisationId: z.number().int().positive().nullable(),
  to: z.email({ error: "queueEmail: `to` must be one e-mail address" }).max(254),
  subject: z
    .string()
    .trim()
    .min(1, { error: "queueEmail: subject is empty" })
    .max(300)
    .refine((s) => !/[\r\n]/.test(s), { error: "queueEmail: subject has a line break" }),
  text: z.string().min(1, { error: "queueEmail: text is empty" }),
  html: z.string().min(1).optional(),
});
export type OutgoingMail = z.infer<typeof OutgoingMail>;

/** Queues one message; returns its outbox id. Throws on a malformed message (a caller's bug). */
export async function queueEmail(
  db: DbOrTx,
  mail: {
    organisationId: number | null;
    to: string;
    subject: string;
    text: string;
    html?: string;
  },
): Promise<number> {
  const parsed = OutgoingMail.safeParse(mail);
  if (!parsed.success) throw new Error(parsed.error.issues.map((i) => i.message).join("; "));
  const m = parsed.data;
  const [row] = await db
    .insert(emailOutbox)
    .values({
      organisationId: m.organisationId,
      toAddress: m.to.toLowerCase(),
      subject: m.subject,
      textBody: m.text,
      htmlBody: m.html ?? null,
      status: "queued",
      nextAttemptAt: Date.now(),
    })
    .returning({ id: emailOutbox.id });
  if (!row) throw new Error("queueEmail: insert returned no row");
  return row.id;
}
