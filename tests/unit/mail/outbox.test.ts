import { createClient } from "@libsql/client";
import { and, eq } from "drizzle-orm";
import nodemailer from "nodemailer";
import { SMTPServer } from "smtp-server";
import { afterAll, beforeAll, beforeEach, describe, expect, test } from "vitest";
import { openDatabase, type Db } from "@/db";
import { queueEmail } from "@/db/queries/email";
import { createOrganisation } from "@/db/queries/system";
import { capturedMail, emailOutbox } from "@/db/schema";
import { startMailCapture, type MailCapture } from "@/jobs/mail/capture";
import { claimDueEmail, createSmtpTransport, deliverDueEmail } from "@/jobs/mail/outbox";
import { freePort } from "../../support/server";
import { createTestDb } from "../../support/test-db";

const FROM = "Recurra <no-reply@recurra.example>";

let db: Db;
let url: string;
let capture: MailCapture;
let orgId: number;

beforeAll(async () => {
  ({ db, url } = await createTestDb());
  orgId = (
    await createOrganisation(db, {
      slug: "mail",
      name: "Mail Org",
      kind: "fleet",
      distanceUnit: "mi",
    })
  ).id;
  capture = await startMailCapture({ db, log: () => {} });
});

afterAll(async () => {
  await capture?.close();
});

beforeEach(async () => {
  await db.delete(capturedMail);
  await db.delete(emailOutbox);
});

const mail = (n: number, extra: Partial<Parameters<typeof queueEmail>[1]> = {}) => ({
  organisationId: orgId,
  to: `person${n}@recurra.example`,
  subject: `Message ${n}`,
  text: `Plain text of message ${n}.`,
  ...extra,
});

async function outbox() {
  return db.select().from(emailOutbox).orderBy(emailOutbox.id);
}

async function captured() {
  return db.select().from(capturedMail).orderBy(capturedMail.id);
}

describe("queueEmail", () => {
  test("queues in the caller's transaction: committed with it, or not at all", async () => {
    await expect(
      db.transaction(async (tx) => {
        await queueEmail(tx, mail(1));
        throw new Error("the change failed");
      }),
    ).rejects.toThrow("the change failed");
    expect(await outbox()).toHaveLength(0);

    const id = await db.transaction((tx) => queueEmail(tx, mail(2, { html: "<p>Hi</p>" })));
    const [row] = await outbox();
    expect(row).toMatchObject({
      id,
      organisationId: orgId,
      toAddress: "person2@recurra.example",
      subject: "Message 2",
      htmlBody: "<p>Hi</p>",
      status: "queued",
      attempts: 0,
    });
  });

  test("refuses a malformed message instead of queueing it", async () => {
    await expect(queueEmail(db, mail(3, { to: "not an address" }))).rejects.toThrow(/`to`/);
    await expect(queueEmail(db, mail(3, { subject: "Two\r\nBcc: x@y.example" }))).rejects.toThrow(
      /line break/,
    );
    await expect(queueEmail(db, mail(3, { text: "" }))).rejects.toThrow(/text is empty/);
    expect(await outbox()).toHaveLength(0);
  });
});

