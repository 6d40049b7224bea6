import type { AddressInfo } from "node:net";
import { eq } from "drizzle-orm";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";
import type { Db } from "@/db";
import { capturedMail, emailOutbox } from "@/db/schema";

/**
 * The local SMTP capture for demo mode, development and tests: a real SMTP server (smtp-server)
 * on loopback that accepts every message, parses it (mailparser) and stores it in
 * `captured_mail`, where admins read it at /settings/mail and tests read it directly. Nothing
 * leaves the machine. Each message is filed under the organisation of the outbox row named by
 * its X-Recurra-Outbox-Id header (when that row's recipient matches), so an admin sees only
 * their own organisation's mail.
 */

export type MailCapture = {
  port: number;
  /** SMTP URL to hand to the deliverer. */
  url: string;
  close: () => Promise<void>;
};

/** Largest message accepted (bytes); bigger ones are refused with 552. */
const MAX_MESSAGE_BYTES = 5 * 1024 * 1024;

export async function startMailCapture(opts: {
  db: Db;
  /** 0 (the default) picks a free port. */
  port?: number;
  log?: (msg: string) => void;
}): Promise<MailCapture> {
  const log = opts.log ?? ((m: string) => console.warn(`[recurra mail capture] ${m}`));
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    size: MAX_MESSAGE_BYTES,
    banner: "Recurra local mail capture",
    logger: false,
    onData(stream, session, callback) {
      let size = 0;
      stream.on("data", (chunk: Buffer) => {
        size += chunk.length;
      });
      simpleParser(stream)
        .then(async (mail) => {
          if (stream.sizeExceeded) {
            const err = Object.assign(new Error("Message too large for the capture"), {
              responseCode: 552,
            });
            callback(err);
            return;
          }
          const recipients = session.envelope.rcptTo.map((r) => r.address.toLowerCase());
          const header = mail.headers.get("x-recurra-outbox-id");
          const outboxId = typeof header === "string" && /^\d+$/.test(header) ? Number(header) : 0;
          let organisationId: number | null = null;
          let linkedOutboxId: number | null = null;
          if (outboxId > 0) {
            const [row] = await opts.db
              .select({ organisationId: emailOutbox.organisationId, to: emailOutbox.toAddress })
              .from(emailOutbox)
              .where(eq(emailOutbox.id, outboxId));
            if (row && recipients.includes(row.to.toLowerCase())) {
              organisationId = row.organisationId;
              linkedOutboxId = outboxId;
            }
          }
          const from = session.envelope.mailFrom;
          await opts.db.insert(capturedMail).values({
            organisationId,
            outboxId: linkedOutboxId,
            messageId: mail.messageId ?? null,
            fromAddress: mail.from?.text ?? (from ? from.address : ""),
            toAddresses: recipients.join(", "),
            subject: mail.subject ?? "",
            textBody: mail.text ?? null,
            htmlBody: typeof mail.html === "string" ? mail.html : null,
            sizeBytes: size,
          });
          callback();
        })
        .catch((e: unknown) => {
          log(`could not store a message: ${String(e)}`);
          callback(
            Object.assign(new Error("The capture could not store the message"), {
              responseCode: 451,
            }),
          );
        });
    },
  });
  server.on("error", (e) => log(`SMTP error: ${String(e)}`));
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port ?? 0, "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
  const port = (server.server.address() as AddressInfo).port;
  return {
    port,
    url: `smtp://127.0.0.1:${port}`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
