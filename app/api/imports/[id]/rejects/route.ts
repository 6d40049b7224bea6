import { z } from "zod";
import { getDb } from "@/db";
import { listImportRejects } from "@/db/queries/imports";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { toCsv } from "@/lib/import";
import { ImportIdParams } from "@/lib/import-request";

export const dynamic = "force-dynamic";

const Query = z.object({
  page: z.coerce.number().int().min(1).max(1_000_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  severity: z.enum(["rejected", "warning"]).optional(),
  format: z.enum(["json", "csv"]).default("json"),
});

const CSV_PAGE = 5_000;

/** Rejected rows (and warnings) with row number, column and reason; CSV safe for spreadsheets. */
export const GET = apiRoute<{ id: string }>("imports:read", async (req, auth, params) => {
  const id = ImportIdParams.safeParse(params);
  if (!id.success) return jsonError(400, "Import id must be a positive whole number.");
  const q = Query.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) return jsonError(400, "Invalid query parameters.", q.error.issues);
  const db = await getDb();
  if (q.data.format === "json") {
    return Response.json(await listImportRejects(db, auth, id.data.id, q.data));
  }
  const header = ["row", "severity", "column", "reason", "original row"];
  const encoder = new TextEncoder();
  // Streamed page by page so a report of a million rows never sits in memory at once.
  const stream = new ReadableStream<Uint8Array>({
    async start(controller) {
      controller.enqueue(encoder.encode(toCsv(header, [])));
      for (let page = 1; ; page++) {
        const { rows } = await listImportRejects(db, auth, id.data.id, {
          page,
          pageSize: CSV_PAGE,
          severity: q.data.severity,
        });
        if (rows.length === 0) break;
        const body = toCsv(
          header,
          rows.map((r) => [r.rowNumber, r.severity, r.column, r.reason, r.raw]),
        );
        controller.enqueue(encoder.encode(body.slice(body.indexOf("\r\n") + 2)));
        if (rows.length < CSV_PAGE) break;
      }
      controller.close();
    },
  });
  return new Response(stream, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="import-${id.data.id}-rejects.csv"`,
    },
  });
});
