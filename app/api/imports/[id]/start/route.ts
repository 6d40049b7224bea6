import { getDb } from "@/db";
import { getImport, startImport } from "@/db/queries/imports";
import { mappingToIndexes } from "@/jobs/import/run-import";
import { resolveDateFormat } from "@/jobs/import/inspect";
import { inspectStoredImport } from "@/jobs/import/upload";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { validateMapping } from "@/lib/import";
import { ImportIdParams, MappingInput } from "@/lib/import-request";

export const dynamic = "force-dynamic";

/** Fixes the mapping and options, remembers the mapping, and queues the import. */
export const POST = apiRoute<{ id: string }>("imports:write", async (req, auth, params) => {
  const id = ImportIdParams.safeParse(params);
  if (!id.success) return jsonError(400, "Import id must be a positive whole number.");
  const body = MappingInput.safeParse(await req.json().catch(() => null));
  if (!body.success) return jsonError(400, "Invalid mapping.", body.error.issues);
  const db = await getDb();
  const imp = await getImport(db, auth, id.data.id);
  const inspection = await inspectStoredImport(db, auth, id.data.id, body.data.mapping);
  const fileProblems = inspection.problems.filter((p) => !/column|required|mapped|header/i.test(p));
  if (fileProblems.length) return jsonError(422, fileProblems.join(" "));
  // Dates that fit both day/month and month/day need the user's choice: never a guess.
  const dates = resolveDateFormat(inspection, body.data.read.dateFormat);
  if (!dates.ok) return jsonError(400, dates.message);
  let problems: string[];
  try {
    problems = validateMapping(
      imp.kind,
      inspection.headers,
      mappingToIndexes(inspection.headers, body.data.mapping),
    );
  } catch (e) {
    problems = [(e as Error).message];
  }
  if (problems.length)
    return Response.json({ error: "The mapping needs fixing.", problems }, { status: 422 });
  const { jobId } = await startImport(db, auth, id.data.id, {
    delimiter: inspection.delimiter,
    headers: inspection.headers,
    mapping: body.data.mapping,
    read: { ...body.data.read, dateFormat: dates.dateFormat },
  });
  return Response.json({ importId: id.data.id, jobId, status: "queued" }, { status: 202 });
});
