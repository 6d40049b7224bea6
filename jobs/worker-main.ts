/**
 * `npm run worker`: a job worker in its own process. Run several (on one machine or many)
 * against one database; each claims jobs with a lease.
 */
import { getDatabase } from "@/db";
import { migrateDatabase } from "@/db/migrate";
import { defaultWorkerId, startWorker } from "./worker";

const controller = new AbortController();
process.once("SIGTERM", () => controller.abort());
process.once("SIGINT", () => controller.abort());

const { db, client } = await getDatabase();
await migrateDatabase(db);
const workerId = process.env.RECURRA_WORKER_ID ?? defaultWorkerId();
process.stderr.write(`[recurra worker] ${workerId} started\n`);
await startWorker({
  db,
  workerId,
  signal: controller.signal,
  pollMs: Number(process.env.RECURRA_WORKER_POLL_MS ?? 1000),
  leaseMs: Number(process.env.RECURRA_WORKER_LEASE_MS ?? 30_000),
  log: (m) => process.stderr.write(`[recurra worker] ${m}\n`),
});
client.close();
