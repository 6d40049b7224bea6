import { integer, real, sqliteTable, text, index, uniqueIndex } from "drizzle-orm/sqlite-core";
import { createdAt, id } from "./columns";
import { COMPONENT_KINDS, components, generations } from "./catalogue";
import { organisations } from "./organisations";

const orgRef = () =>
  integer("organisation_id")
    .notNull()
    .references(() => organisations.id, { onDelete: "cascade" });

export const ANALYSIS_RUN_STATUSES = ["running", "done", "failed"] as const;

/** One recompute of the cohort × band × fault cells for an organisation. */
export const analysisRuns = sqliteTable(
  "analysis_runs",
  {
    id: id(),
    organisationId: orgRef(),
    status: text("status", { enum: ANALYSIS_RUN_STATUSES }).notNull().default("running"),
    bandWidthMi: real("band_width_mi").notNull(),
    confidenceLevel: real("confidence_level").notNull(),
    cells: integer("cells"),
    signals: integer("signals"),
    /** Odometer readings ignored as implausible while deriving exposure. */
    readingsIgnored: integer("readings_ignored"),
    startedAt: createdAt(),
    finishedAt: text("finished_at"),
    error: text("error"),
  },
  (t) => [index("analysis_runs_org").on(t.organisationId, t.startedAt)],
);

/** The statistics of one cohort × mileage band × fault cell (shared by runs and views). */
const cellColumns = () => ({
  make: text("make").notNull(),
  model: text("model").notNull(),
  generationId: integer("generation_id").references(() => generations.id, {
    onDelete: "set null",
  }),
  /** Generation label, or the model year when no generation matches. */
  cohortLabel: text("cohort_label").notNull(),
  bandIndex: integer("band_index").notNull(),
  bandFromMi: real("band_from_mi").notNull(),
  bandToMi: real("band_to_mi").notNull(),
  /**
   * "dtc:P0441", "component:fuel-vapour/purge-valve", "all" (every failure line) or "all:wear"
   * (every wear line).
   */
  faultKey: text("fault_key").notNull(),
  /** failure or wear (never service): which lines the cell counts, and its test family. */
  kind: text("kind", { enum: COMPONENT_KINDS }).notNull().default("failure"),
  dtc: text("dtc"),
  componentId: integer("component_id").references(() => components.id),
  events: integer("events").notNull(),
  exposureMi: real("exposure_mi").notNull(),
  vehiclesAtRisk: integer("vehicles_at_risk").notNull(),
  vehiclesAffected: integer("vehicles_affected").notNull(),
  ratePer10k: real("rate_per_10k"),
  rateLower: real("rate_lower"),
  rateUpper: real("rate_upper"),
  shareAffected: real("share_affected"),
  shareLower: real("share_lower"),
  shareUpper: real("share_upper"),
  rateRatio: real("rate_ratio"),
  ratioLower: real("ratio_lower"),
  ratioUpper: real("ratio_upper"),
  pValue: real("p_value"),
  qValue: real("q_value"),
  shrunkRatePer10k: real("shrunk_rate_per_10k"),
  /**
   * The rate's gamma posterior (gammaPoissonShrinkage): shape = prior events + events, rate =
   * prior exposure + exposure (miles); its mean is the shrunk rate per mile. Null when shrinkage
   * did not run (no exposure).
   */
  posteriorShape: real("posterior_shape"),
  posteriorExposureMi: real("posterior_exposure_mi"),
  isSignal: integer("is_signal", { mode: "boolean" }).notNull().default(false),
  hasTooLittleData: integer("has_too_little_data", { mode: "boolean" }).notNull().default(false),
});

/** Computed statistics of one cohort × mileage band × fault cell in one analysis run. */
export const cellStats = sqliteTable(
  "cell_stats",
  {
    id: id(),
    organisationId: orgRef(),
    runId: integer("run_id")
      .notNull()
      .references(() => analysisRuns.id, { onDelete: "cascade" }),
    ...cellColumns(),
  },
  (t) => [
    index("cell_stats_run_rank").on(t.runId, t.ratioLower),
    index("cell_stats_org_cell").on(t.organisationId, t.make, t.model, t.cohortLabel, t.bandIndex),
    index("cell_stats_org_fault").on(t.organisationId, t.faultKey),
  ],
);

