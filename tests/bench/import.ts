/**
 * `npm run bench:import -- --rows 1000000`: the import pipeline against the floor, in one run.
 *
 * 1. Writes a deterministic repairs CSV (cached in data/bench/ by row count).
 * 2. Times the `sqlite3` command line's `.import` of the same file into a plain typed table.
 * 3. Imports it through the product's own pipeline into a fresh database, in a child process
 *    (tests/bench/import-run.ts), timing it and reading that process's peak RSS. The child runs
 *    compiled JavaScript (bundled with esbuild first), as the product does in production:
 *    tsx's on-the-fly compiler would add a loader thread and about 110 MB to the process.
 *    It also times csv-parse alone on the same file (same options, its own process), and prints
 *    how long each of the import's two threads was busy: the reading one (parse and checks)
 *    and the writing one (SQLite), each against the floor.
 * 4. With `--server`: the same import again into a fresh libSQL server (sqld on loopback, see
 *    tests/support/sqld.ts), and the ratio server / file.
 * Prints both rates, their ratio and the peak RSS, and as the last line one JSON object.
 */
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { join } from "node:path";
import { parseArgs } from "node:util";
import { build } from "esbuild";
import { startSqld } from "../support/sqld";
import { BENCH_COLUMNS, writeBenchRepairs } from "./repairs-csv";

const { values } = parseArgs({
  options: { rows: { type: "string", default: "1000000" }, server: { type: "boolean" } },
});
const rows = Number(values.rows);
if (!Number.isInteger(rows) || rows < 1) throw new Error("--rows must be a positive integer");

const dir = join(process.cwd(), "data", "bench");
mkdirSync(dir, { recursive: true });
const csv = join(dir, `repairs-${rows}.csv`);
if (!existsSync(csv)) {
  process.stderr.write(`writing ${csv}\n`);
  await writeBenchRepairs(csv, rows);
}
const mb = statSync(csv).size / 1_048_576;

// The floor first (on a quiet machine): sqlite3's own CSV import into a plain table with the
// same columns. Then the product, so its writes do not slow the floor down.
const floorDb = join(dir, "import-floor.db");
for (const suffix of ["", "-wal", "-shm"]) rmSync(floorDb + suffix, { force: true });
const typed = BENCH_COLUMNS.map((c) =>
  /year|odometer|hours|cost/.test(c) ? `${c} REAL` : `${c} TEXT`,
).join(", ");
execFileSync("sqlite3", [floorDb, `create table repairs (${typed});`]);
const t0 = performance.now();
execFileSync("sqlite3", [floorDb, ".import --csv --skip 1 " + csv + " repairs"]);
const floorSeconds = (performance.now() - t0) / 1000;

// The product's pipeline, in its own process and database.
const productDb = join(dir, "import-product.db");
for (const suffix of ["", "-wal", "-shm"]) rmSync(productDb + suffix, { force: true });
type ImportRun = {
  status: string;
  rows: number;
  imported: number;
  seconds: number;
  peakRssMb: number;
  /** How long each thread of the import was busy (a file database's one-transaction path). */
  busy: { readerMs: number; writerMs: number } | null;
};

// The import run as one compiled file; packages stay in node_modules (the native ones must).
const runner = join(dir, "import-run.mjs");
await build({
  entryPoints: ["tests/bench/import-run.ts"],
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  outfile: runner,
  conditions: ["react-server"],
  packages: "external",
  logLevel: "warning",
});

/** The product's import in its own process against DATABASE_URL `url`. */
function runProductImport(url: string): ImportRun {
  rmSync(join(dir, "uploads"), { recursive: true, force: true });
  const out = execFileSync(process.execPath, ["--conditions=react-server", runner, csv], {
    env: { ...process.env, DATABASE_URL: url, RECURRA_DATA_DIR: dir, RECURRA_WORKER: "0" },
    stdio: ["ignore", "pipe", "inherit"],
    maxBuffer: 16 * 1024 * 1024,
  }).toString();
  const run = JSON.parse(out.trim().split("\n").at(-1) ?? "{}") as ImportRun;
  if (run.status !== "done" || run.rows !== rows) {
    throw new Error(`the benchmark import did not finish cleanly: ${out}`);
  }
  return run;
}

