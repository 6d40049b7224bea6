import { index, integer, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { createdAt, id } from "./columns";
import { knownIssues } from "./known-issues";
import { organisations, users } from "./organisations";
import { vehicles } from "./vehicles";

/** A named list of vehicles to fix before they fail (a proactive campaign). */
export const campaigns = sqliteTable(
  "campaigns",
  {
    id: id(),
    organisationId: integer("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    note: text("note"),
    knownIssueId: integer("known_issue_id").references(() => knownIssues.id, {
      onDelete: "set null",
    }),
    createdBy: integer("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("campaigns_org_name").on(t.organisationId, t.name)],
);

/** A vehicle on a campaign list, done or not. */
export const campaignVehicles = sqliteTable(
  "campaign_vehicles",
  {
    id: id(),
    organisationId: integer("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    campaignId: integer("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    vehicleId: integer("vehicle_id")
      .notNull()
      .references(() => vehicles.id, { onDelete: "cascade" }),
    doneAt: text("done_at"),
    doneBy: integer("done_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("campaign_vehicles_unique").on(t.campaignId, t.vehicleId),
    index("campaign_vehicles_vehicle").on(t.vehicleId),
    index("campaign_vehicles_org").on(t.organisationId),
  ],
);
