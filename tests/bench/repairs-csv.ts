import { createWriteStream } from "node:fs";
import seedrandom from "seedrandom";

/** Column order of the benchmark's repairs file (Recurra's canonical names). */
export const BENCH_COLUMNS = [
  "ro_number",
  "unit_number",
  "make",
  "model",
  "model_year",
  "opened_on",
  "closed_on",
  "odometer",
  "complaint",
  "cause",
  "correction",
  "dtc_codes",
  "component",
  "symptom",
  "labor_hours",
  "parts_cost",
  "labor_cost",
  "part_numbers",
  "technician",
  "vendor",
  "is_warranty",
] as const;

const JOBS: [string, string, string, string, string][] = [
  [
    "Stalls after filling up",
    "Purge valve stuck open",
    "Replaced purge valve",
    "P0496 P0441",
    "fuel-vapour/purge-valve",
  ],
  [
    "Engine lamp on, rough idle",
    "Cracked intake hose",
    "Replaced hose, cleared codes",
    "P0171",
    "",
  ],
  ["Brakes squeal when stopping", "Front pads worn", "Replaced front pads", "", ""],
  [
    "Won't crank some mornings",
    "Loose main fuse contact",
    "Cleaned and tightened contact",
    "P0562",
    "",
  ],
  ["Hard shifts when warm", "Corroded ground strap", "Replaced ground strap", "P0700 P0730", ""],
  ["Oil change due", "Scheduled service", "Oil and filter, checks", "", ""],
  ["Knock over bumps", "Worn sway bar link", "Replaced sway bar links", "", ""],
  ["Radio and sockets dead", "Blown accessory fuse", "Replaced fuse, checked draw", "", ""],
];
const MAKES: [string, string, number][] = [
  ["Aurel", "Kestrel", 2016],
  ["Aurel", "Merlin", 2019],
  ["Brindle", "Tern", 2018],
  ["Ostra", "Wren", 2021],
];

/**
 * Writes a deterministic repairs CSV of `rows` lines (one per repair line; 1–3 lines per repair
 * order, as the demo's shop data has) for the import benchmark. Streams, so it needs little
 * memory however large the file.
 */
export async function writeBenchRepairs(
  path: string,
  rows: number,
  seed = 20261201,
): Promise<void> {
  const rng = seedrandom(String(seed));
  const out = createWriteStream(path);
  const write = (s: string) =>
    out.write(s) ? Promise.resolve() : new Promise<void>((r) => out.once("drain", () => r()));
  await write(`${BENCH_COLUMNS.join(",")}\n`);
  let ro = 0;
  let written = 0;
  while (written < rows) {
    ro++;
    const unit = Math.floor(rng() * 2000);
    const [make, model, year] = MAKES[unit % MAKES.length] as [string, string, number];
    const day = 1 + Math.floor(rng() * 900);
    const date = new Date(Date.UTC(2023, 9, 1) + day * 86_400_000).toISOString().slice(0, 10);
    const odometer = 10_000 + unit * 37 + day * 60 + Math.floor(rng() * 50);
    const lines = Math.min(rows - written, rng() < 0.75 ? 1 : rng() < 0.8 ? 2 : 3);
    for (let l = 0; l < lines; l++) {
      const [complaint, cause, correction, codes, component] = JOBS[
        Math.floor(rng() * JOBS.length)
      ] as [string, string, string, string, string];
      const parts = (rng() * 300).toFixed(2);
      const labour = (rng() * 250).toFixed(2);
      await write(
        `RO-${ro},U-${unit},${make},${model},${year},${date},${date},${odometer},"${complaint}","${cause}","${correction}",${codes},${component},,${(rng() * 3).toFixed(1)},${parts},${labour},PN-${Math.floor(rng() * 900)},Tech ${unit % 12},Bay ${unit % 3},${rng() < 0.05 ? "yes" : "no"}\n`,
      );
      written++;
    }
  }
  await new Promise<void>((resolve, reject) =>
    out.end((e?: Error | null) => (e ? reject(e) : resolve())),
  );
}
