import { getDatabase } from "@/db";
import { startDigestSchedule } from "./digest/schedule";
import { startMailer } from "./mail/mailer";
import { defaultWorkerId, startWorker } from "./worker";

const state = globalThis as unknown as { recurraWorker?: AbortController };

/**
 * Starts the job worker and the e-mail delivery loop inside this process (the web server, by default). Idempotent: a second
 * call in the same process does nothing. Set RECURRA_WORKER=0 to leave the jobs to separate
 * `npm run worker` processes.
 */
export function startBackgroundWorker(): void {
  if (state.recurraWorker || process.env.RECURRA_WORKER === "0") return;
  const controller = new AbortController();
  state.recurraWorker = controller;
  const stop = () => controller.abort();
  process.once("SIGTERM", stop);
  process.once("SIGINT", stop);
  void (async () => {
    const { db } = await getDatabase();
    const workerId = defaultWorkerId();
    // Outgoing mail is swept beside the jobs, so a long import never holds it up.
    void startMailer({ db, workerId, signal: controller.signal }).catch((e: unknown) =>
      console.error("[recurra mail] the delivery loop stopped:", e),
    );
    // The weekly digest is queued on its schedule; the job sends it once per organisation and week.
    startDigestSchedule({ db, signal: controller.signal });
    while (!controller.signal.aborted) {
      try {
        await startWorker({ db, workerId, signal: controller.signal });
      } catch (e) {
        // A database hiccup must not kill the web server: log, wait, carry on.
        console.error("[recurra worker] stopped by an error; restarting in 5 s:", e);
        await new Promise((r) => setTimeout(r, 5_000));
      }
    }
  })();
}
