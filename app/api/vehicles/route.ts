import { z } from "zod";
import { getDb } from "@/db";
import { createVehicle, listVehicles } from "@/db/queries/vehicles";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { NewVehicleInput } from "@/lib/vehicle-input";

export const dynamic = "force-dynamic";

const ListQuery = z.object({
  q: z.string().trim().max(100).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

export const GET = apiRoute("vehicles:read", async (req, auth) => {
  const url = new URL(req.url);
  const parsed = ListQuery.safeParse(Object.fromEntries(url.searchParams));
  if (!parsed.success) return jsonError(400, "Invalid query parameters.", parsed.error.issues);
  return Response.json(await listVehicles(await getDb(), auth, parsed.data));
});

export const POST = apiRoute("vehicles:write", async (req, auth) => {
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    return jsonError(400, "The request body must be JSON.");
  }
  const parsed = NewVehicleInput.safeParse(body);
  if (!parsed.success) return jsonError(400, "Invalid vehicle.", parsed.error.issues);
  const created = await createVehicle(await getDb(), auth, parsed.data);
  return Response.json(created, { status: 201 });
});
