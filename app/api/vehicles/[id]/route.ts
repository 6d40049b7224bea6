import { z } from "zod";
import { getDb } from "@/db";
import { getVehicle } from "@/db/queries/vehicles";
import { apiRoute, jsonError } from "@/lib/auth/guard";

export const dynamic = "force-dynamic";

const Params = z.object({ id: z.coerce.number().int().positive() });

export const GET = apiRoute<{ id: string }>("vehicles:read", async (_req, auth, params) => {
  const parsed = Params.safeParse(params);
  if (!parsed.success) return jsonError(400, "Vehicle id must be a positive whole number.");
  const vehicle = await getVehicle(await getDb(), auth, parsed.data.id);
  // Another organisation's vehicle is answered exactly like a missing one.
  if (!vehicle) return jsonError(404, "No such vehicle in this organisation.");
  return Response.json(vehicle);
});
