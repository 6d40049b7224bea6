/**
 * Throughput of the repairs row reader over 1,000,000 generated repair lines.
 *
 *   npx tsx --conditions=react-server tests/bench/row-reader.ts [rows] [runs]
 *
 * Records are generated as CSV text in chunks and split by csv-parse outside the timed part (so
 * the cells are the strings the import pipeline will hand over), and only createRowReader's
 * reader is measured: no CSV parsing, no database. A garbage collection runs before each timed
 * chunk, so the generator's garbage is not collected on the reader's time; the reader's own
 * garbage is. Every complaint text is distinct (a worst case for reading symptoms from text);
 * VINs repeat, as they do in a fleet (one vehicle, many repair lines); one row in seven carries
 * a bad DTC and so a warning.
 */
import v8 from "node:v8";
import vm from "node:vm";
import { parse } from "csv-parse/sync";
import seedrandom from "seedrandom";
import { autoMapHeaders, createRowReader, type ReadOptions } from "@/lib/import";
import { withVinCheckDigit } from "@/lib/vin";

v8.setFlagsFromString("--expose-gc");
const collectGarbage = vm.runInNewContext("gc") as () => void;

const TOTAL = Number(process.argv[2] ?? 1_000_000);
const RUNS = Number(process.argv[3] ?? 3);
const CHUNK = 20_000;

const HEADERS = [
  "RO #",
  "Unit",
  "VIN",
  "Date In",
  "Date Out",
  "Miles In",
  "Complaint",
  "Cause",
  "Correction",
  "Codes",
  "Component",
  "Labor Hrs",
  "Parts $",
  "Labor $",
  "Part No.",
  "Tech",
  "Vendor",
  "Warranty?",
];

const COMPLAINTS = [
  "Stalls a few miles after refuelling",
  "Cranks no start in the morning",
  "Check engine light on",
  "Hard shifts 2-3 when cold",
  "Heavy steering at low speed, EPS light",
  "Rough idle at lights",
  "Squeal from front on braking",
  "Coolant drip under engine",
  "Running hot in traffic",
  "Radio dead, blows fuse",
  "Lack of power on hills",
  "Customer states vehicle pulls right",
];
const CODES = ["", "P0441", "P0455; P0496", "P0300 P0301", "U0131", "P0700, P0730", "P99999"];
const COMPONENTS = ["Fuel vapour → Purge valve", "ignition/coils", "Battery", "", "Thermostat"];
const TECHS = ["A. Reyes", "J. Okafor", "M. Lindqvist", "S. Patel"];

/** A fleet of 2,000 synthetic vehicles: invented manufacturer code "9ZZ", valid check digits. */
function makeFleet(rng: () => number): string[] {
  const chars = "ABCDEFGHJKLMNPRSTUVWXYZ0123456789";
  return Array.from({ length: 2_000 }, () => {
    let vin = "9ZZ";
    for (let i = 3; i < 17; i++) vin += chars[Math.floor(rng() * chars.length)];
    return withVinCheckDigit(`${vin.slice(0, 9)}L${vin.slice(10)}`);
  });
}

/** RFC 4180 quoting, enough for the generated values. */
const csvLine = (cells: string[]) =>
  cells.map((c) => (/[",\n]/.test(c) ? `"${c.replaceAll('"', '""')}"` : c)).join(",");

function generateChunk(start: number, size: number, rng: () => number, fleet: string[]) {
  const lines: string[] = [];
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rng() * xs.length)] as T;
  for (let i = start; i < start + size; i++) {
    const unit = Math.floor(rng() * fleet.length);
    const month = 1 + Math.floor(rng() * 12);
    const day = 1 + Math.floor(rng() * 28);
    const miles = Math.floor(rng() * 180_000);
    const record = [
      `RO-${100_000 + i}`,
      `U${1000 + unit}`,
      fleet[unit] as string,
      `${month}/${day}/2024`,
      rng() < 0.8 ? `${month}/${Math.min(day + 1, 28)}/2024` : "",
      miles.toLocaleString("en-US"),
      `${pick(COMPLAINTS)} (line ${i})`,
      "Found fault on inspection",
      "Replaced part, road tested OK",
      pick(CODES),
      pick(COMPONENTS),
      (Math.round(rng() * 60) / 10).toFixed(1),
      `$${(rng() * 900).toFixed(2)}`,
      (rng() * 600).toFixed(2),
      `PN-${Math.floor(rng() * 9000)}`,
      pick(TECHS),
      rng() < 0.3 ? "Outside shop" : "",
      rng() < 0.1 ? "Y" : "N",
    ];
    lines.push(csvLine(record));
  }
  return parse(lines.join("\n"), { relax_column_count: true }) as string[][];
}

const OPTIONS: ReadOptions = {
  dateFormat: "mdy",
  decimalSeparator: ".",
  distanceUnit: "mi",
  volumeUnit: "us-gal",
};

type RunResult = {
  rowsPerSecond: number;
  /** Rows per second of CPU time used by the process (all its threads) while reading. */
  rowsPerCpuSecond: number;
  ok: number;
  rejected: number;
  warned: number;
};

function run(): RunResult {
  const rng = seedrandom("recurra-row-reader-bench");
  const fleet = makeFleet(rng);
  const { mapping, missingRequired } = autoMapHeaders("repairs", HEADERS);
  if (missingRequired.length > 0) throw new Error(`bench: unmapped ${missingRequired.join(", ")}`);
  const read = createRowReader("repairs", HEADERS, mapping, OPTIONS, { today: "2025-01-01" });
  let ok = 0;
  let rejected = 0;
  let warned = 0;
  let ns = 0n;
  let cpuMicros = 0;
  for (let start = 0; start < TOTAL; start += CHUNK) {
    const records = generateChunk(start, Math.min(CHUNK, TOTAL - start), rng, fleet);
    collectGarbage();
    const cpu0 = process.cpuUsage();
    const t0 = process.hrtime.bigint();
    for (let i = 0; i < records.length; i++) {
      const result = read(records[i] as string[], start + i + 2);
      if (result.ok) {
        ok++;
        if (result.warnings.length > 0) warned++;
      } else rejected++;
    }
    ns += process.hrtime.bigint() - t0;
    const cpu = process.cpuUsage(cpu0);
    cpuMicros += cpu.user + cpu.system;
  }
  return {
    rowsPerSecond: TOTAL / (Number(ns) / 1e9),
    rowsPerCpuSecond: TOTAL / (cpuMicros / 1e6),
    ok,
    rejected,
    warned,
  };
}

const results = Array.from({ length: RUNS }, run);
for (const [i, r] of results.entries()) {
  process.stdout.write(
    `run ${i + 1}: ${Math.round(r.rowsPerSecond).toLocaleString("en-US")} rows/s, ` +
      `${Math.round(r.rowsPerCpuSecond).toLocaleString("en-US")} rows per CPU-second ` +
      `(${r.ok} ok, ${r.warned} with warnings, ${r.rejected} rejected)\n`,
  );
}
const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)] ?? 0;
const fmt = (x: number) => Math.round(x).toLocaleString("en-US");
process.stdout.write(
  `repairs row reader, ${fmt(TOTAL)} rows, median of ${RUNS}: ` +
    `${fmt(median(results.map((r) => r.rowsPerSecond)))} rows/s wall clock, ` +
    `${fmt(median(results.map((r) => r.rowsPerCpuSecond)))} rows per CPU-second ` +
    `(Node ${process.version})\n`,
);