describe("delivery over SMTP to the local capture", () => {
  test("sends queued mail, marks it sent, and the capture stores both parts", async () => {
    const a = await queueEmail(db, mail(1, { html: "<p>Hello <b>there</b></p>" }));
    const b = await queueEmail(db, { ...mail(2), organisationId: null });
    const transport = createSmtpTransport(capture.url);
    const result = await deliverDueEmail(db, { transport, from: FROM, workerId: "w1" });
    transport.close();
    expect(result).toEqual({ claimed: 2, sent: 2, retrying: 0, failed: 0 });

    const rows = await outbox();
    expect(rows.map((r) => [r.id, r.status, r.attempts, r.leaseOwner])).toEqual([
      [a, "sent", 1, null],
      [b, "sent", 1, null],
    ]);
    expect(rows.every((r) => r.sentAt !== null)).toBe(true);

    const got = await captured();
    expect(got).toHaveLength(2);
    const first = got.find((m) => m.outboxId === a);
    expect(first).toMatchObject({
      organisationId: orgId,
      toAddresses: "person1@recurra.example",
      subject: "Message 1",
      // mailparser writes the display name quoted.
      fromAddress: '"Recurra" <no-reply@recurra.example>',
    });
    expect(first?.textBody?.trim()).toBe("Plain text of message 1.");
    expect(first?.htmlBody).toContain("Hello <b>there</b>");
    expect(first?.sizeBytes).toBeGreaterThan(100);
    // System mail (no organisation) is filed under none.
    expect(got.find((m) => m.outboxId === b)?.organisationId).toBeNull();

    // Nothing is sent twice: a second sweep finds nothing to do.
    const again = createSmtpTransport(capture.url);
    expect(await deliverDueEmail(db, { transport: again, from: FROM, workerId: "w1" })).toEqual({
      claimed: 0,
      sent: 0,
      retrying: 0,
      failed: 0,
    });
    again.close();
    expect(await captured()).toHaveLength(2);
  });

  test("mail not from the outbox, or naming another recipient's row, gets no organisation", async () => {
    const id = await queueEmail(db, mail(7));
    const direct = nodemailer.createTransport(capture.url);
    await direct.sendMail({
      from: FROM,
      to: "stranger@recurra.example",
      subject: "Plain",
      text: "x",
    });
    await direct.sendMail({
      from: FROM,
      to: "stranger@recurra.example",
      subject: "Forged",
      text: "x",
      headers: { "X-Recurra-Outbox-Id": String(id) },
    });
    direct.close();
    const got = await captured();
    expect(got.map((m) => [m.subject, m.organisationId, m.outboxId])).toEqual([
      ["Plain", null, null],
      ["Forged", null, null],
    ]);
  });
});

describe("retries and failures", () => {
  test("an unreachable server: retried after a back-off, then failed for good", async () => {
    const id = await queueEmail(db, mail(1));
    const closedPort = await freePort();
    const dead = createSmtpTransport(`smtp://127.0.0.1:${closedPort}`);
    const opts = { transport: dead, from: FROM, workerId: "w1", maxAttempts: 3 };

    expect(await deliverDueEmail(db, { ...opts, retryBaseMs: 60_000 })).toMatchObject({
      retrying: 1,
    });
    let [row] = await outbox();
    expect(row).toMatchObject({ id, status: "queued", attempts: 1, leaseOwner: null });
    expect(row?.lastError).toMatch(/ECONNREFUSED|connect/i);
    expect(row!.nextAttemptAt).toBeGreaterThan(Date.now() + 50_000);
    // Not due yet: the back-off is respected.
    expect((await deliverDueEmail(db, opts)).claimed).toBe(0);

    await db.update(emailOutbox).set({ nextAttemptAt: 0 }).where(eq(emailOutbox.id, id));
    expect(await deliverDueEmail(db, { ...opts, retryBaseMs: 0 })).toMatchObject({ retrying: 1 });
    expect(await deliverDueEmail(db, { ...opts, retryBaseMs: 0 })).toMatchObject({ failed: 1 });
    [row] = await outbox();
    expect(row).toMatchObject({ status: "failed", attempts: 3 });
    expect((await deliverDueEmail(db, { ...opts, retryBaseMs: 0 })).claimed).toBe(0);
    dead.close();
    expect(await captured()).toHaveLength(0);
  });

  test("a message that failed once goes out when the server is back", async () => {
    await queueEmail(db, mail(1));
    const dead = createSmtpTransport(`smtp://127.0.0.1:${await freePort()}`);
    await deliverDueEmail(db, { transport: dead, from: FROM, workerId: "w1", retryBaseMs: 0 });
    dead.close();
    const live = createSmtpTransport(capture.url);
    const r = await deliverDueEmail(db, { transport: live, from: FROM, workerId: "w1" });
    live.close();
    expect(r.sent).toBe(1);
    const [row] = await outbox();
    expect(row).toMatchObject({ status: "sent", attempts: 2, lastError: null });
    expect(await captured()).toHaveLength(1);
  });

  test("a permanent SMTP refusal (5xx) fails at once, without retries", async () => {
    const refusing = new SMTPServer({
      authOptional: true,
      disabledCommands: ["STARTTLS", "AUTH"],
      logger: false,
      onRcptTo(address, _session, cb) {
        cb(
          Object.assign(new Error(`550 No such mailbox ${address.address}`), {
            responseCode: 550,
          }),
        );
      },
    });
    await new Promise<void>((r) => refusing.listen(0, "127.0.0.1", () => r()));
    const port = (refusing.server.address() as { port: number }).port;
    await queueEmail(db, mail(1));
    const transport = createSmtpTransport(`smtp://127.0.0.1:${port}`);
    const r = await deliverDueEmail(db, { transport, from: FROM, workerId: "w1", maxAttempts: 5 });
    transport.close();
    await new Promise<void>((res) => refusing.close(() => res()));
    expect(r).toMatchObject({ failed: 1, retrying: 0 });
    const [row] = await outbox();
    expect(row).toMatchObject({ status: "failed", attempts: 1 });
    expect(row?.lastError).toMatch(/550/);
  });
});

