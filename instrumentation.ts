/** Next.js start-up hook: runs the job worker inside the web server's Node.js process. */
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { startBackgroundWorker } = await import("./jobs/background");
  startBackgroundWorker();
}
