import { getDatabase } from "@/db";
import { startWorker } from "./worker";

const state = globalThis as unknown as { recurraWorker?: AbortController };

/**
 * Starts the job worker inside this process (the web server, by default). Idempotent: a second
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
    while (!controller.signal.aborted) {
      try {
        await startWorker({ db, signal: controller.signal });
      } catch (e) {
        // A database hiccup must not kill the web server: log, wait, carry on.
        console.error("[recurra worker] stopped by an error; restarting in 5 s:", e);
        await new Promise((r) => setTimeout(r, 5_000));
      }
    }
  })();
}
