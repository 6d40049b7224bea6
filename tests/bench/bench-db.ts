import { execFileSync } from "node:child_process";
import { existsSync } from "node:fs";
import { join } from "node:path";

/** Where the benchmarks keep their data: the import benchmark's database and its files. */
export const benchDir = join(process.cwd(), "data", "bench");
export const benchDbPath = join(benchDir, "import-product.db");

/** One value from the benchmark database through the `sqlite3` command line. */
export function sqliteValue(sql: string): string {
  return execFileSync("sqlite3", [benchDbPath, sql]).toString().trim();
}

/**
 * The import benchmark's database with `rows` repair lines, built by
 * `npm run bench:import -- --rows N` when it is missing or of another size.
 */
export function ensureBenchDatabase(rows: number): void {
  const lines = existsSync(benchDbPath)
    ? Number(sqliteValue("select count(*) from repair_lines"))
    : 0;
  if (lines === rows) return;
  process.stderr.write(`building the ${rows}-row benchmark database with the import benchmark\n`);
  execFileSync("npm", ["run", "-s", "bench:import", "--", "--rows", String(rows)], {
    stdio: "inherit",
  });
}

/**
 * Runs the full recompute on the benchmark database (or the same data on a libSQL server at
 * `url`) in its own process; its JSON result.
 */
export function recomputeBenchDatabase(url = `file:${benchDbPath}`): {
  seconds: number;
  cells: number;
  signals: number;
  peakRssMb: number;
} {
  const out = execFileSync(
    process.execPath,
    ["--import", "tsx", "--conditions=react-server", "tests/bench/stats-run.ts"],
    {
      env: { ...process.env, DATABASE_URL: url, RECURRA_DATA_DIR: benchDir },
      stdio: ["ignore", "pipe", "inherit"],
    },
  ).toString();
  return JSON.parse(out.trim().split("\n").at(-1) ?? "{}");
}
