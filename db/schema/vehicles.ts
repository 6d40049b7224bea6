import { sql } from "drizzle-orm";
import { integer, real, sqliteTable, text, uniqueIndex, index } from "drizzle-orm/sqlite-core";
import { createdAt, id } from "./columns";
import { generations } from "./catalogue";
import { DISTANCE_UNITS, organisations } from "./organisations";

export const vehicles = sqliteTable(
  "vehicles",
  {
    id: id(),
    organisationId: integer("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    vin: text("vin"),
    unitNumber: text("unit_number"),
    make: text("make").notNull(),
    model: text("model").notNull(),
    modelYear: integer("model_year").notNull(),
    engine: text("engine"),
    transmission: text("transmission"),
    inServiceDate: text("in_service_date"),
    /** Unit the vehicle's odometer reads in; stored readings are always miles. */
    odometerUnit: text("odometer_unit", { enum: DISTANCE_UNITS }).notNull().default("mi"),
    /** Latest-dated odometer reading, miles, worked out from the records (last-odometer.ts). */
    lastOdometerMi: real("last_odometer_mi"),
    lastOdometerOn: text("last_odometer_on"),
    /** Matched from the generation catalogue; null when no generation covers the model year. */
    generationId: integer("generation_id").references(() => generations.id, {
      onDelete: "set null",
    }),
    importId: integer("import_id"),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("vehicles_org_vin")
      .on(t.organisationId, t.vin)
      .where(sql`vin is not null`),
    uniqueIndex("vehicles_org_unit")
      .on(t.organisationId, t.unitNumber)
      .where(sql`unit_number is not null`),
    index("vehicles_org_cohort").on(t.organisationId, t.make, t.model, t.modelYear),
    index("vehicles_org_generation").on(t.organisationId, t.generationId),
  ],
);

export const ODOMETER_SOURCES = ["roster", "manual"] as const;

/**
 * Dated odometer readings that come with no repair, fault or fill-up: a roster import or a
 * reading typed in. Exposure uses these together with the readings on every other record.
 */
export const odometerReadings = sqliteTable(
  "odometer_readings",
  {
    id: id(),
    organisationId: integer("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    vehicleId: integer("vehicle_id")
      .notNull()
      .references(() => vehicles.id, { onDelete: "cascade" }),
    readOn: text("read_on").notNull(),
    odometerMi: real("odometer_mi").notNull(),
    source: text("source", { enum: ODOMETER_SOURCES }).notNull(),
    importId: integer("import_id"),
  },
  (t) => [
    index("odometer_readings_vehicle").on(t.vehicleId, t.readOn),
    index("odometer_readings_import").on(t.importId),
  ],
);
