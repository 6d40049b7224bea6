import { getDb } from "@/db";
import { ensureCellView } from "@/db/queries/cell-views";
import { getLatestRun } from "@/db/queries/cells";
import { getHeatmap } from "@/db/queries/patterns";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { HeatmapQuery } from "@/lib/cell-request";

export const dynamic = "force-dynamic";

/** Heatmap rows from the computed cells: cohorts × bands for a fault, or one cohort's faults. */
export const GET = apiRoute("patterns:read", async (req, auth) => {
  const q = HeatmapQuery.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) return jsonError(400, "Invalid query parameters.", q.error.issues);
  const db = await getDb();
  // A period or a vendor: the cells of that view (computed from the raw rows on first use).
  const viewId = await ensureCellView(db, auth, {
    from: q.data.from,
    to: q.data.to,
    vendor: q.data.vendor,
  });
  const heatmap = await getHeatmap(db, auth, {
    view: q.data.view,
    fault: q.data.fault,
    make: q.data.make,
    model: q.data.model,
    generation: q.data.generation,
    bandFromMi: q.data.bandFrom,
    bandToMi: q.data.bandTo,
    kind: q.data.kind,
    viewId,
  });
  return Response.json({ run: await getLatestRun(db, auth), ...heatmap });
});
