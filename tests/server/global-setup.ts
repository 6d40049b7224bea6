import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { ensureSqld, stopRecordedSqld } from "../support/sqld";

/**
 * Fetches the libSQL server binary once for the whole run (the test files then start their
 * own servers from the cache), and ends every server the run started when it finishes.
 */
export default function setup() {
  const started = performance.now();
  const bin = ensureSqld();
  process.env.SQLD_BIN = bin;
  const pidFile = join(mkdtempSync(join(tmpdir(), "recurra-sqld-pids-")), "pids");
  process.env.RECURRA_SQLD_PIDS = pidFile;
  process.stderr.write(
    `[test:server] libSQL server ${bin} ready in ${((performance.now() - started) / 1000).toFixed(1)} s\n`,
  );
  return () => stopRecordedSqld(pidFile);
}
