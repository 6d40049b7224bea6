/**
 * `npm run worker`: a job worker (and the e-mail delivery loop) in its own process. Run several (on one machine or many)
 * against one database; each claims jobs with a lease.
 */
import { getDatabase } from "@/db";
import { migrateDatabase } from "@/db/migrate";
import { startDigestSchedule } from "./digest/schedule";
import { startMailer } from "./mail/mailer";
import { defaultWorkerId, startWorker } from "./worker";

const controller = new AbortController();
process.once("SIGTERM", () => controller.abort());
process.once("SIGINT", () => controller.abort());

const { db, client } = await getDatabase();
await migrateDatabase(db);
const workerId = process.env.RECURRA_WORKER_ID ?? defaultWorkerId();
process.stderr.write(`[recurra worker] ${workerId} started\n`);
const mailer = startMailer({
  db,
  workerId,
  signal: controller.signal,
  log: (m) => process.stderr.write(`[recurra mail] ${m}\n`),
}).catch((e: unknown) => {
  // Jobs go on without mail; the outbox keeps the messages for the next start.
  process.stderr.write(`[recurra mail] the delivery loop stopped: ${String(e)}\n`);
});
startDigestSchedule({
  db,
  signal: controller.signal,
  log: (m) => process.stderr.write(`[recurra digest] ${m}\n`),
});
await startWorker({
  db,
  workerId,
  signal: controller.signal,
  pollMs: Number(process.env.RECURRA_WORKER_POLL_MS ?? 1000),
  leaseMs: Number(process.env.RECURRA_WORKER_LEASE_MS ?? 30_000),
  log: (m) => process.stderr.write(`[recurra worker] ${m}\n`),
});
await mailer;
client.close();
