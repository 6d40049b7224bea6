import "server-only";
import { cache } from "react";
import { z } from "zod";
import { getDb } from "@/db";
import { getPart } from "@/db/queries/parts";
import { requirePage } from "@/lib/auth/guard";

const Id = z.coerce.number().int().positive();

/**
 * The part of this request, read once and shared by the segment's layout (which answers 404
 * before anything streams) and its page. Another organisation's part reads as missing.
 */
export const loadPart = cache(async (rawId: string) => {
  const auth = await requirePage("parts:manage");
  const id = Id.safeParse(rawId);
  if (!id.success) return { auth, part: null };
  return { auth, part: await getPart(await getDb(), auth, id.data) };
});
