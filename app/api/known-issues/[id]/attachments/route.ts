import { rm } from "node:fs/promises";
import { fileTypeFromBuffer } from "file-type";
import { z } from "zod";
import { getDb } from "@/db";
import { addKnownIssueAttachment } from "@/db/queries/known-issues";
import { NotFoundError } from "@/db/queries/scope";
import { storeUpload, UploadTooLargeError } from "@/jobs/import/storage";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { ATTACHMENT_MAX_BYTES, ATTACHMENT_TYPES } from "@/lib/known-issues";

export const dynamic = "force-dynamic";

const Params = z.object({ id: z.coerce.number().int().positive() });
const Query = z.object({ name: z.string().trim().min(1).max(200) });

/**
 * Attaches a photo to a known issue: the body is the image, streamed to the organisation's
 * upload folder with the size limit; the type is read from the file's own bytes (not from its
 * name or the request), and only JPEG, PNG, WebP and GIF are kept.
 */
export const PUT = apiRoute<{ id: string }>("known-issues:comment", async (req, auth, params) => {
  const p = Params.safeParse(params);
  const q = Query.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!p.success || !q.success) return jsonError(400, "Give the known issue and the file name.");
  if (!req.body) return jsonError(400, "The upload is empty: choose a photo.");
  let stored;
  try {
    stored = await storeUpload(req.body as never, {
      organisationId: auth.organisationId,
      fileName: q.data.name,
      limitBytes: ATTACHMENT_MAX_BYTES,
    });
  } catch (e) {
    if (e instanceof UploadTooLargeError) {
      return jsonError(413, `The photo is larger than ${ATTACHMENT_MAX_BYTES / 1_048_576} MB.`);
    }
    throw e;
  }
  const type = await fileTypeFromBuffer(stored.head);
  if (!type || !(ATTACHMENT_TYPES as readonly string[]).includes(type.mime)) {
    await rm(stored.storedPath, { force: true });
    return jsonError(415, "Only photos can be attached: JPEG, PNG, WebP or GIF.");
  }
  try {
    const row = await addKnownIssueAttachment(await getDb(), auth, {
      knownIssueId: p.data.id,
      fileName: q.data.name,
      storedPath: stored.storedPath,
      contentType: type.mime,
      sizeBytes: stored.sizeBytes,
    });
    return Response.json({ id: row.id }, { status: 201 });
  } catch (e) {
    await rm(stored.storedPath, { force: true });
    if (e instanceof NotFoundError) return jsonError(404, e.message);
    throw e;
  }
});
