import { z } from "zod";
import { getDb } from "@/db";
import { DuplicateFileError, listImports } from "@/db/queries/imports";
import { columnsOf } from "@/jobs/import/inspect";
import { UploadTooLargeError } from "@/jobs/import/storage";
import { receiveUpload } from "@/jobs/import/upload";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { UploadQuery } from "@/lib/import-request";

export const dynamic = "force-dynamic";

const ListQuery = z.object({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
});

export const GET = apiRoute("imports:read", async (req, auth) => {
  const parsed = ListQuery.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!parsed.success) return jsonError(400, "Invalid query parameters.", parsed.error.issues);
  return Response.json(await listImports(await getDb(), auth, parsed.data));
});

/**
 * Upload: the request body is the file itself (streamed to disk, never held in memory), with
 * `?kind=…&name=…`. Answers with the new import and what the mapping step needs.
 */
export const PUT = apiRoute("imports:write", async (req, auth) => {
  const parsed = UploadQuery.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!parsed.success)
    return jsonError(
      400,
      parsed.error.issues[0]?.message ?? "Invalid upload.",
      parsed.error.issues,
    );
  if (!req.body) return jsonError(400, "The upload is empty: choose a file.");
  const db = await getDb();
  try {
    const { importId, inspection } = await receiveUpload(db, auth, {
      kind: parsed.data.kind,
      fileName: parsed.data.name,
      source: req.body as never,
    });
    return Response.json(
      { importId, inspection, columns: columnsOf(parsed.data.kind) },
      { status: 201 },
    );
  } catch (e) {
    if (e instanceof UploadTooLargeError) return jsonError(413, e.message);
    if (e instanceof DuplicateFileError) {
      return Response.json(
        { error: e.message, existingImportId: e.existing?.id ?? null },
        { status: 409 },
      );
    }
    throw e;
  }
});
