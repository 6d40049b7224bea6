import { getDb } from "@/db";
import { getOrganisation } from "@/db/queries/organisations";
import { getRefuelAnalysis } from "@/db/queries/refuel";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { RefuelQuery } from "@/lib/cell-request";
import { unitToMiles } from "@/lib/units";

export const dynamic = "force-dynamic";

/** Post-refuel stall test per cohort and per vehicle (window in miles; default: the setting). */
export const GET = apiRoute("refuel:read", async (req, auth) => {
  const q = RefuelQuery.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) return jsonError(400, "Invalid query parameters.", q.error.issues);
  const db = await getDb();
  const org = await getOrganisation(db, auth);
  const window = q.data.window ?? unitToMiles(org.refuelWindow, org.distanceUnit);
  return Response.json(await getRefuelAnalysis(db, auth, window));
});
