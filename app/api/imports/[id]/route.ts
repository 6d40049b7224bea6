import { getDb } from "@/db";
import { getImport } from "@/db/queries/imports";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { ImportIdParams } from "@/lib/import-request";

export const dynamic = "force-dynamic";

/** One import with its progress and counts (polled by the progress bar). */
export const GET = apiRoute<{ id: string }>("imports:read", async (_req, auth, params) => {
  const parsed = ImportIdParams.safeParse(params);
  if (!parsed.success) return jsonError(400, "Import id must be a positive whole number.");
  const imp = await getImport(await getDb(), auth, parsed.data.id);
  return Response.json(imp, { headers: { "cache-control": "no-store" } });
});
