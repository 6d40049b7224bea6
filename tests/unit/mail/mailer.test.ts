import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { queueEmail } from "@/db/queries/email";
import { capturedMail, emailOutbox } from "@/db/schema";
import { startMailCapture, type MailCapture } from "@/jobs/mail/capture";
import { startMailer } from "@/jobs/mail/mailer";
import { getMailMode, type Env } from "@/lib/env";
import { createTestDb } from "../../support/test-db";

let db: Db;
let capture: MailCapture;

beforeAll(async () => {
  ({ db } = await createTestDb());
  capture = await startMailCapture({ db, log: () => {} });
  // The loop reads its settings from the environment, like the worker does.
  process.env.SMTP_URL = capture.url;
  process.env.MAIL_FROM = "Recurra test <mail-test@recurra.example>";
});

afterAll(async () => {
  await capture?.close();
});

describe("where mail goes", () => {
  const env = (over: Partial<Env>): Env =>
    ({ RECURRA_DEMO: false, NODE_ENV: "production", ...over }) as Env;

  test("SMTP_URL wins; otherwise the local capture in demo mode and outside production", () => {
    expect(getMailMode(env({ SMTP_URL: "smtp://mail.example:25", RECURRA_DEMO: true }))).toEqual({
      kind: "smtp",
      url: "smtp://mail.example:25",
    });
    expect(getMailMode(env({ RECURRA_DEMO: true }))).toEqual({ kind: "capture" });
    expect(getMailMode(env({ NODE_ENV: "development" }))).toEqual({ kind: "capture" });
    expect(getMailMode(env({}))).toEqual({ kind: "off" });
  });
});

describe("the delivery loop", () => {
  test("sends what is queued within a poll or two, until it is stopped", async () => {
    const controller = new AbortController();
    const loop = startMailer({
      db,
      workerId: "loop-test",
      signal: controller.signal,
      pollMs: 100,
      log: () => {},
    });
    const id = await queueEmail(db, {
      organisationId: null,
      to: "loop@recurra.example",
      subject: "From the loop",
      text: "Sent by the delivery loop.",
    });
    let rows: (typeof capturedMail.$inferSelect)[] = [];
    for (let i = 0; i < 50 && rows.length === 0; i++) {
      await new Promise((r) => setTimeout(r, 100));
      rows = await db.select().from(capturedMail);
    }
    controller.abort();
    await loop;
    expect(rows.map((r) => [r.outboxId, r.subject, r.fromAddress])).toEqual([
      [id, "From the loop", '"Recurra test" <mail-test@recurra.example>'],
    ]);
    const [row] = await db.select().from(emailOutbox);
    expect(row?.status).toBe("sent");
  });
});
