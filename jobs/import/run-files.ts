import { existsSync, readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { z } from "zod";

/**
 * Side files of an import that is being written in one long transaction (jobs/import/direct.ts).
 * While that transaction holds the database's write lock, the import's progress and a cancel
 * request cannot be written to the database, so they travel in two small files next to the
 * stored upload: `<file>.progress.json` (written by the reader after each chunk, read by
 * getImport for the progress bar) and `<file>.cancel` (written by cancelImport, read by the
 * reader after each chunk). Both are removed when the run ends.
 */

const progressSchema = z.object({
  bytesRead: z.number().int().nonnegative(),
  rowsTotal: z.number().int().nonnegative(),
  rowsRejected: z.number().int().nonnegative(),
  rowsWarning: z.number().int().nonnegative(),
  rowsDuplicate: z.number().int().nonnegative(),
});
export type RunProgress = z.infer<typeof progressSchema>;

const cancelSchema = z.object({
  userId: z.number().int().nullable(),
  at: z.string(),
});
export type CancelRequest = z.infer<typeof cancelSchema>;

const progressFile = (storedPath: string) => `${storedPath}.progress.json`;
const cancelFile = (storedPath: string) => `${storedPath}.cancel`;

/** Replaces the progress file in one step (write, then rename), so a reader never sees half. */
export function writeRunProgress(storedPath: string, progress: RunProgress): void {
  const temp = `${progressFile(storedPath)}.tmp`;
  writeFileSync(temp, JSON.stringify(progress));
  renameSync(temp, progressFile(storedPath));
}

function readJson<T>(path: string, schema: z.ZodType<T>): T | null {
  try {
    const parsed = schema.safeParse(JSON.parse(readFileSync(path, "utf8")));
    return parsed.success ? parsed.data : null;
  } catch {
    return null; // missing, or being replaced this very moment
  }
}

/** The progress of a run in one transaction, or null when none is under way. */
export function readRunProgress(storedPath: string): RunProgress | null {
  return readJson(progressFile(storedPath), progressSchema);
}

/** True while a run in one transaction is under way (its progress file exists). */
export function isRunInOneTransaction(storedPath: string): boolean {
  return existsSync(progressFile(storedPath));
}

/** Asks the run to stop at its next chunk (it then rolls back and records the cancel). */
export function requestRunCancel(storedPath: string, userId: number | null): void {
  const request: CancelRequest = { userId, at: new Date().toISOString() };
  writeFileSync(cancelFile(storedPath), JSON.stringify(request));
}

export function readRunCancel(storedPath: string): CancelRequest | null {
  return readJson(cancelFile(storedPath), cancelSchema);
}

export function hasRunCancel(storedPath: string): boolean {
  return existsSync(cancelFile(storedPath));
}

export function removeRunFiles(storedPath: string): void {
  for (const path of [progressFile(storedPath), `${progressFile(storedPath)}.tmp`]) {
    rmSync(path, { force: true });
  }
  rmSync(cancelFile(storedPath), { force: true });
}
