import { getDb } from "@/db";
import { cancelImport } from "@/db/queries/imports";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { ImportIdParams } from "@/lib/import-request";

export const dynamic = "force-dynamic";

export const POST = apiRoute<{ id: string }>("imports:write", async (_req, auth, params) => {
  const id = ImportIdParams.safeParse(params);
  if (!id.success) return jsonError(400, "Import id must be a positive whole number.");
  await cancelImport(await getDb(), auth, id.data.id);
  return Response.json({ ok: true });
});