describe("several deliverers sharing one database", () => {
  test("a sweep with nothing due only reads: it does not wait for another client's write lock", async () => {
    await db.delete(emailOutbox);
    const other = createClient({ url });
    const tx = await other.transaction("write");
    try {
      await tx.execute("update email_outbox set attempts = attempts where id = -1");
      const started = performance.now();
      expect(await claimDueEmail(db, { workerId: "idle", leaseMs: 60_000, limit: 5 })).toEqual([]);
      expect(performance.now() - started).toBeLessThan(2_000);
    } finally {
      await tx.rollback();
      tx.close();
      other.close();
    }
  });

  test("two deliverers at once, each on its own connection, never send a message twice", async () => {
    const ids: number[] = [];
    for (let i = 0; i < 24; i++) ids.push(await queueEmail(db, mail(i)));
    const second = await openDatabase(url);
    const run = async (handle: Db, workerId: string) => {
      const transport = createSmtpTransport(capture.url);
      let sent = 0;
      for (;;) {
        const r = await deliverDueEmail(handle, { transport, from: FROM, workerId, batchSize: 3 });
        sent += r.sent;
        if (r.claimed === 0) break;
      }
      transport.close();
      return sent;
    };
    const [one, two] = await Promise.all([run(db, "worker-a"), run(second.db, "worker-b")]);
    second.client.close();
    expect(one + two).toBe(24);
    const got = await captured();
    expect(got).toHaveLength(24);
    expect(new Set(got.map((m) => m.outboxId)).size).toBe(24);
    expect(got.map((m) => m.outboxId).sort((x, y) => x! - y!)).toEqual(ids);
    expect((await outbox()).every((r) => r.status === "sent" && r.attempts === 1)).toBe(true);
  });

  test("a claim whose deliverer died is taken over after its lease; the old owner cannot finish it", async () => {
    const id = await queueEmail(db, mail(1));
    const [claimed] = await claimDueEmail(db, { workerId: "dead", leaseMs: 60_000, limit: 5 });
    expect(claimed?.id).toBe(id);
    const transport = createSmtpTransport(capture.url);
    // While the lease holds, nobody else takes the row.
    expect((await deliverDueEmail(db, { transport, from: FROM, workerId: "alive" })).claimed).toBe(
      0,
    );
    await db
      .update(emailOutbox)
      .set({ leaseExpiresAt: Date.now() - 1 })
      .where(eq(emailOutbox.id, id));
    const r = await deliverDueEmail(db, { transport, from: FROM, workerId: "alive" });
    transport.close();
    expect(r.sent).toBe(1);
    // The dead worker's late write matches nothing: the row is no longer under its lease.
    const late = await db
      .update(emailOutbox)
      .set({ status: "failed" })
      .where(and(eq(emailOutbox.id, id), eq(emailOutbox.leaseOwner, "dead")));
    expect(late.rowsAffected).toBe(0);
    const [row] = await outbox();
    expect(row).toMatchObject({ status: "sent", attempts: 2 });
    expect(await captured()).toHaveLength(1);
  });
});
