import "server-only";
import { asc, eq } from "drizzle-orm";
import type { Db, DbOrTx } from "@/db";
import { NotFoundError } from "./scope";
import { components, dtcCodes } from "@/db/schema";

/** The component a generic DTC usually points at (shared reference data, no organisation). */
export async function componentOfDtc(db: Db, code: string): Promise<string | null> {
  const [ref] = await db
    .select({ slug: components.slug })
    .from(dtcCodes)
    .innerJoin(components, eq(components.id, dtcCodes.componentId))
    .where(eq(dtcCodes.code, code))
    .limit(1);
  return ref?.slug ?? null;
}

/** Every component of the shared catalogue (no organisation), by system and name, for choosing. */
export async function listComponentCatalogue(db: DbOrTx) {
  return db
    .select({ slug: components.slug, system: components.system, name: components.name })
    .from(components)
    .orderBy(asc(components.system), asc(components.name));
}

/** The id of a component by its slug; an unknown slug is the caller's mistake (404). */
export async function componentIdOfSlug(tx: DbOrTx, slug: string | null): Promise<number | null> {
  if (!slug) return null;
  const [c] = await tx
    .select({ id: components.id })
    .from(components)
    .where(eq(components.slug, slug))
    .limit(1);
  if (!c) throw new NotFoundError(`Unknown component "${slug}".`);
  return c.id;
}
