import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import type { Db, DbOrTx } from "@/db";
import { COMPONENT_KINDS, componentKinds, components, type ComponentKind } from "@/db/schema";
import { lineKindSql } from "@/lib/component-kinds";
import { enqueueJob } from "@/jobs/queue";
import { recordAudit } from "./audit";
import { assertCan, NotFoundError, orgWhere, type OrgScope } from "./scope";

/** A component of Recurra's list with its kind for the organisation. */
export type ComponentWithKind = {
  id: number;
  slug: string;
  system: string;
  name: string;
  kind: ComponentKind;
  /** Recurra's default kind; `kind` differs from it where the organisation set its own. */
  defaultKind: ComponentKind;
};

/** The organisation's kind of a component: its own where it set one, else Recurra's default. */
const effectiveKind = sql<ComponentKind>`coalesce(${componentKinds.kind}, ${components.kind})`;

const joinOwnKinds = (organisationId: number) =>
  and(
    eq(componentKinds.componentId, components.id),
    eq(componentKinds.organisationId, organisationId),
  );

/** Every component with its kind for the organisation, by system and name. */
export async function listComponentKinds(
  db: DbOrTx,
  scope: OrgScope,
): Promise<ComponentWithKind[]> {
  assertCan(scope, "patterns:read");
  return db
    .select({
      id: components.id,
      slug: components.slug,
      system: components.system,
      name: components.name,
      kind: effectiveKind,
      defaultKind: components.kind,
    })
    .from(components)
    .leftJoin(componentKinds, joinOwnKinds(scope.organisationId))
    .orderBy(asc(components.system), asc(components.name));
}

/** The organisation's repair lines per component and kind, for the settings screen. */
export async function countLinesByComponent(
  db: DbOrTx,
  scope: OrgScope,
): Promise<Map<number, Record<ComponentKind, number>>> {
  assertCan(scope, "settings:manage");
  const rows = await db.all<{ component_id: number; kind: ComponentKind; n: number }>(sql`
    select component_id, kind, count(*) as n from visible_repair_lines
     where organisation_id = ${scope.organisationId} and component_id is not null
     group by component_id, kind`);
  const out = new Map<number, Record<ComponentKind, number>>();
  for (const r of rows) {
    const counts = out.get(Number(r.component_id)) ?? { service: 0, wear: 0, failure: 0 };
    counts[r.kind] = Number(r.n);
    out.set(Number(r.component_id), counts);
  }
  return out;
}

/** The organisation's kind of one component (for a line written outside an import). */
export async function getComponentKind(
  db: DbOrTx,
  scope: OrgScope,
  componentId: number,
): Promise<ComponentKind | null> {
  const [row] = await db
    .select({ kind: effectiveKind })
    .from(components)
    .leftJoin(componentKinds, joinOwnKinds(scope.organisationId))
    .where(eq(components.id, componentId));
  return row?.kind ?? null;
}

/**
 * Sets the organisation's kind of a component (admins), classifies its repair lines again
 * (lineKind: a failure component's scheduled lines stay service), records the change in the
 * audit log and queues a recompute when any line changed kind. Setting Recurra's default removes the organisation's own.
 * Returns the lines classified again; nothing changes (and nothing is audited) when the kind
 * is already the one asked for.
 */
export async function setComponentKind(
  db: Db,
  scope: OrgScope,
  slug: string,
  kind: ComponentKind,
): Promise<{ component: ComponentWithKind; linesChanged: number; isChanged: boolean }> {
  assertCan(scope, "settings:manage");
  if (!COMPONENT_KINDS.includes(kind)) throw new Error(`setComponentKind: no kind "${kind}"`);
  return db.transaction(async (tx) => {
    const [before] = await tx
      .select({
        id: components.id,
        slug: components.slug,
        system: components.system,
        name: components.name,
        kind: effectiveKind,
        defaultKind: components.kind,
      })
      .from(components)
      .leftJoin(componentKinds, joinOwnKinds(scope.organisationId))
      .where(eq(components.slug, slug));
    if (!before) throw new NotFoundError(`No component "${slug}" in Recurra's list.`);
    if (before.kind === kind) return { component: before, linesChanged: 0, isChanged: false };
    if (kind === before.defaultKind) {
      await tx
        .delete(componentKinds)
        .where(orgWhere(componentKinds, scope, eq(componentKinds.componentId, before.id)));
    } else {
      await tx
        .insert(componentKinds)
        .values({ organisationId: scope.organisationId, componentId: before.id, kind })
        .onConflictDoUpdate({
          target: [componentKinds.organisationId, componentKinds.componentId],
          set: { kind, setAt: sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))` },
        });
    }
    // kind is one of COMPONENT_KINDS (checked above), so it can stand in the SQL as a literal.
    const changed = await tx.run(sql`
      update repair_lines set kind = ${sql.raw(lineKindSql(`'${kind}'`, "is_scheduled"))}
       where organisation_id = ${scope.organisationId} and component_id = ${before.id}`);
    await recordAudit(tx, scope, {
      action: "component.kind",
      entity: "component",
      entityId: before.slug,
      detail: { from: before.kind, to: kind, lines: changed.rowsAffected },
    });
    // The cells count lines by kind: with no line classified again, nothing changes in them.
    if (changed.rowsAffected > 0) {
      await enqueueJob(tx, {
        kind: "recompute",
        organisationId: scope.organisationId,
        payload: { organisationId: scope.organisationId },
      });
    }
    return {
      component: { ...before, kind },
      linesChanged: changed.rowsAffected,
      isChanged: true,
    };
  });
}
