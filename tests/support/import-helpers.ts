import { mkdtempSync, writeFileSync, createReadStream } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Db } from "@/db";
import { getImport, startImport } from "@/db/queries/imports";
import type { OrgScope } from "@/db/queries/scope";
import { addUserToOrganisation, createOrganisation } from "@/db/queries/system";
import { createVehicle } from "@/db/queries/vehicles";
import type { ImportKind } from "@/db/schema";
import { mappingByName } from "@/jobs/import/inspect";
import { receiveUpload } from "@/jobs/import/upload";
import { startWorker } from "@/jobs/worker";
import { loadReferenceData } from "@/db/seed/reference";

export const scratch = mkdtempSync(join(tmpdir(), "recurra-import-"));

/** Writes a file into the scratch folder and returns its path. */
export function writeScratch(name: string, content: string | Buffer): string {
  const path = join(scratch, name);
  writeFileSync(path, content);
  return path;
}

/** An organisation with a manager and three vehicles (units U-1..U-3, Aurel Kestrel 2016). */
export async function setUpOrganisation(db: Db, slug: string): Promise<OrgScope> {
  await loadReferenceData(db);
  const org = await createOrganisation(db, {
    slug,
    name: `Org ${slug}`,
    kind: "fleet",
    distanceUnit: "mi",
  });
  const { user } = await addUserToOrganisation(db, {
    organisationSlug: slug,
    email: `${slug}@x.example`,
    role: "manager",
    password: "manager-password-1",
  });
  const scope: OrgScope = { organisationId: org.id, userId: user.id, role: "manager" };
  for (const unit of ["U-1", "U-2", "U-3"]) {
    await createVehicle(db, scope, {
      unitNumber: unit,
      make: "Aurel",
      model: "Kestrel",
      modelYear: 2016,
      odometerUnit: "mi",
    });
  }
  return scope;
}

/** Uploads a file and returns the new import with what the mapping step would show. */
export async function upload(
  db: Db,
  scope: OrgScope,
  kind: ImportKind,
  name: string,
  content: string | Buffer,
) {
  const path = writeScratch(name, content);
  return receiveUpload(db, scope, { kind, fileName: name, source: createReadStream(path) });
}

/**
 * The whole path a user takes: upload, accept the automatic mapping and detected options
 * (optionally overridden), start, and let a worker run the job. Returns the finished import.
 */
export async function importText(
  db: Db,
  scope: OrgScope,
  kind: ImportKind,
  content: string | Buffer,
  opts: {
    name?: string;
    mapping?: Record<string, string | null>;
    read?: Record<string, string>;
  } = {},
) {
  const { importId, inspection } = await upload(
    db,
    scope,
    kind,
    opts.name ?? `${kind}-${Math.random().toString(36).slice(2)}.csv`,
    content,
  );
  const { jobId } = await startImport(db, scope, importId, {
    delimiter: inspection.delimiter,
    headers: inspection.headers,
    mapping: { ...mappingByName(inspection.headers, inspection.mapping), ...opts.mapping },
    read: { ...inspection.read, ...opts.read } as never,
  });
  await startWorker({ db, jobId, isOneShot: true, log: () => {} });
  return { importId, inspection, result: await getImport(db, scope, importId) };
}

/** Rows of one query, as plain objects. */
export async function rows<T>(db: Db, sql: string, args: (string | number)[] = []): Promise<T[]> {
  return (await db.$client.execute({ sql, args })).rows as unknown as T[];
}
