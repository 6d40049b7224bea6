import { integer, real, sqliteTable, text, index, uniqueIndex } from "drizzle-orm/sqlite-core";
import { cents, createdAt, id } from "./columns";
import { COMPONENT_KINDS, components } from "./catalogue";
import { organisations } from "./organisations";
import { vehicles } from "./vehicles";

/** Recurra's own symptom list. */
export const SYMPTOMS = [
  "stall",
  "no-start",
  "rough-running",
  "lack-of-power",
  "warning-lamp",
  "shift-quality",
  "steering-assist-loss",
  "electrical-accessory",
  "noise",
  "leak",
  "overheating",
  "other",
] as const;
export type Symptom = (typeof SYMPTOMS)[number];

/** SAE J1979 status terms for a stored code. */
export const FAULT_STATUSES = ["pending", "confirmed", "permanent"] as const;
export type FaultStatus = (typeof FAULT_STATUSES)[number];

const orgRef = () =>
  integer("organisation_id")
    .notNull()
    .references(() => organisations.id, { onDelete: "cascade" });
const vehicleRef = () =>
  integer("vehicle_id")
    .notNull()
    .references(() => vehicles.id, { onDelete: "cascade" });

/** A repair order: one visit of one vehicle to a shop (in-house or outside vendor). */
export const repairOrders = sqliteTable(
  "repair_orders",
  {
    id: id(),
    organisationId: orgRef(),
    vehicleId: vehicleRef(),
    roNumber: text("ro_number").notNull(),
    openedOn: text("opened_on").notNull(),
    closedOn: text("closed_on"),
    odometerMi: real("odometer_mi"),
    vendor: text("vendor"),
    importId: integer("import_id"),
    createdAt: createdAt(),
  },
  (t) => [
    // Leading vehicle_id also serves the foreign-key check when a vehicle is deleted.
    index("repair_orders_vehicle").on(t.vehicleId, t.openedOn),
    // Also the duplicate check of imports (an RO number already present is not loaded twice).
    index("repair_orders_org_number").on(t.organisationId, t.roNumber),
    index("repair_orders_import").on(t.importId),
  ],
);

/**
 * One line of a repair order. Vehicle, date and odometer are copied from the order so that the
 * cohort × band × fault aggregation reads one table.
 */
export const repairLines = sqliteTable(
  "repair_lines",
  {
    id: id(),
    organisationId: orgRef(),
    repairOrderId: integer("repair_order_id")
      .notNull()
      .references(() => repairOrders.id, { onDelete: "cascade" }),
    vehicleId: vehicleRef(),
    lineNo: integer("line_no").notNull().default(1),
    openedOn: text("opened_on").notNull(),
    odometerMi: real("odometer_mi"),
    complaint: text("complaint"),
    cause: text("cause"),
    correction: text("correction"),
    /** DTCs as written on the line, space separated; one row each in repairLineCodes. */
    dtcCodes: text("dtc_codes"),
    componentId: integer("component_id").references(() => components.id),
    symptom: text("symptom", { enum: SYMPTOMS }),
    laborHours: real("labor_hours"),
    partsCostCents: cents("parts_cost_cents"),
    laborCostCents: cents("labor_cost_cents"),
    partNumbers: text("part_numbers"),
    technician: text("technician"),
    vendor: text("vendor"),
    isWarranty: integer("is_warranty", { mode: "boolean" }).notNull().default(false),
    /** The line reads as scheduled work (isScheduledWork in lib/component-kinds.ts). */
    isScheduled: integer("is_scheduled", { mode: "boolean" }).notNull().default(false),
    /**
     * service, wear or failure (lineKind): from the component's kind for the organisation and
     * isScheduled; classified again when the organisation changes a component's kind.
     */
    kind: text("kind", { enum: COMPONENT_KINDS }).notNull().default("failure"),
    importId: integer("import_id"),
  },
  (t) => [
    // Leading FK columns: deletes of orders/vehicles (undo) check children through these.
    index("repair_lines_order").on(t.repairOrderId),
    index("repair_lines_vehicle").on(t.vehicleId, t.odometerMi),
    index("repair_lines_org_component").on(t.organisationId, t.componentId),
  ],
);

export const repairLineCodes = sqliteTable(
  "repair_line_codes",
  {
    id: id(),
    organisationId: orgRef(),
    repairLineId: integer("repair_line_id")
      .notNull()
      .references(() => repairLines.id, { onDelete: "cascade" }),
    /** Copied from the line for grouping; the line's own foreign key guards integrity. */
    vehicleId: integer("vehicle_id").notNull(),
    dtc: text("dtc").notNull(),
    /** The line's import, so that the visible_ views hide codes of an import still applying. */
    importId: integer("import_id"),
  },
  (t) => [
    index("repair_line_codes_org_dtc").on(t.organisationId, t.dtc),
    index("repair_line_codes_line").on(t.repairLineId),
  ],
);

/** A fault-code event reported by telematics or a scan tool. */
export const faultEvents = sqliteTable(
  "fault_events",
  {
    id: id(),
    organisationId: orgRef(),
    vehicleId: vehicleRef(),
    occurredAt: text("occurred_at").notNull(),
    odometerMi: real("odometer_mi"),
    dtc: text("dtc").notNull(),
    milOn: integer("mil_on", { mode: "boolean" }).notNull().default(false),
    status: text("status", { enum: FAULT_STATUSES }).notNull().default("confirmed"),
    importId: integer("import_id"),
  },
  (t) => [
    // Duplicate key of imports: one vehicle reports a code once at one moment.
    uniqueIndex("fault_events_vehicle_time_dtc").on(t.vehicleId, t.occurredAt, t.dtc),
    index("fault_events_org_dtc").on(t.organisationId, t.dtc),
    index("fault_events_import").on(t.importId),
  ],
);

/** A fuel-card transaction (fill-up). Pump-keyed odometers are noisy; exposure code copes. */
export const fuelTransactions = sqliteTable(
  "fuel_transactions",
  {
    id: id(),
    organisationId: orgRef(),
    vehicleId: vehicleRef(),
    filledAt: text("filled_at").notNull(),
    odometerMi: real("odometer_mi"),
    volumeL: real("volume_l"),
    priceTotalCents: cents("price_total_cents"),
    station: text("station"),
    importId: integer("import_id"),
  },
  (t) => [
    // Duplicate key of imports: one fill-up per vehicle and moment.
    uniqueIndex("fuel_vehicle_time").on(t.vehicleId, t.filledAt),
    index("fuel_import").on(t.importId),
  ],
);
