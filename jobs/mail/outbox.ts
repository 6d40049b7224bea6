import { and, eq, sql } from "drizzle-orm";
import nodemailer, { type Transporter } from "nodemailer";
import type { Db } from "@/db";
import { emailOutbox } from "@/db/schema";

/**
 * Delivery of the outbox (rows queued by db/queries/email.ts). A sweep claims due rows with a
 * lease in one UPDATE … RETURNING, so several workers sharing one database never claim the same
 * row; each claimed row is sent over SMTP and marked sent, queued again after a back-off, or
 * failed for good. A deliverer that dies mid-send loses its lease and the row is claimed again
 * (delivery is at least once: a crash after the server accepted a message can repeat it).
 */

export type OutboxRow = typeof emailOutbox.$inferSelect;

export type DeliveryOptions = {
  transport: Transporter;
  from: string;
  workerId: string;
  /** How long a claim lasts (ms); a row still "sending" after that is claimed again. */
  leaseMs?: number;
  /** Rows claimed per sweep. */
  batchSize?: number;
  /** Attempts before a row is failed for good. */
  maxAttempts?: number;
  /** Back-off before the n-th retry: retryBaseMs × 2^(n−1). */
  retryBaseMs?: number;
  log?: (msg: string) => void;
};

export const OUTBOX_DEFAULTS = {
  leaseMs: 120_000,
  batchSize: 20,
  maxAttempts: 5,
  retryBaseMs: 30_000,
} as const;

/** Opens a nodemailer SMTP transport with timeouts short enough for a background sweep. */
export function createSmtpTransport(url: string): Transporter {
  return nodemailer.createTransport({
    url,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  } as Parameters<typeof nodemailer.createTransport>[0]);
}

/** Claims up to `limit` due rows for `workerId`: queued and due, or sending with a dead lease. */
export async function claimDueEmail(
  db: Db,
  opts: { workerId: string; leaseMs: number; limit: number; now?: number },
): Promise<OutboxRow[]> {
  const now = opts.now ?? Date.now();
  const isDue = sql`((status = 'queued' and next_attempt_at <= ${now})
      or (status = 'sending' and lease_expires_at < ${now}))`;
  // A read first, so a sweep with nothing due takes no write lock (as claimJob in jobs/queue.ts).
  const [any] = await db.all<{ id: number }>(
    sql`select id from email_outbox where ${isDue} limit 1`,
  );
  if (!any) return [];
  const rows = await db.all<{ id: number }>(sql`
    update email_outbox
       set status = 'sending', lease_owner = ${opts.workerId},
           lease_expires_at = ${now + opts.leaseMs}, attempts = attempts + 1
     where id in (select id from email_outbox where ${isDue} order by id limit ${opts.limit})
    returning id`);
  if (rows.length === 0) return [];
  return db
    .select()
    .from(emailOutbox)
    .where(
      and(
        eq(emailOutbox.leaseOwner, opts.workerId),
        eq(emailOutbox.status, "sending"),
        sql`${emailOutbox.id} in (${sql.join(
          rows.map((r) => sql`${Number(r.id)}`),
          sql`, `,
        )})`,
      ),
    )
    .orderBy(emailOutbox.id);
}

/** SMTP 5xx answers (bad address, refused) will not change on a retry; the rest may. */
function isPermanent(e: unknown): boolean {
  const code = (e as { responseCode?: unknown }).responseCode;
  return typeof code === "number" && code >= 500 && code < 600;
}

function describe(e: unknown): string {
  const err = e as { message?: string; code?: string };
  return (err.message ?? String(e)).replace(/\s+/g, " ").slice(0, 1000);
}

export type SweepResult = { claimed: number; sent: number; retrying: number; failed: number };

/** One sweep: claim due rows, send each, record the outcome. */
export async function deliverDueEmail(db: Db, opts: DeliveryOptions): Promise<SweepResult> {
  const leaseMs = opts.leaseMs ?? OUTBOX_DEFAULTS.leaseMs;
  const maxAttempts = opts.maxAttempts ?? OUTBOX_DEFAULTS.maxAttempts;
  const retryBaseMs = opts.retryBaseMs ?? OUTBOX_DEFAULTS.retryBaseMs;
  const rows = await claimDueEmail(db, {
    workerId: opts.workerId,
    leaseMs,
    limit: opts.batchSize ?? OUTBOX_DEFAULTS.batchSize,
  });
  const result: SweepResult = { claimed: rows.length, sent: 0, retrying: 0, failed: 0 };
  for (const row of rows) {
    const mine = and(eq(emailOutbox.id, row.id), eq(emailOutbox.leaseOwner, opts.workerId));
    if (row.attempts > maxAttempts) {
      // Its last deliverer died mid-send after the final attempt.
      await db
        .update(emailOutbox)
        .set({ status: "failed", leaseOwner: null, leaseExpiresAt: null })
        .where(mine);
      result.failed++;
      continue;
    }
    try {
      await opts.transport.sendMail({
        from: opts.from,
        to: row.toAddress,
        subject: row.subject,
        text: row.textBody,
        ...(row.htmlBody ? { html: row.htmlBody } : {}),
        headers: { "X-Recurra-Outbox-Id": String(row.id) },
      });
      await db
        .update(emailOutbox)
        .set({
          status: "sent",
          sentAt: new Date().toISOString(),
          lastError: null,
          leaseOwner: null,
          leaseExpiresAt: null,
        })
        .where(mine);
      result.sent++;
    } catch (e) {
      const isFinal = isPermanent(e) || row.attempts >= maxAttempts;
      await db
        .update(emailOutbox)
        .set({
          status: isFinal ? "failed" : "queued",
          lastError: describe(e),
          nextAttemptAt: Date.now() + retryBaseMs * 2 ** (row.attempts - 1),
          leaseOwner: null,
          leaseExpiresAt: null,
        })
        .where(mine);
      if (isFinal) result.failed++;
      else result.retrying++;
      opts.log?.(
        `e-mail ${row.id} to ${row.toAddress} ${isFinal ? "failed for good" : "will be retried"}: ${describe(e)}`,
      );
    }
  }
  return result;
}
