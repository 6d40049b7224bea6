import { z } from "zod";
import { getDb } from "@/db";
import { ensureCellView } from "@/db/queries/cell-views";
import { getLatestRun, listRankedCells } from "@/db/queries/cells";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { CellQuery } from "@/lib/cell-request";
import { CELL_CSV_HEADER, cellCsvRow } from "@/lib/cell-csv";
import { toCsv } from "@/lib/import";

export const dynamic = "force-dynamic";

const Format = z.object({ format: z.enum(["json", "csv"]).default("json") });

/**
 * Cells of the latest analysis run, ranked by the lower bound of the rate ratio (or another
 * sort), filtered and paginated on the server. `format=csv` exports the filtered list (up to
 * 100,000 rows) with every cell made safe for spreadsheets.
 */
export const GET = apiRoute("patterns:read", async (req, auth) => {
  const params = Object.fromEntries(new URL(req.url).searchParams);
  const q = CellQuery.safeParse(params);
  const f = Format.safeParse(params);
  if (!q.success || !f.success) {
    return jsonError(400, "Invalid query parameters.", [
      ...(q.error?.issues ?? []),
      ...(f.error?.issues ?? []),
    ]);
  }
  const db = await getDb();
  // A period or a vendor: the cells of that view (computed from the raw rows on first use).
  const viewId = await ensureCellView(db, auth, {
    from: q.data.from,
    to: q.data.to,
    vendor: q.data.vendor,
  });
  const isCsv = f.data.format === "csv";
  const { cells, total } = await listRankedCells(db, auth, {
    fault: q.data.fault,
    make: q.data.make,
    model: q.data.model,
    generation: q.data.generation,
    bandFromMi: q.data.bandFrom,
    bandToMi: q.data.bandTo,
    kind: q.data.kind,
    viewId,
    isSignalOnly: q.data.signals,
    sort: q.data.sort,
    direction: q.data.direction,
    withFirstSeen: !isCsv,
    limit: isCsv ? 100_000 : q.data.limit,
    offset: isCsv ? 0 : q.data.offset,
  });
  const run = await getLatestRun(db, auth);
  if (isCsv) {
    const ctx = {
      unit: auth.organisation.distanceUnit,
      confidence: run?.confidenceLevel ?? 0.95,
    };
    const body = toCsv(
      CELL_CSV_HEADER,
      cells.map((c) => cellCsvRow(c, ctx)),
      { withBom: true },
    );
    return new Response(body, {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": 'attachment; filename="recurra-recurring-failures.csv"',
      },
    });
  }
  return Response.json({ run, total, cells });
});
