/**
 * `npm run bench:stats -- --rows 1000000`: the full recompute against a bare GROUP BY.
 *
 * Uses the import benchmark's database (data/bench/import-product.db, built by
 * `npm run bench:import -- --rows N` when missing or of another size), then in one run:
 * 1. times the `sqlite3` command line's bare GROUP BY of cohort × mileage band × DTC over the
 *    same file (the floor: counting only, no exposure, no statistics, no writes);
 * 2. times Recurra's full recompute (exposure from every odometer reading, events by fault,
 *    intervals, rate ratios, BH, shrinkage, writing cells and signals) in a child process, with
 *    its peak RSS.
 * 3. With `--server`: copies the same database into a libSQL server (`VACUUM INTO` its data
 *    file, then sqld on loopback) and runs the same recompute against it, with the ratio
 *    server / file.
 * Prints both times, their ratio and the peak RSS, and as the last line one JSON object.
 */
import { execFileSync } from "node:child_process";
import { mkdirSync, rmSync } from "node:fs";
import { join } from "node:path";
import { parseArgs } from "node:util";
import { startSqld } from "../support/sqld";
import { benchDbPath, benchDir, ensureBenchDatabase, recomputeBenchDatabase } from "./bench-db";

const { values } = parseArgs({
  options: { rows: { type: "string", default: "1000000" }, server: { type: "boolean" } },
});
const rows = Number(values.rows);
if (!Number.isInteger(rows) || rows < 1) throw new Error("--rows must be a positive integer");
ensureBenchDatabase(rows);
const dbPath = benchDbPath;
const width = 25_000;
const floorSql = `select v.make, v.model, coalesce(g.label, v.model_year) as label,
    cast(l.odometer_mi / ${width} as integer) as band, c.dtc, count(*), count(distinct l.vehicle_id)
  from repair_line_codes c join repair_lines l on l.id = c.repair_line_id
  join vehicles v on v.id = l.vehicle_id left join generations g on g.id = v.generation_id
  where l.odometer_mi is not null group by 1, 2, 3, 4, 5;`;
// Warm the page cache once so neither side pays for the first read from disk.
execFileSync("sqlite3", [
  dbPath,
  "select count(*) from repair_lines; select count(*) from repair_line_codes;",
]);
const t0 = performance.now();
const groups = execFileSync("sqlite3", [dbPath, floorSql], { maxBuffer: 256 * 1024 * 1024 })
  .toString()
  .split("\n")
  .filter(Boolean).length;
const floorSeconds = (performance.now() - t0) / 1000;

const result = recomputeBenchDatabase();
const ratio = Math.round((result.seconds / floorSeconds) * 100) / 100;
const peakRssMb = Math.round(result.peakRssMb);
const recomputeSeconds = Math.round(result.seconds * 100) / 100;
const lines = [
  `data: ${rows.toLocaleString("en-GB")} repair lines`,
  `sqlite3 bare GROUP BY cohort × band × DTC (floor): ${floorSeconds.toFixed(2)} s, ${groups} groups`,
  `Recurra full recompute: ${result.seconds.toFixed(2)} s, ${result.cells} cells, ${result.signals} signals, peak RSS ${peakRssMb} MB`,
  `ratio (recompute / floor): ${ratio}  (target ≤ 2; peak RSS target ≤ 400 MB)`,
];
const figures: Record<string, unknown> = {
  rows,
  recomputeSeconds,
  floorSeconds: Math.round(floorSeconds * 100) / 100,
  ratio,
  peakRssMb,
};

if (values.server) {
  // The same data on a libSQL server: a consistent copy of the file (VACUUM INTO, as a backup
  // of a live file database is taken) becomes the server's database before it starts.
  const sqldDir = join(benchDir, "sqld-stats");
  rmSync(sqldDir, { recursive: true, force: true });
  mkdirSync(join(sqldDir, "dbs", "default"), { recursive: true });
  execFileSync("sqlite3", [dbPath, `vacuum into '${join(sqldDir, "dbs", "default", "data")}'`]);
  const server = await startSqld({ dbPath: sqldDir });
  try {
    const onServer = recomputeBenchDatabase(server.url);
    if (onServer.cells !== result.cells)
      throw new Error(
        `the server recompute made ${onServer.cells} cells, the file one ${result.cells}`,
      );
    const serverRatio = Math.round((onServer.seconds / result.seconds) * 100) / 100;
    lines.push(
      `Recurra full recompute on a libSQL server (sqld, loopback HTTP): ${onServer.seconds.toFixed(2)} s, ${onServer.cells} cells, peak RSS ${Math.round(onServer.peakRssMb)} MB`,
      `ratio server / file: ${serverRatio}`,
    );
    Object.assign(figures, {
      serverSeconds: Math.round(onServer.seconds * 100) / 100,
      serverPeakRssMb: Math.round(onServer.peakRssMb),
      serverRatio,
    });
  } finally {
    await server.stop();
  }
}
process.stdout.write([...lines, JSON.stringify(figures)].join("\n") + "\n");
