import "server-only";
import { asc, eq, inArray } from "drizzle-orm";
import type { Db, DbOrTx } from "@/db";
import { NotFoundError } from "./scope";
import { components, dtcCodes } from "@/db/schema";
import { faultName } from "@/lib/plain-words";

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

/**
 * The names of faults as people name them (shared reference data, no organisation): a DTC with
 * its description, a component as "System → Name" (lib/plain-words.ts faultName). Keyed like the
 * cells' fault keys: "dtc:P0496", "component:fuel-vapour/purge-valve".
 */
export async function listFaultNames(
  db: Db,
  faults: readonly { dtc: string | null; component: string | null }[],
): Promise<Map<string, string>> {
  const dtcs = [...new Set(faults.flatMap((f) => (f.dtc ? [f.dtc] : [])))];
  const slugs = [...new Set(faults.flatMap((f) => (f.component ? [f.component] : [])))];
  const [described, named] = await Promise.all([
    dtcs.length
      ? db
          .select({ code: dtcCodes.code, description: dtcCodes.description })
          .from(dtcCodes)
          .where(inArray(dtcCodes.code, dtcs))
      : [],
    slugs.length
      ? db
          .select({ slug: components.slug, system: components.system, name: components.name })
          .from(components)
          .where(inArray(components.slug, slugs))
      : [],
  ]);
  const descriptions = new Map(described.map((d) => [d.code, d.description]));
  const names = new Map(named.map((c) => [c.slug, c]));
  const out = new Map<string, string>();
  for (const dtc of dtcs)
    out.set(`dtc:${dtc}`, faultName({ dtc, dtcDescription: descriptions.get(dtc) }));
  for (const slug of slugs) {
    const c = names.get(slug);
    out.set(
      `component:${slug}`,
      faultName({
        componentSystem: c?.system,
        componentName: c?.name,
        faultKey: `component:${slug}`,
      }),
    );
  }
  return out;
}
