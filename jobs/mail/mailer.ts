import { setTimeout as sleep } from "node:timers/promises";
import type { Db } from "@/db";
import { getEnv, getMailMode } from "@/lib/env";
import { startMailCapture, type MailCapture } from "./capture";
import { createSmtpTransport, deliverDueEmail, OUTBOX_DEFAULTS } from "./outbox";

/**
 * The delivery loop that runs beside the job worker (in the web server's background worker and
 * in `npm run worker`): every poll it sweeps the outbox. Where mail goes follows getMailMode:
 * SMTP_URL, or a local capture that this loop starts on loopback (demo and development), or
 * nowhere (production without SMTP_URL: mail stays queued and a warning says so once).
 */
export async function startMailer(opts: {
  db: Db;
  workerId: string;
  signal: AbortSignal;
  pollMs?: number;
  log?: (msg: string) => void;
}): Promise<void> {
  const log = opts.log ?? ((m: string) => console.warn(`[recurra mail] ${m}`));
  const env = getEnv();
  const mode = getMailMode(env);
  if (mode.kind === "off") {
    log("SMTP_URL is not set: e-mail stays queued in the outbox until it is.");
    return;
  }
  let capture: MailCapture | null = null;
  let url: string;
  if (mode.kind === "capture") {
    capture = await startMailCapture({ db: opts.db, log });
    url = capture.url;
    log(`no SMTP_URL: mail is captured locally on ${capture.url} (read it at /settings/mail)`);
  } else {
    url = mode.url;
  }
  const transport = createSmtpTransport(url);
  try {
    while (!opts.signal.aborted) {
      try {
        const r = await deliverDueEmail(opts.db, {
          transport,
          from: env.MAIL_FROM,
          workerId: opts.workerId,
          log,
        });
        // A full batch means more may be waiting: sweep again at once.
        if (r.claimed >= OUTBOX_DEFAULTS.batchSize) continue;
      } catch (e) {
        log(`delivery sweep failed; trying again shortly: ${String(e)}`);
      }
      await sleep(opts.pollMs ?? 1_000, undefined, { signal: opts.signal }).catch(() => {});
    }
  } finally {
    transport.close();
    await capture?.close();
  }
}
