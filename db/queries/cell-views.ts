import "server-only";
import type { Db } from "@/db";
import { cellInsertRows } from "@/jobs/recompute/cell-record";
import { computeOrganisationCells } from "@/jobs/recompute/recompute";
import { insertStatements } from "@/jobs/import/sql-literal";
import { assertCan, type OrgScope } from "./scope";

/** Repairs opened in a period (ISO dates, both included) and/or done by one vendor. */
export type ViewFilter = { from?: string; to?: string; vendor?: string };

/** Views kept per organisation (the newest); older ones are computed again when asked for. */
const VIEWS_KEPT = 20;

export function hasViewFilter(f: ViewFilter): boolean {
  return Boolean(f.from || f.to || f.vendor);
}

/**
 * The id of the organisation's cells for repairs in a period or by a vendor, computed from the
 * raw rows on first use (about as long as a recompute) and kept beside the latest analysis run
 * (deleted with it when the next recompute replaces it). Null without a filter (the run's own
 * cells answer) or before the first run.
 */
export async function ensureCellView(
  db: Db,
  scope: OrgScope,
  filter: ViewFilter,
): Promise<number | null> {
  assertCan(scope, "patterns:read");
  if (!hasViewFilter(filter)) return null;
  const org = scope.organisationId;
  const [run] = (
    await db.$client.execute({
      sql: "select id from analysis_runs where organisation_id = ? and status = 'done' order by id desc limit 1",
      args: [org],
    })
  ).rows;
  if (!run) return null;
  const runId = Number(run.id);
  const viewKey = JSON.stringify({
    from: filter.from ?? null,
    to: filter.to ?? null,
    vendor: filter.vendor?.trim().toLowerCase() ?? null,
  });
  const find = async () => {
    const [row] = (
      await db.$client.execute({
        sql: "select id from cell_views where organisation_id = ? and run_id = ? and view_key = ?",
        args: [org, runId, viewKey],
      })
    ).rows;
    return row ? Number(row.id) : null;
  };
  const existing = await find();
  if (existing !== null) return existing;

  // A view is of the analysed cells (failure and wear); service rates serve only the planner.
  const cells = (await computeOrganisationCells(db, org, filter)).cells.filter(
    (c) => c.kind !== "service",
  );
  const tx = await db.$client.transaction("write");
  try {
    const inserted = await tx.execute({
      sql: `insert into cell_views (organisation_id, run_id, view_key, cells) values (?, ?, ?, ?)
            on conflict do nothing returning id`,
      args: [org, runId, viewKey, cells.length],
    });
    const viewId = Number(inserted.rows[0]?.id ?? 0);
    if (viewId > 0) {
      const { columns, rows } = cellInsertRows(org, { column: "view_id", id: viewId }, cells);
      const statements = insertStatements("cell_view_stats", columns, rows);
      statements.push(
        `delete from cell_views where organisation_id = ${org} and id not in
           (select id from cell_views where organisation_id = ${org} order by id desc limit ${VIEWS_KEPT})`,
      );
      await tx.executeMultiple(statements.join(";\n"));
    }
    await tx.commit();
  } finally {
    tx.close();
  }
  // Another request may have computed the same view meanwhile: theirs is as good.
  return find();
}
