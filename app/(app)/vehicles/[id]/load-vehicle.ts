import "server-only";
import { cache } from "react";
import { z } from "zod";
import { getDb } from "@/db";
import { getVehicle } from "@/db/queries/vehicles";
import { requirePage } from "@/lib/auth/guard";

const Id = z.coerce.number().int().positive();

/**
 * The vehicle of this request, read once and shared by the segment's layout (which answers
 * 404 before anything streams) and its page. Another organisation's vehicle reads as missing.
 */
export const loadVehicle = cache(async (rawId: string) => {
  const auth = await requirePage("vehicles:read");
  const id = Id.safeParse(rawId);
  if (!id.success) return { auth, vehicle: null };
  return { auth, vehicle: await getVehicle(await getDb(), auth, id.data) };
});
