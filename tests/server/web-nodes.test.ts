import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { encode } from "next-auth/jwt";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { mappingByName } from "@/jobs/import/inspect";
import { startNext } from "../support/server";
import { startSqld, type SqldServer } from "../support/sqld";

/**
 * Two `next start` processes on different loopback ports against one libSQL server, sharing
 * only the database, the uploads folder and NEXTAUTH_SECRET: a session made on one is valid on
 * the other, and what one node writes the other reads. Uses the production build (built here
 * if there is none, e.g. when test:server runs alone).
 */

const SECRET = "web-nodes-secret-not-for-production-0123456789";
type Node = Awaited<ReturnType<typeof startNext>>;

let sqld: SqldServer;
let nodeA: Node;
let nodeB: Node;

/** Signs in through next-auth's credentials endpoint; returns the Cookie header. */
async function signIn(baseURL: string, email: string, password = "recurra-demo") {
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(";");
      const at = pair?.indexOf("=") ?? -1;
      if (pair && at > 0) jar.set(pair.slice(0, at), pair.slice(at + 1));
    }
  };
  const csrfRes = await fetch(`${baseURL}/api/auth/csrf`);
  keep(csrfRes);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
  const res = await fetch(`${baseURL}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: cookie() },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  keep(res);
  const session = [...jar.keys()].find((k) => k.endsWith("next-auth.session-token"));
  if (!session) throw new Error(`sign-in on ${baseURL} failed: HTTP ${res.status}`);
  return { cookie: cookie(), token: jar.get(session) ?? "" };
}

beforeAll(async () => {
  if (!existsSync(".next/BUILD_ID")) {
    execFileSync("npx", ["next", "build"], { stdio: "inherit", timeout: 600_000 });
  }
  sqld = await startSqld();
  const dir = mkdtempSync(join(tmpdir(), "recurra-web-nodes-"));
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: "production",
    DATABASE_URL: sqld.url,
    RECURRA_DATA_DIR: dir,
    NEXTAUTH_SECRET: SECRET,
    NEXT_TELEMETRY_DISABLED: "1",
  };
  delete env.RECURRA_TEST_DATABASE;
  execFileSync("npx", ["tsx", "--conditions=react-server", "jobs/cli.ts", "demo", "load"], {
    env,
    stdio: ["ignore", "ignore", "inherit"],
    timeout: 300_000,
  });
  // Node A runs the job worker; node B leaves jobs to others (RECURRA_WORKER=0).
  [nodeA, nodeB] = await Promise.all([startNext(env), startNext({ ...env, RECURRA_WORKER: "0" })]);
}, 600_000);

afterAll(async () => {
  nodeA?.stop();
  nodeB?.stop();
  await sqld?.stop();
});

describe("two web nodes on one libSQL server", () => {
  test("both are healthy and report current migrations", async () => {
    for (const node of [nodeA, nodeB]) {
      const res = await fetch(`${node.baseURL}/api/health`);
      expect(res.status).toBe(200);
    }
  });

  test("a session made on node A is valid on node B, with the same answers", async () => {
    const { cookie } = await signIn(nodeA.baseURL, "manager@recurra.example");
    const onA = await fetch(`${nodeA.baseURL}/api/overview`, { headers: { cookie } });
    const onB = await fetch(`${nodeB.baseURL}/api/overview`, { headers: { cookie } });
    expect(onA.status).toBe(200);
    expect(onB.status).toBe(200);
    expect(await onB.json()).toEqual(await onA.json());
    // The signed-in shell renders on node B.
    const page = await fetch(`${nodeB.baseURL}/`, { headers: { cookie }, redirect: "manual" });
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('data-testid="who"');
  });

  test("node B refuses a session token signed with another secret, and no session at all", async () => {
    const { token } = await signIn(nodeA.baseURL, "viewer@recurra.example");
    const forged = await encode({
      token: { ...(await decodeClaims(token)) },
      secret: "a-different-secret-0123456789-abcdef",
    });
    const res = await fetch(`${nodeB.baseURL}/api/overview`, {
      headers: { cookie: `next-auth.session-token=${forged}` },
    });
    expect(res.status).toBe(401);
    expect((await fetch(`${nodeB.baseURL}/api/overview`)).status).toBe(401);
  });

  test("an import uploaded on node B and started on node A is run by node A's worker; B sees it done", async () => {
    const { cookie } = await signIn(nodeB.baseURL, "manager@recurra.example");
    const csv = [
      "ro_number,unit_number,make,model,model_year,opened_on,odometer,complaint,dtc_codes",
      "WN-1,WN-UNIT-1,Aurel,Kestrel,2016,2025-06-02,61000,Stalls after fill-up,P0455",
      "WN-2,WN-UNIT-2,Aurel,Kestrel,2016,2025-06-03,42000,Check engine light,P0300",
    ].join("\n");
    const up = await fetch(`${nodeB.baseURL}/api/imports?kind=repairs&name=web-nodes.csv`, {
      method: "PUT",
      headers: { cookie },
      body: csv,
    });
    expect(up.status, await up.clone().text()).toBe(201);
    const { importId, inspection } = (await up.json()) as {
      importId: number;
      inspection: { headers: string[]; mapping: Record<string, number | null>; read: unknown };
    };
    const start = await fetch(`${nodeA.baseURL}/api/imports/${importId}/start`, {
      method: "POST",
      headers: { cookie, "content-type": "application/json" },
      body: JSON.stringify({
        mapping: mappingByName(inspection.headers, inspection.mapping),
        read: inspection.read,
      }),
    });
    expect(start.status, await start.clone().text()).toBe(202);
    let status = "";
    let body: Record<string, unknown> = {};
    for (let i = 0; i < 120 && !["done", "failed"].includes(status); i++) {
      await new Promise((r) => setTimeout(r, 500));
      const res = await fetch(`${nodeB.baseURL}/api/imports/${importId}`, { headers: { cookie } });
      body = (await res.json()) as Record<string, unknown>;
      status = String(body.status);
    }
    expect(body).toMatchObject({ status: "done", rowsTotal: 2, rowsImported: 2 });
  });
});

/** The claims of a session token (decoded with the shared secret). */
async function decodeClaims(token: string) {
  const { decode } = await import("next-auth/jwt");
  const claims = await decode({ token, secret: SECRET });
  if (!claims) throw new Error("the session token did not decode with the shared secret");
  return claims;
}
