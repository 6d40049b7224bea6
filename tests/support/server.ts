import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";

/** A TCP port that is free on the loopback interface right now. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const address = srv.address();
      const port = typeof address === "object" && address ? address.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** Waits until `GET /api/health` answers 200, or throws with the last answer seen. */
export async function waitForHealth(url: string, timeoutMs: number): Promise<void> {
  const until = Date.now() + timeoutMs;
  let last = "";
  while (Date.now() < until) {
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) return;
      last = `HTTP ${res.status}`;
    } catch (e) {
      last = String(e);
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`next start did not become healthy at ${url}: ${last}`);
}

/**
 * How long the server keeps an idle connection open. Node's default is 5 s, and Playwright's
 * request context keeps sockets in a pool without reading the server's `Keep-Alive: timeout`
 * answer: a request sent on a pooled socket just as the server closes it fails with
 * `read ECONNRESET` (microsoft/playwright#42701). Tests idle far less than a minute between
 * requests, so a 65 s timeout keeps every pooled socket usable.
 */
export const KEEP_ALIVE_MS = 65_000;

/**
 * `next start` of the production build on a free loopback port, in its own process group so
 * that `stop()` ends it with every child. Its output is kept in `logs`.
 */
export async function startNext(env: NodeJS.ProcessEnv): Promise<{
  baseURL: string;
  logs: string[];
  server: ChildProcess;
  stop: () => void;
}> {
  const port = await freePort();
  const baseURL = `http://127.0.0.1:${port}`;
  const server = spawn(
    "npx",
    [
      "next",
      "start",
      "--hostname",
      "127.0.0.1",
      "--port",
      String(port),
      "--keepAliveTimeout",
      String(KEEP_ALIVE_MS),
    ],
    {
      env: { ...env, NEXTAUTH_URL: baseURL },
      stdio: ["ignore", "pipe", "pipe"],
      detached: true,
    },
  );
  const logs: string[] = [];
  server.stdout?.on("data", (d: Buffer) => logs.push(d.toString()));
  server.stderr?.on("data", (d: Buffer) => logs.push(d.toString()));
  const stop = () => {
    if (server.pid && server.exitCode === null) process.kill(-server.pid, "SIGTERM");
  };
  try {
    await waitForHealth(baseURL, 60_000);
  } catch (e) {
    stop();
    process.stderr.write(logs.join(""));
    throw e;
  }
  return { baseURL, logs, server, stop };
}
