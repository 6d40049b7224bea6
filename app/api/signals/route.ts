import { getDb } from "@/db";
import { getLatestRun, listRankedCells } from "@/db/queries/cells";
import { apiRoute } from "@/lib/auth/guard";

export const dynamic = "force-dynamic";

/** Every signal of the latest analysis run, strongest evidence first. */
export const GET = apiRoute("patterns:read", async (_req, auth) => {
  const db = await getDb();
  const { cells } = await listRankedCells(db, auth, { isSignalOnly: true, limit: 10_000 });
  return Response.json({ run: await getLatestRun(db, auth), signals: cells });
});
