import { sql } from "drizzle-orm";
import { integer, sqliteTable, text, uniqueIndex, index } from "drizzle-orm/sqlite-core";
import { COMPONENT_KINDS } from "@/lib/component-kinds";
import { createdAt, id } from "./columns";
import { organisations } from "./organisations";

export { COMPONENT_KINDS, type ComponentKind } from "@/lib/component-kinds";

/**
 * What drives a generation: combustion only, hybrid or electric. Hybrid and electric vehicles
 * carry high-voltage systems, and every caution shown for them says so.
 */
export const POWERTRAINS = ["combustion", "hybrid", "electric"] as const;
export type Powertrain = (typeof POWERTRAINS)[number];

/** A generation: a model-year range of one model, editable per organisation. */
export const generations = sqliteTable(
  "generations",
  {
    id: id(),
    organisationId: integer("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    make: text("make").notNull(),
    model: text("model").notNull(),
    label: text("label").notNull(),
    yearFrom: integer("year_from").notNull(),
    yearTo: integer("year_to").notNull(),
    /** Null when not known (read as combustion unless the vehicle's engine says otherwise). */
    powertrain: text("powertrain", { enum: POWERTRAINS }),
    importId: integer("import_id"),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("generations_org_label").on(t.organisationId, t.make, t.model, t.label),
    index("generations_org_model").on(t.organisationId, t.make, t.model),
  ],
);

/**
 * Recurra's own component list (system → component). Reference data shared by every
 * organisation, so it carries no organisation id; organisations map their own codes onto it
 * through componentAliases.
 */
export const components = sqliteTable(
  "components",
  {
    id: id(),
    slug: text("slug").notNull().unique(),
    system: text("system").notNull(),
    name: text("name").notNull(),
    /** Recurra's default kind (service, wear or failure); an organisation may override it. */
    kind: text("kind", { enum: COMPONENT_KINDS }).notNull().default("failure"),
  },
  (t) => [uniqueIndex("components_system_name").on(t.system, t.name)],
);

/**
 * An organisation's own kind for a component, where it differs from Recurra's default (set by
 * an admin on Settings → Components, audited). Its repair lines are classified again when it
 * changes.
 */
export const componentKinds = sqliteTable(
  "component_kinds",
  {
    id: id(),
    organisationId: integer("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    componentId: integer("component_id")
      .notNull()
      .references(() => components.id),
    kind: text("kind", { enum: COMPONENT_KINDS }).notNull(),
    /** When the kind was last set. */
    setAt: text("set_at")
      .notNull()
      .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`),
  },
  (t) => [uniqueIndex("component_kinds_org_component").on(t.organisationId, t.componentId)],
);

export const componentAliases = sqliteTable(
  "component_aliases",
  {
    id: id(),
    organisationId: integer("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    alias: text("alias").notNull(),
    componentId: integer("component_id")
      .notNull()
      .references(() => components.id),
  },
  (t) => [uniqueIndex("component_aliases_org_alias").on(t.organisationId, t.alias)],
);

/**
 * Diagnostic trouble codes known to Recurra (SAE J2012 structure). Descriptions are written in
 * Recurra's own words; data is keyed on the code, never on its text.
 */
export const dtcCodes = sqliteTable("dtc_codes", {
  code: text("code").primaryKey(),
  description: text("description").notNull(),
  /** P, C, B or U. */
  area: text("area").notNull(),
  isGeneric: integer("is_generic", { mode: "boolean" }).notNull(),
  componentId: integer("component_id").references(() => components.id),
});
