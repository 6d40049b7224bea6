import "server-only";
import { cache } from "react";
import { getDb } from "@/db";
import { getCellDetail } from "@/db/queries/patterns";
import { requirePage } from "@/lib/auth/guard";
import { CellKeyQuery } from "@/lib/cell-request";

/**
 * The cell of this request. The page has no loading boundary of its own, so a missing cell is
 * answered with a real 404 before anything streams.
 */
export const loadCell = cache(async (query: string) => {
  const auth = await requirePage("patterns:read");
  const key = CellKeyQuery.safeParse(Object.fromEntries(new URLSearchParams(query)));
  if (!key.success) return { auth, key: null, detail: null };
  return { auth, key: key.data, detail: await getCellDetail(await getDb(), auth, key.data) };
});
