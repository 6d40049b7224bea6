import { sql } from "drizzle-orm";
import { integer, sqliteTable, text, index, uniqueIndex } from "drizzle-orm/sqlite-core";
import { createdAt, id } from "./columns";
import { organisations, users } from "./organisations";

export const IMPORT_KINDS = [
  "vehicles",
  "repairs",
  "faults",
  "fuel",
  "parts",
  "generations",
] as const;
export type ImportKind = (typeof IMPORT_KINDS)[number];

/**
 * uploaded: file stored, waiting for the column mapping · queued: waiting for a worker ·
 * reading: rows being parsed, checked and staged · applying: staged rows moving into the data
 * in one atomic step · done · failed (file kept) · cancelled · undone.
 */
export const IMPORT_STATUSES = [
  "uploaded",
  "queued",
  "reading",
  "applying",
  "done",
  "failed",
  "cancelled",
  "undone",
] as const;
export type ImportStatus = (typeof IMPORT_STATUSES)[number];

const orgRef = () =>
  integer("organisation_id")
    .notNull()
    .references(() => organisations.id, { onDelete: "cascade" });

export const imports = sqliteTable(
  "imports",
  {
    id: id(),
    organisationId: orgRef(),
    kind: text("kind", { enum: IMPORT_KINDS }).notNull(),
    fileName: text("file_name").notNull(),
    storedPath: text("stored_path").notNull(),
    sha256: text("sha256").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    status: text("status", { enum: IMPORT_STATUSES }).notNull().default("uploaded"),
    /** Column mapping and reading options used, as JSON. */
    options: text("options", { mode: "json" }),
    bytesRead: integer("bytes_read").notNull().default(0),
    rowsTotal: integer("rows_total").notNull().default(0),
    rowsImported: integer("rows_imported").notNull().default(0),
    rowsDuplicate: integer("rows_duplicate").notNull().default(0),
    rowsWarning: integer("rows_warning").notNull().default(0),
    rowsRejected: integer("rows_rejected").notNull().default(0),
    vehiclesCreated: integer("vehicles_created").notNull().default(0),
    error: text("error"),
    jobId: integer("job_id"),
    createdBy: integer("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    startedAt: text("started_at"),
    finishedAt: text("finished_at"),
    cancelRequestedAt: text("cancel_requested_at"),
    undoneAt: text("undone_at"),
    undoneBy: integer("undone_by").references(() => users.id, { onDelete: "set null" }),
  },
  (t) => [
    index("imports_org_created").on(t.organisationId, t.createdAt),
    // The same file cannot be live twice in one organisation: a second upload (even at the
    // same moment) is refused, while a failed, cancelled or undone one may be tried again.
    uniqueIndex("imports_org_live_hash")
      .on(t.organisationId, t.sha256)
      .where(sql`status not in ('failed', 'cancelled', 'undone')`),
  ],
);

export const importRejects = sqliteTable(
  "import_rejects",
  {
    id: id(),
    organisationId: orgRef(),
    importId: integer("import_id")
      .notNull()
      .references(() => imports.id, { onDelete: "cascade" }),
    rowNumber: integer("row_number").notNull(),
    /** "rejected" rows were not imported; "warning" rows were, with a remark. */
    severity: text("severity", { enum: ["rejected", "warning"] })
      .notNull()
      .default("rejected"),
    column: text("column"),
    reason: text("reason").notNull(),
    raw: text("raw"),
  },
  (t) => [index("import_rejects_import").on(t.importId, t.rowNumber)],
);

/** Remembered column mapping per organisation and data kind. */
export const columnMappings = sqliteTable(
  "column_mappings",
  {
    id: id(),
    organisationId: orgRef(),
    kind: text("kind", { enum: IMPORT_KINDS }).notNull(),
    mapping: text("mapping", { mode: "json" }).notNull(),
    updatedAt: createdAt(),
  },
  (t) => [uniqueIndex("column_mappings_org_kind").on(t.organisationId, t.kind)],
);

export const JOB_STATUSES = ["queued", "running", "done", "failed"] as const;
export type JobStatus = (typeof JOB_STATUSES)[number];

/**
 * Work queue shared by every worker. A worker claims a job by setting leaseOwner and
 * leaseExpiresAt (epoch ms) in one UPDATE; an expired lease makes the job claimable again.
 */
export const jobs = sqliteTable(
  "jobs",
  {
    id: id(),
    organisationId: integer("organisation_id").references(() => organisations.id, {
      onDelete: "cascade",
    }),
    kind: text("kind").notNull(),
    payload: text("payload", { mode: "json" }),
    status: text("status", { enum: JOB_STATUSES }).notNull().default("queued"),
    runAfter: integer("run_after").notNull(),
    attempts: integer("attempts").notNull().default(0),
    maxAttempts: integer("max_attempts").notNull().default(3),
    leaseOwner: text("lease_owner"),
    leaseExpiresAt: integer("lease_expires_at"),
    progress: integer("progress"),
    lastError: text("last_error"),
    createdAt: createdAt(),
    finishedAt: text("finished_at"),
  },
  (t) => [
    index("jobs_claim").on(t.status, t.runAfter),
    index("jobs_org").on(t.organisationId, t.createdAt),
  ],
);

/**
 * queued: waiting to be sent (again, after a back-off, when attempts remain) · sending: claimed
 * by one deliverer under a lease · sent · failed (for good; lastError says why).
 */
export const EMAIL_STATUSES = ["queued", "sending", "sent", "failed"] as const;
export type EmailStatus = (typeof EMAIL_STATUSES)[number];

/**
 * Mail waiting to go out. Rows are written in the same transaction as the change that causes
 * them (db/queries/email.ts) and sent by the worker's delivery sweep (jobs/mail/outbox.ts),
 * which claims due rows with a lease in one UPDATE, so two workers never send the same row.
 */
export const emailOutbox = sqliteTable(
  "email_outbox",
  {
    id: id(),
    organisationId: integer("organisation_id").references(() => organisations.id, {
      onDelete: "cascade",
    }),
    toAddress: text("to_address").notNull(),
    subject: text("subject").notNull(),
    textBody: text("text_body").notNull(),
    htmlBody: text("html_body"),
    status: text("status", { enum: EMAIL_STATUSES }).notNull().default("queued"),
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    /** Epoch ms before which the row is not tried (again). */
    nextAttemptAt: integer("next_attempt_at").notNull().default(0),
    leaseOwner: text("lease_owner"),
    /** Epoch ms; a "sending" row whose lease expired (its deliverer died) is claimed again. */
    leaseExpiresAt: integer("lease_expires_at"),
    createdAt: createdAt(),
    sentAt: text("sent_at"),
  },
  (t) => [
    index("email_outbox_status").on(t.status, t.createdAt),
    index("email_outbox_due").on(t.status, t.nextAttemptAt),
  ],
);

/**
 * Mail received by the local SMTP capture (demo and development only; jobs/mail/capture.ts).
 * The organisation is taken from the outbox row the message came from, so an admin reads only
 * the mail of their own organisation; a message not from the outbox has none.
 */
export const capturedMail = sqliteTable(
  "captured_mail",
  {
    id: id(),
    organisationId: integer("organisation_id").references(() => organisations.id, {
      onDelete: "cascade",
    }),
    outboxId: integer("outbox_id").references(() => emailOutbox.id, { onDelete: "set null" }),
    messageId: text("message_id"),
    fromAddress: text("from_address").notNull(),
    toAddresses: text("to_addresses").notNull(),
    subject: text("subject").notNull(),
    textBody: text("text_body"),
    htmlBody: text("html_body"),
    sizeBytes: integer("size_bytes").notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    index("captured_mail_org").on(t.organisationId, t.id),
    index("captured_mail_to").on(t.toAddresses),
  ],
);

export const auditLog = sqliteTable(
  "audit_log",
  {
    id: id(),
    organisationId: integer("organisation_id").references(() => organisations.id, {
      onDelete: "cascade",
    }),
    userId: integer("user_id").references(() => users.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    entity: text("entity").notNull(),
    entityId: text("entity_id"),
    detail: text("detail", { mode: "json" }),
    createdAt: createdAt(),
  },
  (t) => [index("audit_log_org_created").on(t.organisationId, t.createdAt)],
);
