import { readFile } from "node:fs/promises";
import { z } from "zod";
import { getDb } from "@/db";
import { getKnownIssueAttachment } from "@/db/queries/known-issues";
import { apiRoute, jsonError } from "@/lib/auth/guard";

export const dynamic = "force-dynamic";

const Params = z.object({ attachmentId: z.coerce.number().int().positive() });

/** Serves an attachment to members of its organisation, with the type checked at upload. */
export const GET = apiRoute<{ attachmentId: string }>(
  "known-issues:read",
  async (_req, auth, params) => {
    const p = Params.safeParse(params);
    if (!p.success) return jsonError(400, "Invalid attachment.");
    const row = await getKnownIssueAttachment(await getDb(), auth, p.data.attachmentId);
    if (!row) return jsonError(404, "No such attachment in this organisation.");
    let body: Buffer;
    try {
      body = await readFile(row.storedPath);
    } catch {
      return jsonError(404, "The attachment's file is missing.");
    }
    return new Response(new Uint8Array(body), {
      headers: {
        "content-type": row.contentType,
        "content-length": String(body.length),
        "cache-control": "private, max-age=3600",
        "x-content-type-options": "nosniff",
        "content-disposition": `inline; filename="${row.fileName.replace(/[^\w.-]+/g, "_")}"`,
      },
    });
  },
);
