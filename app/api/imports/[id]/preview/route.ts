import { getDb } from "@/db";
import { getImport } from "@/db/queries/imports";
import { columnsOf, previewRows } from "@/jobs/import/inspect";
import { mappingToIndexes } from "@/jobs/import/run-import";
import { inspectStoredImport } from "@/jobs/import/upload";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { validateMapping } from "@/lib/import";
import { ImportIdParams, MappingInput } from "@/lib/import-request";

export const dynamic = "force-dynamic";

/** The file's header, first rows, automatic mapping and detected options. */
export const GET = apiRoute<{ id: string }>("imports:read", async (_req, auth, params) => {
  const parsed = ImportIdParams.safeParse(params);
  if (!parsed.success) return jsonError(400, "Import id must be a positive whole number.");
  const db = await getDb();
  const imp = await getImport(db, auth, parsed.data.id);
  const inspection = await inspectStoredImport(db, auth, parsed.data.id);
  const rows = inspection.problems.length
    ? []
    : previewRows(imp.kind, inspection, inspection.mapping, inspection.read);
  return Response.json({ inspection, columns: columnsOf(imp.kind), rows });
});

/** The first rows as they will be read with the mapping and options being edited. */
export const POST = apiRoute<{ id: string }>("imports:write", async (req, auth, params) => {
  const id = ImportIdParams.safeParse(params);
  if (!id.success) return jsonError(400, "Import id must be a positive whole number.");
  const body = MappingInput.safeParse(await req.json().catch(() => null));
  if (!body.success) return jsonError(400, "Invalid mapping.", body.error.issues);
  const db = await getDb();
  const imp = await getImport(db, auth, id.data.id);
  const inspection = await inspectStoredImport(db, auth, id.data.id, body.data.mapping);
  let mapping;
  try {
    mapping = mappingToIndexes(inspection.headers, body.data.mapping);
  } catch (e) {
    return jsonError(400, (e as Error).message);
  }
  const problems = validateMapping(imp.kind, inspection.headers, mapping);
  // Until an open date order is chosen, the rows show the placeholder order (the screen says so).
  const read = {
    ...body.data.read,
    dateFormat: body.data.read.dateFormat ?? inspection.read.dateFormat,
  };
  return Response.json({
    problems,
    dateOrder: inspection.dateOrder,
    rows: problems.length ? [] : previewRows(imp.kind, inspection, mapping, read),
  });
});
