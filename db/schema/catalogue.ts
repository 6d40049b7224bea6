import { integer, sqliteTable, text, uniqueIndex, index } from "drizzle-orm/sqlite-core";
import { createdAt, id } from "./columns";
import { organisations } from "./organisations";

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
  },
  (t) => [uniqueIndex("components_system_name").on(t.system, t.name)],
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
