/**
 * `npm run bench:web -- --rows 1000000`: the pattern explorer's routes under load.
 *
 * On the import benchmark's database (built when missing, see bench-db.ts), recomputed so the
 * cells are current, with a benchmark manager account:
 * 1. starts the production build (`next build` first when there is none, or with --build);
 * 2. drives, in one run and with the same settings (20 connections, 20 s each, autocannon),
 *    first the health route (the baseline: no database work beyond `select 1`), then the
 *    heatmap and ranking route handlers with a mix of filters, then the explorer page itself;
 * 3. loads the explorer page in Chromium with an empty cache and sums the transferred size of
 *    its script responses (what a browser downloads on a first visit).
 * Prints p50/p95/p99 for each, the ratio of the routes' p95 to the baseline's p95 (target ≤ 5),
 * errors, first-load JS (target ≤ 300 kB compressed), and as the last line one JSON object.
 */
import { execFileSync } from "node:child_process";
import { existsSync } from "node:fs";
import { parseArgs } from "node:util";
import { chromium } from "@playwright/test";
import autocannon from "autocannon";
import { quantileSorted } from "simple-statistics";
import { startNext } from "../support/server";
import {
  benchDbPath,
  benchDir,
  ensureBenchDatabase,
  recomputeBenchDatabase,
  sqliteValue,
} from "./bench-db";

const { values } = parseArgs({
  options: {
    rows: { type: "string", default: "1000000" },
    seconds: { type: "string", default: "20" },
    connections: { type: "string", default: "20" },
    build: { type: "boolean", default: false },
  },
});
const rows = Number(values.rows);
const duration = Number(values.seconds);
const connections = Number(values.connections);
for (const [name, v] of [
  ["rows", rows],
  ["seconds", duration],
  ["connections", connections],
] as const) {
  if (!Number.isInteger(v) || v < 1) throw new Error(`--${name} must be a positive integer`);
}

const log = (m: string) => process.stderr.write(`${m}\n`);
ensureBenchDatabase(rows);
log("recomputing the benchmark database's cells");
const recompute = recomputeBenchDatabase();

// A manager of the benchmark organisation to sign in with.
const email = "bench-manager@recurra.example";
const password = "bench-password-not-secret";
const env = {
  ...process.env,
  DATABASE_URL: `file:${benchDbPath}`,
  RECURRA_DATA_DIR: benchDir,
  NEXTAUTH_SECRET: "bench-secret-not-for-production-0123456789",
  RECURRA_WORKER: "0",
  NEXT_TELEMETRY_DISABLED: "1",
};
execFileSync(
  "npx",
  ["tsx", "--conditions=react-server", "jobs/cli.ts", "user", "add", "--org", "bench"].concat([
    "--role",
    "manager",
    "--email",
    email,
    "--password",
    password,
  ]),
  { env, stdio: ["ignore", "ignore", "inherit"] },
);
if (values.build || !existsSync(".next/BUILD_ID")) {
  log("building the production bundle (next build)");
  execFileSync("npx", ["next", "build"], { stdio: ["ignore", "ignore", "inherit"] });
}

