import { execFileSync, spawn } from "node:child_process";
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";

function freePort(): Promise<number> {
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

async function waitForHealth(url: string, timeoutMs: number) {
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
 * A fresh database with the demo scenario, and `next start` on a free loopback port. What the
 * tests need (base URL, database URL, secret) goes to them through the environment.
 */
export default async function globalSetup() {
  const dir = mkdtempSync(join(tmpdir(), "recurra-e2e-"));
  mkdirSync("test-results", { recursive: true });
  const env = {
    ...process.env,
    DATABASE_URL: `file:${join(dir, "e2e.db")}`,
    RECURRA_DATA_DIR: dir,
    NEXTAUTH_SECRET: "e2e-secret-not-for-production-0123456789",
    RECURRA_DEMO: "1",
    NEXT_TELEMETRY_DISABLED: "1",
  };
  execFileSync("npx", ["tsx", "--conditions=react-server", "jobs/cli.ts", "demo", "load"], {
    env,
    stdio: ["ignore", "inherit", "inherit"],
  });
  const port = await freePort();
  const baseURL = `http://127.0.0.1:${port}`;
  const server = spawn(
    "npx",
    ["next", "start", "--hostname", "127.0.0.1", "--port", String(port)],
    {
      env: { ...env, NEXTAUTH_URL: baseURL },
      stdio: ["ignore", "pipe", "pipe"],
      detached: true,
    },
  );
  const logs: string[] = [];
  server.stdout?.on("data", (d: Buffer) => logs.push(d.toString()));
  server.stderr?.on("data", (d: Buffer) => logs.push(d.toString()));
  try {
    await waitForHealth(baseURL, 60_000);
  } catch (e) {
    process.stderr.write(logs.join(""));
    throw e;
  }
  Object.assign(process.env, {
    E2E_BASE_URL: baseURL,
    DATABASE_URL: env.DATABASE_URL,
    NEXTAUTH_SECRET: env.NEXTAUTH_SECRET,
  });
  return async () => {
    writeFileSync(join("test-results", "e2e-server.log"), logs.join(""));
    if (server.pid) process.kill(-server.pid, "SIGTERM");
  };
}