const product = runProductImport(`file:${productDb}`);
if (!product.busy) throw new Error("the benchmark import did not report its threads' busy time");

// csv-parse alone on the same file, in a process of its own (tests/bench/import-run.ts).
const parseOnly = JSON.parse(
  execFileSync(process.execPath, ["--conditions=react-server", runner, csv, "--parse-only"], {
    stdio: ["ignore", "pipe", "inherit"],
  })
    .toString()
    .trim()
    .split("\n")
    .at(-1) ?? "{}",
) as { records: number; seconds: number };
if (parseOnly.records !== rows + 1) throw new Error("csv-parse alone did not read every row");

const timesFloor = (seconds: number) =>
  (Math.round((seconds / floorSeconds) * 100) / 100).toFixed(2);
const rowsPerSecond = Math.round(rows / product.seconds);
const floorRowsPerSecond = Math.round(rows / floorSeconds);
const ratio = Math.round((product.seconds / floorSeconds) * 100) / 100;
const peakRssMb = Math.round(product.peakRssMb);
const lines = [
  `file: ${rows.toLocaleString("en-GB")} repair lines, ${mb.toFixed(1)} MB`,
  `Recurra import (upload → check → write): ${product.seconds.toFixed(2)} s, ${rowsPerSecond.toLocaleString("en-GB")} rows/s, peak RSS ${peakRssMb} MB`,
  `sqlite3 .import into a plain table (floor):      ${floorSeconds.toFixed(2)} s, ${floorRowsPerSecond.toLocaleString("en-GB")} rows/s`,
  `ratio (Recurra time / floor time): ${ratio}  (target ≤ 4; peak RSS target ≤ 300 MB)`,
  `where the time goes: reading thread busy ${(product.busy.readerMs / 1000).toFixed(2)} s (csv-parse alone ${parseOnly.seconds.toFixed(2)} s, ${timesFloor(parseOnly.seconds)}× the floor), writer thread busy ${(product.busy.writerMs / 1000).toFixed(2)} s (${timesFloor(product.busy.writerMs / 1000)}× the floor)`,
];
const figures: Record<string, unknown> = {
  rows,
  rowsPerSecond,
  floorRowsPerSecond,
  ratio,
  peakRssMb,
  readerBusySeconds: Math.round(product.busy.readerMs / 10) / 100,
  writerBusySeconds: Math.round(product.busy.writerMs / 10) / 100,
  csvParseSeconds: Math.round(parseOnly.seconds * 100) / 100,
};

if (values.server) {
  // The same import into a fresh libSQL server on loopback, after the file run.
  const sqldDir = join(dir, "sqld");
  rmSync(sqldDir, { recursive: true, force: true });
  const server = await startSqld({ dbPath: sqldDir });
  try {
    const onServer = runProductImport(server.url);
    const sqldPeak = /VmHWM:\s+(\d+) kB/.exec(
      readFileSync(`/proc/${server.process.pid}/status`, "utf8"),
    );
    const serverRatio = Math.round((onServer.seconds / product.seconds) * 100) / 100;
    const serverRowsPerSecond = Math.round(rows / onServer.seconds);
    const sqldPeakMb = sqldPeak ? Math.round(Number(sqldPeak[1]) / 1024) : null;
    lines.push(
      `Recurra import into a libSQL server (sqld, loopback HTTP): ${onServer.seconds.toFixed(2)} s, ${serverRowsPerSecond.toLocaleString("en-GB")} rows/s, peak RSS ${Math.round(onServer.peakRssMb)} MB (sqld ${sqldPeakMb} MB)`,
      `ratio server / file: ${serverRatio}`,
    );
    Object.assign(figures, {
      serverSeconds: Math.round(onServer.seconds * 100) / 100,
      serverRowsPerSecond,
      serverPeakRssMb: Math.round(onServer.peakRssMb),
      sqldPeakRssMb: sqldPeakMb,
      serverRatio,
    });
  } finally {
    await server.stop();
  }
}
process.stdout.write([...lines, JSON.stringify(figures)].join("\n") + "\n");
