import { eq } from "drizzle-orm";
import type { Db } from "@/db";
import { organisations } from "@/db/schema";
import { unitToMiles } from "@/lib/units";
import { insertStatements } from "../import/sql-literal";
import { cellInsertRows } from "./cell-record";
import { computeCells, type CellStat } from "./cells";
import { countEvents, type EventFilter } from "./events";
import { computeExposure } from "./exposure";

export type RecomputeResult = {
  runId: number;
  cells: number;
  signals: number;
  readings: number;
  readingsIgnored: number;
  linesWithoutOdometer: number;
  seconds: number;
};

export function cellKey(c: Pick<CellStat, "cohort" | "band" | "faultKey">): string {
  return `${c.cohort.key}|${c.band}|${c.faultKey}`;
}

/**
 * The cells of an organisation from its data, not stored: exposure from every odometer reading
 * and events by GROUP BY (counted in a reader thread on a local file while exposure is worked
 * out here), then the statistics in lib/stats. With a filter, only repairs opened in the period
 * (and the miles driven in it), or done by the vendor, count (a filtered view, cell-views.ts).
 */
export async function computeOrganisationCells(
  db: Db,
  organisationId: number,
  filter: EventFilter = {},
  onPhase: (phase: string) => void = () => {},
) {
  const [org] = await db.select().from(organisations).where(eq(organisations.id, organisationId));
  if (!org) throw new Error(`recompute: organisation ${organisationId} does not exist`);
  const bandWidthMi = unitToMiles(org.bandWidth, org.distanceUnit);
  const minExposureMi = unitToMiles(org.minExposure, org.distanceUnit);
  const [{ counts, linesWithoutOdometer }, exposure] = await Promise.all([
    countEvents(db, organisationId, bandWidthMi, filter).finally(() => onPhase("events")),
    computeExposure(db, organisationId, bandWidthMi, filter).finally(() => onPhase("exposure")),
  ]);
  const cells = computeCells({
    cohorts: exposure.cohorts,
    exposure: exposure.byCohortBand,
    counts,
    bandWidthMi,
    confidence: org.confidenceLevel,
    minExposureMi,
  });
  return {
    cells,
    exposure,
    linesWithoutOdometer,
    bandWidthMi,
    confidenceLevel: org.confidenceLevel,
  };
}

/**
 * Recomputes an organisation's cells and signals from its data: exposure from every odometer
 * reading, events by GROUP BY, statistics in lib/stats, then one write transaction that stores
 * the new run's cells, drops older runs, and records signals (keeping when each first appeared).
 */
export async function recomputeOrganisation(
  db: Db,
  organisationId: number,
  log: (msg: string) => void = () => {},
): Promise<RecomputeResult> {
  const started = performance.now();
  const at = () => ((performance.now() - started) / 1000).toFixed(1);
  const phases: string[] = [];
  const computed = await computeOrganisationCells(db, organisationId, {}, (phase) =>
    phases.push(`${phase} ${at()} s`),
  );
  const { exposure, linesWithoutOdometer, bandWidthMi, confidenceLevel } = computed;
  // Service components' rates go to the stocking planner's table, never among the cells.
  const cells = computed.cells.filter((c) => c.kind !== "service");
  const serviceRates = computed.cells.filter((c) => c.kind === "service");
  const signals = cells.filter((c) => c.isSignal);
  phases.push(`statistics ${at()} s`);

  const tx = await db.$client.transaction("write");
  let runId: number;
  try {
    const run = await tx.execute({
      sql: `insert into analysis_runs (organisation_id, status, band_width_mi, confidence_level, cells, signals, readings_ignored, finished_at)
            values (?, 'done', ?, ?, ?, ?, ?, strftime('%Y-%m-%dT%H:%M:%fZ','now')) returning id`,
      args: [
        organisationId,
        bandWidthMi,
        confidenceLevel,
        cells.length,
        signals.length,
        exposure.readingsIgnored,
      ],
    });
    runId = Number(run.rows[0]?.id);
    const { columns, rows } = cellInsertRows(
      organisationId,
      { column: "run_id", id: runId },
      cells,
    );
    const statements = insertStatements("cell_stats", columns, rows, 500);
    const service = cellInsertRows(organisationId, { column: "run_id", id: runId }, serviceRates);
    statements.push(...insertStatements("service_rates", service.columns, service.rows, 500));
    // Older runs (and their cells and service rates, by cascade) are replaced by this one.
    statements.push(
      `delete from analysis_runs where organisation_id = ${organisationId} and id <> ${runId}`,
    );
    if (statements.length) await tx.executeMultiple(statements.join(";\n"));
    const now = new Date().toISOString();
    for (let i = 0; i < signals.length; i += 200) {
      const chunk = signals.slice(i, i + 200);
      const values = chunk
        .map(() => "(?, ?, ?, ?, ?, ?, ?, ?, 'new', ?, ?, ?, ?, ?, ?, ?, ?, ?)")
        .join(", ");
      await tx.execute({
        // signals.created_at is the moment a signal first appeared (firstSeenAt in the schema).
        sql: `insert into signals (organisation_id, cell_key, make, model, cohort_label, band_index, fault_key, kind, state,
                created_at, last_seen_at, last_run_id, events, exposure_mi, rate_ratio, ratio_lower, ratio_upper, q_value)
              values ${values}
              on conflict (organisation_id, cell_key) do update set
                kind = excluded.kind, last_seen_at = excluded.last_seen_at, last_run_id = excluded.last_run_id, events = excluded.events,
                exposure_mi = excluded.exposure_mi, rate_ratio = excluded.rate_ratio, ratio_lower = excluded.ratio_lower,
                ratio_upper = excluded.ratio_upper, q_value = excluded.q_value`,
        args: chunk.flatMap((c) => [
          organisationId,
          cellKey(c),
          c.cohort.make,
          c.cohort.model,
          c.cohort.label,
          c.band,
          c.faultKey,
          c.kind,
          now,
          now,
          runId,
          c.events,
          c.exposureMi,
          c.rateRatio,
          c.ratioLower,
          c.ratioUpper,
          c.qValue,
        ]),
      });
    }
    await tx.commit();
  } finally {
    tx.close();
  }
  const seconds = (performance.now() - started) / 1000;
  log(
    `recompute for organisation ${organisationId}: ${cells.length} cells, ${signals.length} signals, ` +
      `${exposure.readingsIgnored} of ${exposure.readings} odometer readings ignored, ${seconds.toFixed(1)} s ` +
      `(done at: ${phases.join(", ")}, written ${seconds.toFixed(1)} s)`,
  );
  return {
    runId,
    cells: cells.length,
    signals: signals.length,
    readings: exposure.readings,
    readingsIgnored: exposure.readingsIgnored,
    linesWithoutOdometer,
    seconds,
  };
}