/** Signs in through next-auth's credentials callback; the cookie header of the session. */
async function signIn(baseURL: string): Promise<string> {
  const csrfRes = await fetch(`${baseURL}/api/auth/csrf`);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(";");
      const at = pair?.indexOf("=") ?? -1;
      if (pair && at > 0) jar.set(pair.slice(0, at), pair.slice(at + 1));
    }
  };
  keep(csrfRes);
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
  const res = await fetch(`${baseURL}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: cookie() },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  keep(res);
  if (![...jar.keys()].some((k) => k.endsWith("next-auth.session-token"))) {
    throw new Error(`sign-in failed: HTTP ${res.status}`);
  }
  return cookie();
}

type Figures = {
  requests: number;
  errors: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  rps: number;
};

/** One autocannon run over `paths` (each connection cycles through them); exact percentiles. */
async function load(
  baseURL: string,
  cookie: string,
  paths: string[],
  seconds: number,
): Promise<Figures> {
  const latencies: number[] = [];
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const instance = autocannon(
      {
        url: baseURL,
        connections,
        duration: seconds,
        headers: { cookie, accept: "application/json,text/html" },
        requests: paths.map((path) => ({ method: "GET" as const, path })),
      },
      (err, res) => (err ? reject(err as Error) : resolve(res)),
    );
    instance.on("response", (_client, _status, _bytes, ms) => latencies.push(ms));
  });
  latencies.sort((a, b) => a - b);
  const q = (p: number) => Math.round(quantileSorted(latencies, p) * 100) / 100;
  return {
    requests: result.requests.total,
    errors: result.errors + result.timeouts + result.non2xx,
    p50Ms: q(0.5),
    p95Ms: q(0.95),
    p99Ms: q(0.99),
    rps: Math.round(result.requests.average),
  };
}

/** Script bytes a fresh browser (empty cache, signed in) downloads to show the explorer. */
async function firstLoadScripts(baseURL: string, cookie: string) {
  const browser = await chromium.launch({ executablePath: "/usr/bin/chromium" });
  try {
    const context = await browser.newContext({ baseURL });
    await context.addCookies(
      cookie.split("; ").map((c) => {
        const at = c.indexOf("=");
        return { name: c.slice(0, at), value: c.slice(at + 1), url: baseURL };
      }),
    );
    const page = await context.newPage();
    const scripts: Promise<{ bytes: number; encoding: string }>[] = [];
    page.on("requestfinished", (req) => {
      if (req.resourceType() !== "script") return;
      scripts.push(
        (async () => {
          const sizes = await req.sizes();
          const res = await req.response();
          return {
            bytes: sizes.responseBodySize + sizes.responseHeadersSize,
            encoding: (await res?.headerValue("content-encoding")) ?? "identity",
          };
        })(),
      );
    });
    await page.goto("/patterns", { waitUntil: "networkidle" });
    await page.getByTestId("heatmap").waitFor();
    const done = await Promise.all(scripts);
    return {
      kb: Math.round((done.reduce((s, x) => s + x.bytes, 0) / 1024) * 10) / 10,
      files: done.length,
      encodings: [...new Set(done.map((x) => x.encoding))].join(", "),
    };
  } finally {
    await browser.close();
  }
}

// The filters a week's use of the explorer sends: both heatmap views, metrics are client-side.
const cohorts = sqliteValue(
  "select make || '|' || model || '|' || cohort_label from cell_stats group by 1 order by sum(events) desc limit 2",
)
  .split("\n")
  .filter(Boolean)
  .map((l) => l.split("|") as [string, string, string]);
const topFault = sqliteValue(
  "select fault_key from cell_stats where fault_key like 'dtc:%' group by 1 order by sum(events) desc limit 1",
).slice(4);
const qs = (o: Record<string, string>) => new URLSearchParams(o).toString();
const routePaths = [
  "/api/heatmap",
  `/api/heatmap?${qs({ fault: topFault })}`,
  ...cohorts.map(
    ([make, model, generation]) =>
      `/api/heatmap?${qs({ view: "faults", make, model, generation })}`,
  ),
  "/api/cells?limit=25",
  "/api/cells?limit=25&offset=25&sort=rate&direction=desc",
  `/api/cells?${qs({ make: cohorts[0]?.[0] ?? "", limit: "25" })}`,
  "/api/cells?signals=1&limit=25",
];

const { baseURL, stop } = await startNext(env);
try {
  const cookie = await signIn(baseURL);
  for (const p of routePaths) {
    const res = await fetch(baseURL + p, { headers: { cookie } });
    if (!res.ok) throw new Error(`${p} answered HTTP ${res.status}`);
  }
  log(`warming up (${connections} connections, 3 s each)`);
  await load(baseURL, cookie, ["/api/health"], 3);
  await load(baseURL, cookie, routePaths, 3);
  await load(baseURL, cookie, ["/patterns"], 3);
  log(`measuring: health, then the heatmap and ranking routes, then the page (${duration} s each)`);
  const baseline = await load(baseURL, cookie, ["/api/health"], duration);
  const routes = await load(baseURL, cookie, routePaths, duration);
  const pageLoad = await load(baseURL, cookie, ["/patterns"], duration);
  const firstLoad = await firstLoadScripts(baseURL, cookie);
  const p95Ratio = Math.round((routes.p95Ms / baseline.p95Ms) * 100) / 100;
  const line = (name: string, f: Figures) =>
    `${name}: p50 ${f.p50Ms} ms, p95 ${f.p95Ms} ms, p99 ${f.p99Ms} ms, ${f.rps} req/s, ${f.requests} requests, ${f.errors} errors`;
  process.stdout.write(
    [
      `data: ${rows.toLocaleString("en-GB")} repair lines, ${recompute.cells} computed cells; ${connections} connections × ${duration} s per run`,
      line("baseline /api/health", baseline),
      line(`heatmap + ranking routes (${routePaths.length} queries in turn)`, routes),
      line("explorer page /patterns (server render, for reference)", pageLoad),
      `p95 ratio (routes / baseline): ${p95Ratio}  (target ≤ 5, zero errors)`,
      `first-load JS of /patterns: ${firstLoad.kb} kB transferred in ${firstLoad.files} scripts (${firstLoad.encodings})  (target ≤ 300 kB)`,
      JSON.stringify({
        p50Ms: routes.p50Ms,
        p95Ms: routes.p95Ms,
        p99Ms: routes.p99Ms,
        baselineP95Ms: baseline.p95Ms,
        p95Ratio,
        errors: routes.errors + baseline.errors,
        firstLoadKb: firstLoad.kb,
      }),
    ].join("\n") + "\n",
  );
} finally {
  stop();
}
