import { integer, sqliteTable, text, uniqueIndex, index } from "drizzle-orm/sqlite-core";
import { cents, createdAt, id } from "./columns";
import { components } from "./catalogue";
import { organisations } from "./organisations";

/** A part the organisation stocks or buys, with its on-hand quantity. */
export const parts = sqliteTable(
  "parts",
  {
    id: id(),
    organisationId: integer("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    partNumber: text("part_number").notNull(),
    description: text("description").notNull(),
    componentId: integer("component_id").references(() => components.id),
    onHand: integer("on_hand").notNull().default(0),
    unitCostCents: cents("unit_cost_cents"),
    leadTimeDays: integer("lead_time_days"),
    importId: integer("import_id"),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("parts_org_number").on(t.organisationId, t.partNumber),
    index("parts_org_component").on(t.organisationId, t.componentId),
  ],
);
