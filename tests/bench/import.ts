/**
 * `npm run bench:import -- --rows 1000000`: the import pipeline against the floor, in one run.
 *
 * 1. Writes a deterministic repairs CSV (cached in data/bench/ by row count).
 * 2. Times the `sqlite3` command line's `.import` of the same file into a plain typed table.
 * 3. Imports it through the product's own pipeline into a fresh database, in a child process
 *    (tests/bench/import-run.ts), timing it and reading that process's peak RSS.
 * Prints both rates, their ratio and the peak RSS, and as the last line one JSON object.
 */
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, rmSync, statSync } from "node:fs";
import { join } from "node:path";
import { parseArgs } from "node:util";
import { BENCH_COLUMNS, writeBenchRepairs } from "./repairs-csv";

const { values } = parseArgs({ options: { rows: { type: "string", default: "1000000" } } });
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
rmSync(join(dir, "uploads"), { recursive: true, force: true });
const out = execFileSync(
  process.execPath,
  ["--import", "tsx", "--conditions=react-server", "tests/bench/import-run.ts", csv],
  {
    env: {
      ...process.env,
      DATABASE_URL: `file:${productDb}`,
      RECURRA_DATA_DIR: dir,
      RECURRA_WORKER: "0",
    },
    stdio: ["ignore", "pipe", "inherit"],
    maxBuffer: 16 * 1024 * 1024,
  },
).toString();
const product = JSON.parse(out.trim().split("\n").at(-1) ?? "{}") as {
  status: string;
  rows: number;
  imported: number;
  seconds: number;
  peakRssMb: number;
};
if (product.status !== "done" || product.rows !== rows) {
  throw new Error(`the benchmark import did not finish cleanly: ${out}`);
}

const rowsPerSecond = Math.round(rows / product.seconds);
const floorRowsPerSecond = Math.round(rows / floorSeconds);
const ratio = Math.round((product.seconds / floorSeconds) * 100) / 100;
const peakRssMb = Math.round(product.peakRssMb);
process.stdout.write(
  [
    `file: ${rows.toLocaleString("en-GB")} repair lines, ${mb.toFixed(1)} MB`,
    `Recurra import (upload → check → stage → apply): ${product.seconds.toFixed(2)} s, ${rowsPerSecond.toLocaleString("en-GB")} rows/s, peak RSS ${peakRssMb} MB`,
    `sqlite3 .import into a plain table (floor):      ${floorSeconds.toFixed(2)} s, ${floorRowsPerSecond.toLocaleString("en-GB")} rows/s`,
    `ratio (Recurra time / floor time): ${ratio}  (target ≤ 4; peak RSS target ≤ 300 MB)`,
    JSON.stringify({ rows, rowsPerSecond, floorRowsPerSecond, ratio, peakRssMb }),
  ].join("\n") + "\n",
);
