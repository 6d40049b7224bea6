import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { startNext } from "../support/server";
import { startSqld } from "../support/sqld";

/**
 * For `npm run test:server:e2e`: a libSQL server with the demo scenario and two `next start`
 * nodes on it, sharing the secret and the uploads folder. The browser smoke tests run once
 * against each node (projects node-a and node-b).
 */
export default async function globalSetup() {
  const sqld = await startSqld();
  const dir = mkdtempSync(join(tmpdir(), "recurra-e2e-nodes-"));
  mkdirSync("test-results", { recursive: true });
  const env = {
    ...process.env,
    DATABASE_URL: sqld.url,
    RECURRA_DATA_DIR: dir,
    NEXTAUTH_SECRET: "e2e-nodes-secret-not-for-production-0123456789",
    RECURRA_DEMO: "1",
    NEXT_TELEMETRY_DISABLED: "1",
  };
  execFileSync("npx", ["tsx", "--conditions=react-server", "jobs/cli.ts", "demo", "load"], {
    env,
    stdio: ["ignore", "inherit", "inherit"],
  });
  const nodeA = await startNext(env);
  const nodeB = await startNext({ ...env, RECURRA_WORKER: "0" });
  Object.assign(process.env, {
    "E2E_BASE_URL_node-a": nodeA.baseURL,
    "E2E_BASE_URL_node-b": nodeB.baseURL,
    DATABASE_URL: env.DATABASE_URL,
    NEXTAUTH_SECRET: env.NEXTAUTH_SECRET,
  });
  return async () => {
    writeFileSync(join("test-results", "e2e-node-a.log"), nodeA.logs.join(""));
    writeFileSync(join("test-results", "e2e-node-b.log"), nodeB.logs.join(""));
    nodeA.stop();
    nodeB.stop();
    await sqld.stop();
  };
}
