/** One recompute in its own process (so its peak memory is its own); prints one JSON line. */
import { readFileSync } from "node:fs";
import { getDatabase } from "@/db";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";

const { db, client } = await getDatabase();
const [org] = (await client.execute("select id from organisations where slug = 'bench'")).rows;
if (!org) throw new Error("no benchmark organisation in this database");
const result = await recomputeOrganisation(db, Number(org.id), (m) =>
  process.stderr.write(`${m}\n`),
);
const hwm = /VmHWM:\s+(\d+) kB/.exec(readFileSync("/proc/self/status", "utf8"));
process.stdout.write(
  `${JSON.stringify({ ...result, peakRssMb: hwm ? Number(hwm[1]) / 1024 : null })}\n`,
);
client.close();
