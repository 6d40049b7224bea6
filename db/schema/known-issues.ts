import { integer, real, sqliteTable, text, uniqueIndex, index } from "drizzle-orm/sqlite-core";
import { createdAt, id } from "./columns";
import { components, generations } from "./catalogue";
import { organisations, users } from "./organisations";
import { parts } from "./parts";

/** Life of a curated pattern, in Recurra's words. */
export const KNOWN_ISSUE_STATES = ["watching", "confirmed", "mitigated", "retired"] as const;
export type KnownIssueState = (typeof KNOWN_ISSUE_STATES)[number];

/** Maintained list of caution kinds shown with repair guidance. */
export const CAUTION_KINDS = [
  "electrical",
  "fuses",
  "battery",
  "fuel-vapour",
  "airbag-srs",
  "steering",
  "lifting",
  "hot-parts",
  "brake-dust",
  "springs",
  "refrigerant",
  "high-voltage",
  "other",
] as const;
export type CautionKind = (typeof CAUTION_KINDS)[number];

const orgRef = () =>
  integer("organisation_id")
    .notNull()
    .references(() => organisations.id, { onDelete: "cascade" });
const issueRef = () =>
  integer("known_issue_id")
    .notNull()
    .references(() => knownIssues.id, { onDelete: "cascade" });

export const knownIssues = sqliteTable(
  "known_issues",
  {
    id: id(),
    organisationId: orgRef(),
    title: text("title").notNull(),
    summary: text("summary"),
    state: text("state", { enum: KNOWN_ISSUE_STATES }).notNull().default("watching"),
    /** Affected odometer range, miles. */
    mileageFromMi: real("mileage_from_mi"),
    mileageToMi: real("mileage_to_mi"),
    /** Symptoms and DTCs, space separated. */
    symptoms: text("symptoms"),
    dtcCodes: text("dtc_codes"),
    componentId: integer("component_id").references(() => components.id),
    fixDescription: text("fix_description"),
    laborOperation: text("labor_operation"),
    typicalHours: real("typical_hours"),
    /** Bulletin or recall numbers typed by the user. */
    references: text("references"),
    signalId: integer("signal_id"),
    createdBy: integer("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: text("updated_at"),
  },
  (t) => [index("known_issues_org_state").on(t.organisationId, t.state)],
);

export const knownIssueCohorts = sqliteTable(
  "known_issue_cohorts",
  {
    id: id(),
    organisationId: orgRef(),
    knownIssueId: issueRef(),
    make: text("make").notNull(),
    model: text("model").notNull(),
    generationId: integer("generation_id").references(() => generations.id, {
      onDelete: "set null",
    }),
  },
  (t) => [
    index("known_issue_cohorts_issue").on(t.knownIssueId),
    index("known_issue_cohorts_org_model").on(t.organisationId, t.make, t.model),
  ],
);

export const knownIssueStates = sqliteTable(
  "known_issue_states",
  {
    id: id(),
    organisationId: orgRef(),
    knownIssueId: issueRef(),
    fromState: text("from_state", { enum: KNOWN_ISSUE_STATES }),
    toState: text("to_state", { enum: KNOWN_ISSUE_STATES }).notNull(),
    reason: text("reason").notNull(),
    userId: integer("user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("known_issue_states_issue").on(t.knownIssueId, t.createdAt)],
);

export const knownIssueComments = sqliteTable(
  "known_issue_comments",
  {
    id: id(),
    organisationId: orgRef(),
    knownIssueId: issueRef(),
    userId: integer("user_id").references(() => users.id, { onDelete: "set null" }),
    body: text("body").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("known_issue_comments_issue").on(t.knownIssueId, t.createdAt)],
);

/** Ordered quick checks a technician runs before the long way round. */
export const knownIssueChecks = sqliteTable(
  "known_issue_checks",
  {
    id: id(),
    organisationId: orgRef(),
    knownIssueId: issueRef(),
    position: integer("position").notNull(),
    text: text("text").notNull(),
  },
  (t) => [uniqueIndex("known_issue_checks_order").on(t.knownIssueId, t.position)],
);

export const knownIssueCautions = sqliteTable(
  "known_issue_cautions",
  {
    id: id(),
    organisationId: orgRef(),
    knownIssueId: issueRef(),
    kind: text("kind", { enum: CAUTION_KINDS }).notNull(),
    text: text("text"),
  },
  (t) => [index("known_issue_cautions_issue").on(t.knownIssueId)],
);

export const knownIssueParts = sqliteTable(
  "known_issue_parts",
  {
    id: id(),
    organisationId: orgRef(),
    knownIssueId: issueRef(),
    partId: integer("part_id").references(() => parts.id, { onDelete: "set null" }),
    partNumber: text("part_number").notNull(),
    quantity: integer("quantity").notNull().default(1),
  },
  (t) => [index("known_issue_parts_issue").on(t.knownIssueId)],
);

export const knownIssueWatchers = sqliteTable(
  "known_issue_watchers",
  {
    id: id(),
    organisationId: orgRef(),
    knownIssueId: issueRef(),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
  },
  (t) => [uniqueIndex("known_issue_watchers_unique").on(t.knownIssueId, t.userId)],
);

export const knownIssueAttachments = sqliteTable(
  "known_issue_attachments",
  {
    id: id(),
    organisationId: orgRef(),
    knownIssueId: issueRef(),
    fileName: text("file_name").notNull(),
    storedPath: text("stored_path").notNull(),
    contentType: text("content_type").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    uploadedBy: integer("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("known_issue_attachments_issue").on(t.knownIssueId)],
);

/** A technician's finding recorded against a repair line: the evidence that grows. */
export const FINDING_OUTCOMES = ["confirmed", "not-the-cause", "something-else"] as const;
export const knownIssueFindings = sqliteTable(
  "known_issue_findings",
  {
    id: id(),
    organisationId: orgRef(),
    knownIssueId: integer("known_issue_id").references(() => knownIssues.id, {
      onDelete: "cascade",
    }),
    vehicleId: integer("vehicle_id").notNull(),
    repairLineId: integer("repair_line_id"),
    outcome: text("outcome", { enum: FINDING_OUTCOMES }).notNull(),
    cause: text("cause"),
    correction: text("correction"),
    odometerMi: real("odometer_mi"),
    userId: integer("user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [
    index("known_issue_findings_issue").on(t.knownIssueId),
    index("known_issue_findings_org_vehicle").on(t.organisationId, t.vehicleId),
  ],
);
