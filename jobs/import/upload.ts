import { open, rm } from "node:fs/promises";
import type { Readable } from "node:stream";
import type { ReadableStream as WebReadableStream } from "node:stream/web";
import { eq } from "drizzle-orm";
import type { Db } from "@/db";
import {
  createImport,
  getImportFile,
  getRememberedMapping,
  DuplicateFileError,
} from "@/db/queries/imports";
import { getOrganisation } from "@/db/queries/organisations";
import type { OrgScope } from "@/db/queries/scope";
import { imports, type ImportKind } from "@/db/schema";
import { HEAD_BYTES, storeUpload } from "./storage";
import { inspectUpload, type Inspection } from "./inspect";

/**
 * Receives a file for an organisation: streams it to the upload folder with its SHA-256,
 * refuses a file already imported (keeping the one on disk that the earlier import owns),
 * records the import and inspects the head for the column-mapping step. Shared by the upload
 * route handler and the command line, so both take the same path.
 */
export async function receiveUpload(
  db: Db,
  scope: OrgScope,
  input: { kind: ImportKind; fileName: string; source: Readable | WebReadableStream<Uint8Array> },
): Promise<{ importId: number; inspection: Inspection }> {
  const org = await getOrganisation(db, scope);
  const stored = await storeUpload(input.source, {
    organisationId: scope.organisationId,
    fileName: input.fileName,
    limitBytes: org.uploadLimitMb * 1_048_576,
  });
  let created: { id: number };
  try {
    created = await createImport(db, scope, {
      kind: input.kind,
      fileName: input.fileName.slice(0, 200),
      storedPath: stored.storedPath,
      sha256: stored.sha256,
      sizeBytes: stored.sizeBytes,
    });
  } catch (e) {
    if (e instanceof DuplicateFileError) {
      const owners = await db
        .select({ id: imports.id })
        .from(imports)
        .where(eq(imports.storedPath, stored.storedPath))
        .limit(1);
      if (owners.length === 0) await rm(stored.storedPath, { force: true });
    }
    throw e;
  }
  const inspection = inspectUpload(stored.head, input.kind, {
    isTruncated: stored.sizeBytes > stored.head.length,
    remembered: await getRememberedMapping(db, scope, input.kind),
    defaults: { distanceUnit: org.distanceUnit },
  });
  return { importId: created.id, inspection };
}

/**
 * Inspects an uploaded file again (the mapping screen reloads it), with the mapping being
 * edited when given (by header name): the date order depends on which columns hold dates.
 */
export async function inspectStoredImport(
  db: Db,
  scope: OrgScope,
  importId: number,
  mapping?: Record<string, string | null>,
): Promise<Inspection> {
  const file = await getImportFile(db, scope, importId);
  const org = await getOrganisation(db, scope);
  const handle = await open(file.storedPath, "r");
  try {
    const buffer = Buffer.alloc(HEAD_BYTES);
    const { bytesRead } = await handle.read(buffer, 0, HEAD_BYTES, 0);
    const size = (await handle.stat()).size;
    return inspectUpload(buffer.subarray(0, bytesRead), file.kind, {
      isTruncated: size > bytesRead,
      remembered: await getRememberedMapping(db, scope, file.kind),
      mapping,
      defaults: { distanceUnit: org.distanceUnit },
    });
  } finally {
    await handle.close();
  }
}
