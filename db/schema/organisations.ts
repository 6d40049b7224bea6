import { integer, real, sqliteTable, text, uniqueIndex, index } from "drizzle-orm/sqlite-core";
import { createdAt, id } from "./columns";

export const ROLES = ["admin", "manager", "technician", "viewer"] as const;
export type Role = (typeof ROLES)[number];

export const DISTANCE_UNITS = ["mi", "km"] as const;
export type DistanceUnit = (typeof DISTANCE_UNITS)[number];

export const ORGANISATION_KINDS = ["fleet", "shop"] as const;

export const organisations = sqliteTable("organisations", {
  id: id(),
  slug: text("slug").notNull().unique(),
  name: text("name").notNull(),
  kind: text("kind", { enum: ORGANISATION_KINDS }).notNull().default("fleet"),
  /** Unit in which the organisation reads distances; stored distances are always miles. */
  distanceUnit: text("distance_unit", { enum: DISTANCE_UNITS }).notNull().default("mi"),
  /** Mileage band width, in distanceUnit. */
  bandWidth: integer("band_width").notNull().default(25000),
  comebackDays: integer("comeback_days").notNull().default(30),
  /** Comeback distance window, in distanceUnit. */
  comebackDistance: integer("comeback_distance").notNull().default(3000),
  /** Post-refuel window, in distanceUnit. */
  refuelWindow: integer("refuel_window").notNull().default(20),
  confidenceLevel: real("confidence_level").notNull().default(0.95),
  /** Cells with less exposure than this (in distanceUnit) are shown as "too little data". */
  minExposure: integer("min_exposure").notNull().default(20000),
  uploadLimitMb: integer("upload_limit_mb").notNull().default(200),
  isDemo: integer("is_demo", { mode: "boolean" }).notNull().default(false),
  createdAt: createdAt(),
});

export const users = sqliteTable("users", {
  id: id(),
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  passwordHash: text("password_hash").notNull(),
  digestOptIn: integer("digest_opt_in", { mode: "boolean" }).notNull().default(false),
  disabledAt: text("disabled_at"),
  createdAt: createdAt(),
});

export const memberships = sqliteTable(
  "memberships",
  {
    id: id(),
    organisationId: integer("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: ROLES }).notNull(),
    /** Receives the weekly digest of this organisation (opt-in, per member). */
    wantsDigest: integer("wants_digest", { mode: "boolean" }).notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("memberships_org_user").on(t.organisationId, t.userId),
    index("memberships_user").on(t.userId),
  ],
);

export const invitations = sqliteTable(
  "invitations",
  {
    id: id(),
    organisationId: integer("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    /** SHA-256 of the token sent by e-mail; the token itself is never stored. */
    tokenHash: text("token_hash").notNull().unique(),
    invitedBy: integer("invited_by").references(() => users.id, { onDelete: "set null" }),
    expiresAt: text("expires_at").notNull(),
    acceptedAt: text("accepted_at"),
    revokedAt: text("revoked_at"),
    createdAt: createdAt(),
  },
  (t) => [index("invitations_org").on(t.organisationId, t.email)],
);
