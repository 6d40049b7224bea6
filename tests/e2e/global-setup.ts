import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { startNext } from "../support/server";

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
    // No mail server: the app's worker starts the local SMTP capture, which the tests read.
    SMTP_URL: "",
    NEXT_TELEMETRY_DISABLED: "1",
  };
  execFileSync("npx", ["tsx", "--conditions=react-server", "jobs/cli.ts", "demo", "load"], {
    env,
    stdio: ["ignore", "inherit", "inherit"],
  });
  const { baseURL, logs, stop } = await startNext(env);
  Object.assign(process.env, {
    E2E_BASE_URL: baseURL,
    DATABASE_URL: env.DATABASE_URL,
    NEXTAUTH_SECRET: env.NEXTAUTH_SECRET,
  });
  return async () => {
    writeFileSync(join("test-results", "e2e-server.log"), logs.join(""));
    stop();
  };
}
