import "server-only";
import { cache } from "react";
import { getDb } from "@/db";
import { getImport } from "@/db/queries/imports";
import { NotFoundError } from "@/db/queries/scope";
import { requirePage } from "@/lib/auth/guard";
import { ImportIdParams } from "@/lib/import-request";

/** The import of this request, shared by the layout (404 before streaming) and the page. */
export const loadImport = cache(async (rawId: string) => {
  const auth = await requirePage("imports:read");
  const id = ImportIdParams.safeParse({ id: rawId });
  if (!id.success) return { auth, imp: null };
  try {
    return { auth, imp: await getImport(await getDb(), auth, id.data.id) };
  } catch (e) {
    if (e instanceof NotFoundError) return { auth, imp: null };
    throw e;
  }
});
