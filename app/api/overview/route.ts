import { getDb } from "@/db";
import { getOverview } from "@/db/queries/overview";
import { apiRoute } from "@/lib/auth/guard";

export const dynamic = "force-dynamic";

export const GET = apiRoute("dashboard:read", async (_req, auth) => {
  return Response.json(await getOverview(await getDb(), auth));
});
