import { getDb } from "@/db";
import { getLatestRun, listRankedCells } from "@/db/queries/cells";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { CellQuery } from "@/lib/cell-request";

export const dynamic = "force-dynamic";

/** Cells of the latest analysis run, ranked by the lower bound of the rate ratio. */
export const GET = apiRoute("patterns:read", async (req, auth) => {
  const q = CellQuery.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) return jsonError(400, "Invalid query parameters.", q.error.issues);
  const db = await getDb();
  const { cells, total } = await listRankedCells(db, auth, {
    fault: q.data.fault,
    make: q.data.make,
    model: q.data.model,
    generation: q.data.generation,
    bandFromMi: q.data.bandFrom,
    bandToMi: q.data.bandTo,
    isSignalOnly: q.data.signals,
    limit: q.data.limit,
    offset: q.data.offset,
  });
  return Response.json({ run: await getLatestRun(db, auth), total, cells });
});
