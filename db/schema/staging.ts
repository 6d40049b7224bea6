import { integer, real, sqliteTable, text, index } from "drizzle-orm/sqlite-core";
import { cents } from "./columns";
import { organisations } from "./organisations";
import { imports } from "./operations";

/**
 * Staging tables of the import pipeline. Reading a file checks every row and writes the good
 * ones here in small committed chunks (so progress is visible and other writers are not
 * blocked); applying moves them into the data with INSERT … SELECT statements (in chunks for
 * the large kinds, hidden from readers until the import is done: see jobs/import/apply.ts),
 * then the staged rows are removed. A crash while reading leaves only staged rows, which the
 * retry deletes first. Parts rows stay after applying: they hold the previous stock values
 * that an undo restores. Few staging tables are indexed: they hold nothing but the rows of
 * imports in flight, and every index slows the staging writes. Parts are looked up by import;
 * repairs are applied in RO-number ranges.
 */

const common = () => ({
  id: integer("id").primaryKey(),
  organisationId: integer("organisation_id")
    .notNull()
    .references(() => organisations.id, { onDelete: "cascade" }),
  importId: integer("import_id")
    .notNull()
    .references(() => imports.id, { onDelete: "cascade" }),
  rowNumber: integer("row_number").notNull(),
});

/** Vehicle identity and description columns shared by the vehicle-bearing kinds. */
const vehicleColumns = () => ({
  /** Resolved while reading when the vehicle is known; null for a vehicle the import adds. */
  vehicleId: integer("vehicle_id"),
  unitNumber: text("unit_number"),
  vin: text("vin"),
  make: text("make"),
  model: text("model"),
  modelYear: integer("model_year"),
});

export const stagedVehicles = sqliteTable("staged_vehicles", {
  ...common(),
  ...vehicleColumns(),
  engine: text("engine"),
  transmission: text("transmission"),
  inServiceDate: text("in_service_date"),
  odometerMi: real("odometer_mi"),
  odometerUnit: text("odometer_unit"),
});

export const stagedRepairs = sqliteTable(
  "staged_repairs",
  {
    ...common(),
    ...vehicleColumns(),
    roNumber: text("ro_number").notNull(),
    openedOn: text("opened_on").notNull(),
    closedOn: text("closed_on"),
    odometerMi: real("odometer_mi"),
    complaint: text("complaint"),
    cause: text("cause"),
    correction: text("correction"),
    dtcCodes: text("dtc_codes"),
    componentId: integer("component_id"),
    symptom: text("symptom"),
    laborHours: real("labor_hours"),
    partsCostCents: cents("parts_cost_cents"),
    laborCostCents: cents("labor_cost_cents"),
    partNumbers: text("part_numbers"),
    technician: text("technician"),
    vendor: text("vendor"),
    isWarranty: integer("is_warranty", { mode: "boolean" }).notNull().default(false),
    isScheduled: integer("is_scheduled", { mode: "boolean" }).notNull().default(false),
    kind: text("kind").notNull().default("failure"),
  },
  // The apply step walks an import's repair orders in RO-number ranges, a chunk at a time.
  (t) => [index("staged_repairs_import_ro").on(t.importId, t.roNumber)],
);

export const stagedFaults = sqliteTable("staged_faults", {
  ...common(),
  ...vehicleColumns(),
  occurredAt: text("occurred_at").notNull(),
  odometerMi: real("odometer_mi"),
  dtc: text("dtc").notNull(),
  milOn: integer("mil_on", { mode: "boolean" }).notNull().default(false),
  status: text("status").notNull().default("confirmed"),
});

export const stagedFuel = sqliteTable("staged_fuel", {
  ...common(),
  ...vehicleColumns(),
  filledAt: text("filled_at").notNull(),
  odometerMi: real("odometer_mi"),
  volumeL: real("volume_l"),
  priceTotalCents: cents("price_total_cents"),
  station: text("station"),
});

export const stagedParts = sqliteTable(
  "staged_parts",
  {
    ...common(),
    partNumber: text("part_number").notNull(),
    description: text("description").notNull(),
    componentId: integer("component_id"),
    onHand: integer("on_hand"),
    unitCostCents: cents("unit_cost_cents"),
    leadTimeDays: integer("lead_time_days"),
    /** Set when applied: the part existed before, with these values (restored by undo). */
    partId: integer("part_id"),
    wasNew: integer("was_new", { mode: "boolean" }),
    previous: text("previous", { mode: "json" }),
  },
  // Kept after applying (undo reads it), so it is looked up by import.
  (t) => [index("staged_parts_import").on(t.importId)],
);

export const stagedGenerations = sqliteTable("staged_generations", {
  ...common(),
  make: text("make").notNull(),
  model: text("model").notNull(),
  label: text("label").notNull(),
  yearFrom: integer("year_from").notNull(),
  yearTo: integer("year_to").notNull(),
  powertrain: text("powertrain"),
});
