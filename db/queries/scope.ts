import { and, eq, sql, type SQL } from "drizzle-orm";
import type { SQLiteColumn, SQLiteTable, SQLiteView } from "drizzle-orm/sqlite-core";
import type { DbOrTx } from "@/db";
import type { Role } from "@/db/schema";
import { can, type Capability } from "@/lib/auth/roles";

/**
 * Who is asking, for which organisation. Every tenant query in db/queries takes one of these as
 * its first argument; the organisation comes from the signed-in session, never from the request.
 */
export type OrgScope = { organisationId: number; userId: number | null; role: Role };

/** The caller's role does not allow the operation. */
export class ForbiddenError extends Error {
  constructor(message = "Your role does not allow this.") {
    super(message);
    this.name = "ForbiddenError";
  }
}

/** The record does not exist in the caller's organisation (or at all: we do not say which). */
export class NotFoundError extends Error {
  constructor(message = "Not found.") {
    super(message);
    this.name = "NotFoundError";
  }
}

/** A request that is well-formed but cannot be carried out, with a message for the user. */
export class ConflictError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ConflictError";
  }
}

export function assertCan(scope: OrgScope, capability: Capability): void {
  if (!can(scope.role, capability)) {
    throw new ForbiddenError(`The ${scope.role} role may not do this (${capability}).`);
  }
}

type TenantTable = { organisationId: SQLiteColumn };

/** WHERE clause that pins a tenant table to the caller's organisation, plus any conditions. */
export function orgWhere(
  table: TenantTable,
  scope: OrgScope,
  ...conditions: (SQL | undefined)[]
): SQL {
  return and(eq(table.organisationId, scope.organisationId), ...conditions) as SQL;
}

/**
 * A LIKE pattern for "contains this text" (used with `escape '\\'`): % and _ in the text are
 * literal characters. Undefined for no text or only spaces.
 */
export function containsPattern(text: string | undefined): string | undefined {
  const q = text?.trim();
  return q ? `%${q.replace(/[%_\\]/g, (c) => `\\${c}`)}%` : undefined;
}

/** Values for an insert into a tenant table, with the caller's organisation filled in. */
export function inOrg<T extends object>(
  scope: OrgScope,
  values: T,
): T & { organisationId: number } {
  return { ...values, organisationId: scope.organisationId };
}

/** Number of rows of a table or view matching a WHERE clause (build it with orgWhere). */
export async function countRows(
  db: { select: DbOrTx["select"] },
  table: SQLiteTable | SQLiteView,
  where: SQL,
): Promise<number> {
  const [row] = await db
    .select({ n: sql<number>`count(*)` })
    .from(table)
    .where(where);
  return Number(row?.n ?? 0);
}

/** Whether an error (or its cause, as Drizzle wraps driver errors) is a unique-index violation. */
export function isUniqueViolation(e: unknown): boolean {
  for (
    let err = e as { message?: string; code?: string; cause?: unknown } | undefined, depth = 0;
    err && depth < 5;
    depth++
  ) {
    if (
      err.code === "SQLITE_CONSTRAINT_UNIQUE" ||
      /UNIQUE constraint failed/.test(err.message ?? "")
    )
      return true;
    err = err.cause as typeof err;
  }
  return false;
}