/**
 * A computed cell as it is stored: the columns of `cell_stats` (and of `cell_view_stats`, which
 * shares them) other than its id, its organisation and its run or view. The one type of a
 * stored cell; the recompute writes it by column name, never by position.
 */
export type CellRecord = Omit<typeof cellStats.$inferInsert, "id" | "organisationId" | "runId">;

/**
 * A computed cell as it is read back (every column required, nullable ones null). Every query,
 * route, page, export and the command line reads cells as this type or a Pick of it.
 */
export type StoredCell = Omit<typeof cellStats.$inferSelect, "id" | "organisationId" | "runId">;

/**
 * How often the vehicles of a cohort need a scheduled-service component per mileage band (the
 * same columns as a cell, kind "service"): for the stocking planner only. Service is never a
 * failure pattern, so these are never tested, ranked or shown as cells.
 */
export const serviceRates = sqliteTable(
  "service_rates",
  {
    id: id(),
    organisationId: orgRef(),
    runId: integer("run_id")
      .notNull()
      .references(() => analysisRuns.id, { onDelete: "cascade" }),
    ...cellColumns(),
  },
  (t) => [index("service_rates_run").on(t.runId)],
);

export const SIGNAL_STATES = ["new", "seen", "promoted", "dismissed"] as const;

/** A cell that stood out; kept across runs so "first seen" survives recomputes. */
export const signals = sqliteTable(
  "signals",
  {
    id: id(),
    organisationId: orgRef(),
    cellKey: text("cell_key").notNull(),
    make: text("make").notNull(),
    model: text("model").notNull(),
    cohortLabel: text("cohort_label").notNull(),
    bandIndex: integer("band_index").notNull(),
    faultKey: text("fault_key").notNull(),
    kind: text("kind", { enum: COMPONENT_KINDS }).notNull().default("failure"),
    state: text("state", { enum: SIGNAL_STATES }).notNull().default("new"),
    firstSeenAt: createdAt(),
    lastSeenAt: text("last_seen_at").notNull(),
    lastRunId: integer("last_run_id"),
    knownIssueId: integer("known_issue_id"),
    events: integer("events").notNull(),
    exposureMi: real("exposure_mi").notNull(),
    rateRatio: real("rate_ratio"),
    ratioLower: real("ratio_lower"),
    ratioUpper: real("ratio_upper"),
    qValue: real("q_value"),
  },
  (t) => [
    uniqueIndex("signals_org_cell").on(t.organisationId, t.cellKey),
    index("signals_org_state").on(t.organisationId, t.state),
  ],
);

/**
 * A filtered view of an organisation's cells (repairs opened in a period, or done by one
 * vendor), computed on first use beside one analysis run and deleted with it.
 */
export const cellViews = sqliteTable(
  "cell_views",
  {
    id: id(),
    organisationId: orgRef(),
    runId: integer("run_id")
      .notNull()
      .references(() => analysisRuns.id, { onDelete: "cascade" }),
    /** The filter, as canonical JSON ({"from","to","vendor"}). */
    viewKey: text("view_key").notNull(),
    cells: integer("cells").notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("cell_views_org_run_key").on(t.organisationId, t.runId, t.viewKey)],
);

/** The cells of a filtered view (the same columns as cell_stats). */
export const cellViewStats = sqliteTable(
  "cell_view_stats",
  {
    id: id(),
    organisationId: orgRef(),
    viewId: integer("view_id")
      .notNull()
      .references(() => cellViews.id, { onDelete: "cascade" }),
    ...cellColumns(),
  },
  (t) => [index("cell_view_stats_view_rank").on(t.viewId, t.ratioLower)],
);
