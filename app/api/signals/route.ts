import { z } from "zod";
import { getDb } from "@/db";
import { getLatestRun, listRankedCells } from "@/db/queries/cells";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { CELL_CSV_HEADER, cellCsvRow } from "@/lib/cell-csv";
import { ANALYSED_KINDS } from "@/lib/component-kinds";
import { toCsv } from "@/lib/import";

export const dynamic = "force-dynamic";

const Query = z.object({
  format: z.enum(["json", "csv"]).default("json"),
  kind: z.enum(ANALYSED_KINDS).default("failure"),
});

/**
 * Every signal of the latest analysis run, strongest evidence first (failure signals unless
 * `kind=wear`); `format=csv` exports them with the explorer's columns.
 */
export const GET = apiRoute("patterns:read", async (req, auth) => {
  const q = Query.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) return jsonError(400, "Invalid query parameters.", q.error.issues);
  const db = await getDb();
  const { cells } = await listRankedCells(db, auth, {
    isSignalOnly: true,
    kind: q.data.kind,
    limit: 10_000,
  });
  const run = await getLatestRun(db, auth);
  if (q.data.format === "csv") {
    const ctx = { unit: auth.organisation.distanceUnit, confidence: run?.confidenceLevel ?? 0.95 };
    return new Response(
      toCsv(
        CELL_CSV_HEADER,
        cells.map((c) => cellCsvRow(c, ctx)),
        { withBom: true },
      ),
      {
        headers: {
          "content-type": "text/csv; charset=utf-8",
          "content-disposition": 'attachment; filename="recurra-signals.csv"',
        },
      },
    );
  }
  return Response.json({ run, signals: cells });
});
