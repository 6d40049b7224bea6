/**
 * The canonical columns of each import kind, with the ordinary words people put at the top of
 * a spreadsheet for them. Keys are fixed: the row readers, the stored column mappings and the
 * import pipeline all name columns by these keys.
 *
 * Synonyms are generic trade and spreadsheet words (common practice), written loosely: they
 * pass through normaliseHeader like the file's headers do, so "RO #", "ro no" and "RO Number"
 * are one synonym.
 */
import type { ImportKind } from "@/db/schema/operations";

export type ColumnType =
  | "text"
  | "date"
  | "timestamp"
  | "integer"
  | "year"
  | "decimal"
  | "money"
  | "boolean"
  | "dtc"
  | "dtc-list"
  | "vin"
  | "distance"
  | "volume"
  | "distance-unit"
  | "volume-unit"
  | "symptom"
  | "status"
  | "powertrain"
  | "component";

export type ColumnSpec = {
  /** Canonical key, snake_case; fixed. */
  key: string;
  /** What the user sees next to the column. */
  label: string;
  type: ColumnType;
  /**
   * Required on its own. vin and unit_number are never required on their own: kinds listed in
   * KINDS_WITH_VEHICLE_KEY need at least one of VEHICLE_KEYS.
   */
  isRequired: boolean;
  synonyms: readonly string[];
};

/** Either identifies a vehicle; a row needs at least one of them. */
export const VEHICLE_KEYS = ["vin", "unit_number"] as const;
export type VehicleKey = (typeof VEHICLE_KEYS)[number];

/** The kinds whose rows must name a vehicle by VIN or unit number. */
export const KINDS_WITH_VEHICLE_KEY: readonly ImportKind[] = [
  "vehicles",
  "repairs",
  "faults",
  "fuel",
];

/** How the "one of vin / unit_number" requirement is listed among missing required columns. */
export const VEHICLE_KEY_REQUIREMENT = "vin or unit_number";

export function needsVehicleKey(kind: ImportKind): boolean {
  return KINDS_WITH_VEHICLE_KEY.includes(kind);
}

function column(
  key: string,
  label: string,
  type: ColumnType,
  synonyms: readonly string[],
  isRequired = false,
): ColumnSpec {
  return { key, label, type, isRequired, synonyms };
}

const required = (spec: ColumnSpec): ColumnSpec => ({ ...spec, isRequired: true });

// Columns shared by several kinds, declared once.
const UNIT_NUMBER = column("unit_number", "Unit number", "text", [
  "unit",
  "unit no",
  "unit id",
  "fleet no",
  "fleet id",
  "fleet unit",
  "asset",
  "asset no",
  "asset id",
  "vehicle no",
  "vehicle id",
  "equipment no",
  "equipment id",
  "truck no",
  "van no",
  "car no",
  "veh no",
]);
const VIN = column("vin", "VIN", "vin", [
  "vin",
  "vin no",
  "vin code",
  "vehicle identification no",
  "vehicle identification",
  "chassis no",
  "chassis",
  "frame no",
]);
const ODOMETER = column("odometer", "Odometer", "distance", [
  "odometer",
  "odo",
  "odo reading",
  "odometer reading",
  "odometer in",
  "odo in",
  "mileage",
  "mileage in",
  "miles",
  "miles in",
  "km",
  "kms",
  "km in",
  "kilometres",
  "kilometers",
  "meter",
  "meter reading",
  "current odometer",
  "current mileage",
]);
const MAKE = column("make", "Make", "text", [
  "make",
  "manufacturer",
  "mfr",
  "brand",
  "vehicle make",
]);
const MODEL = column("model", "Model", "text", ["model", "vehicle model", "model name"]);
const MODEL_YEAR = column("model_year", "Model year", "year", [
  "model year",
  "year",
  "yr",
  "my",
  "vehicle year",
  "veh year",
  "model yr",
]);
const COMPONENT = column("component", "Component", "component", [
  "component",
  "component code",
  "system component",
  "system and component",
  "repair code",
  "job code",
  "job",
  "job name",
  "job type",
  "task",
  "service task",
  "assembly",
  "repair category",
]);

/** The optional vehicle description carried by event files, used to create unknown vehicles. */
const VEHICLE_DESCRIPTION = [MAKE, MODEL, MODEL_YEAR] as const;

export const IMPORT_COLUMNS: Readonly<Record<ImportKind, readonly ColumnSpec[]>> = {
  vehicles: [
    UNIT_NUMBER,
    VIN,
    required(MAKE),
    required(MODEL),
    required(MODEL_YEAR),
    column("engine", "Engine", "text", [
      "engine",
      "engine type",
      "engine code",
      "engine size",
      "motor",
      "displacement",
      "eng",
    ]),
    column("transmission", "Transmission", "text", [
      "transmission",
      "transmission type",
      "trans",
      "trans type",
      "gearbox",
    ]),
    column("in_service_date", "In-service date", "date", [
      "in service date",
      "in service",
      "date in service",
      "in service on",
      "service start",
      "start date",
      "delivery date",
      "delivered",
      "acquired",
      "acquisition date",
      "purchase date",
      "commissioned",
    ]),
    ODOMETER,
    column("odometer_unit", "Odometer unit", "distance-unit", [
      "odometer unit",
      "odo unit",
      "distance unit",
      "mileage unit",
      "meter unit",
      "uom",
      "unit of measure",
      "mi km",
    ]),
  ],
  repairs: [
    required(
      column("ro_number", "RO number", "text", [
        "ro",
        "ro no",
        "repair order",
        "repair order no",
        "work order",
        "work order no",
        "wo",
        "wo no",
        "order no",
        "job no",
        "job card",
        "invoice",
        "invoice no",
        "ticket",
        "ticket no",
      ]),
    ),
    UNIT_NUMBER,
    VIN,
    required(
      column("opened_on", "Opened on", "date", [
        "opened",
        "opened on",
        "open date",
        "date opened",
        "date in",
        "in date",
        "ro date",
        "order date",
        "repair date",
        "service date",
        "arrival date",
        "date",
      ]),
    ),
    column("closed_on", "Closed on", "date", [
      "closed",
      "closed on",
      "close date",
      "date closed",
      "date out",
      "out date",
      "completed",
      "completed on",
      "completion date",
      "finished",
    ]),
    ODOMETER,
    column("complaint", "Complaint", "text", [
      "complaint",
      "concern",
      "customer concern",
      "customer complaint",
      "customer states",
      "reported problem",
      "problem",
      "fault reported",
      "reported fault",
      "reason for visit",
      "driver report",
    ]),
    column("cause", "Cause", "text", ["cause", "diagnosis", "finding", "findings", "root cause"]),
    column("correction", "Correction", "text", [
      "correction",
      "repair",
      "repair performed",
      "work performed",
      "work done",
      "action taken",
      "fix",
      "remedy",
      "resolution",
    ]),
    column("dtc_codes", "DTCs", "dtc-list", [
      "dtc",
      "dtcs",
      "dtc codes",
      "codes",
      "code",
      "fault codes",
      "fault code",
      "trouble codes",
      "trouble code",
      "obd codes",
      "diagnostic codes",
    ]),
    COMPONENT,
    column("symptom", "Symptom", "symptom", ["symptom", "symptom code", "symptom category"]),
    column("labor_hours", "Labour hours", "decimal", [
      "labor hours",
      "labour hours",
      "labor hrs",
      "labour hrs",
      "hours",
      "hrs",
      "labor time",
      "labour time",
      "flat rate hours",
      "billed hours",
    ]),
    column("parts_cost", "Parts cost", "money", [
      "parts cost",
      "part cost",
      "parts",
      "parts total",
      "parts amount",
      "parts price",
      "parts sale",
    ]),
    column("labor_cost", "Labour cost", "money", [
      "labor cost",
      "labour cost",
      "labor",
      "labour",
      "labor total",
      "labour total",
      "labor amount",
      "labour amount",
    ]),
    column("part_numbers", "Part numbers", "text", [
      "part numbers",
      "part no",
      "part nos",
      "parts used",
      "parts list",
      "pn",
      "p n",
    ]),
    column("technician", "Technician", "text", [
      "technician",
      "tech",
      "tech name",
      "tech id",
      "technician id",
      "mechanic",
    ]),
    column("vendor", "Vendor", "text", [
      "vendor",
      "vendor name",
      "shop",
      "repair shop",
      "garage",
      "supplier",
      "service provider",
    ]),
    column("is_warranty", "Warranty", "boolean", [
      "warranty",
      "is warranty",
      "warranty claim",
      "warranty flag",
      "under warranty",
      "wty",
    ]),
    ...VEHICLE_DESCRIPTION,
  ],
  faults: [
    UNIT_NUMBER,
    VIN,
    required(
      column("occurred_at", "Occurred at", "timestamp", [
        "occurred",
        "occurred at",
        "occurred on",
        "timestamp",
        "time stamp",
        "date time",
        "datetime",
        "event time",
        "event date",
        "fault time",
        "fault date",
        "detected at",
        "reported at",
        "time",
        "date",
      ]),
    ),
    ODOMETER,
    required(
      column("dtc", "DTC", "dtc", [
        "dtc",
        "dtc code",
        "code",
        "fault code",
        "trouble code",
        "obd code",
        "diagnostic code",
      ]),
    ),
    column("mil_on", "MIL on", "boolean", [
      "mil",
      "mil on",
      "mil status",
      "mil lit",
      "lamp on",
      "lamp",
      "lamp status",
      "malfunction indicator lamp",
      "check engine lamp",
      "warning lamp",
    ]),
    column("status", "Status", "status", [
      "status",
      "code status",
      "dtc status",
      "fault status",
      "state",
    ]),
    ...VEHICLE_DESCRIPTION,
  ],
  fuel: [
    UNIT_NUMBER,
    VIN,
    required(
      column("filled_at", "Filled at", "timestamp", [
        "filled at",
        "filled on",
        "fill date",
        "fuel date",
        "fueled at",
        "fuelled at",
        "transaction date",
        "transaction time",
        "trans date",
        "purchase date",
        "date time",
        "datetime",
        "date",
      ]),
    ),
    ODOMETER,
    column("volume", "Volume", "volume", [
      "volume",
      "fuel volume",
      "quantity",
      "fuel quantity",
      "qty",
      "litres",
      "liters",
      "ltr",
      "ltrs",
      "gallons",
      "gal",
      "us gal",
    ]),
    column("volume_unit", "Volume unit", "volume-unit", [
      "volume unit",
      "fuel unit",
      "quantity unit",
      "qty unit",
      "uom",
      "unit of measure",
    ]),
    column("price_total", "Total price", "money", [
      "price total",
      "total",
      "total price",
      "total amount",
      "total cost",
      "amount",
      "transaction amount",
      "sale amount",
      "net amount",
      "gross amount",
      "cost",
    ]),
    column("station", "Station", "text", [
      "station",
      "station name",
      "fuel station",
      "site",
      "site name",
      "merchant",
      "merchant name",
      "location",
    ]),
    ...VEHICLE_DESCRIPTION,
  ],
  parts: [
    required(
      column("part_number", "Part number", "text", [
        "part no",
        "part",
        "part code",
        "pn",
        "p n",
        "sku",
        "item",
        "item no",
        "item code",
        "stock code",
      ]),
    ),
    required(
      column("description", "Description", "text", [
        "description",
        "desc",
        "part description",
        "item description",
        "part name",
        "name",
      ]),
    ),
    COMPONENT,
    column("on_hand", "On hand", "integer", [
      "on hand",
      "qty on hand",
      "quantity on hand",
      "stock on hand",
      "in stock",
      "stock",
      "qty",
      "quantity",
      "soh",
      "qoh",
      "available",
    ]),
    column("unit_cost", "Unit cost", "money", [
      "unit cost",
      "cost",
      "cost each",
      "each",
      "unit price",
      "price",
      "average cost",
      "avg cost",
    ]),
    column("lead_time_days", "Lead time (days)", "integer", [
      "lead time",
      "lead time days",
      "lead days",
      "lead",
      "delivery days",
      "days to deliver",
    ]),
  ],
  generations: [
    required(MAKE),
    required(MODEL),
    required(
      column("generation", "Generation", "text", [
        "generation",
        "gen",
        "series",
        "platform",
        "label",
        "body code",
        "chassis code",
      ]),
    ),
    required(
      column("year_from", "First model year", "year", [
        "year from",
        "from year",
        "from",
        "start year",
        "first year",
        "first model year",
        "my from",
        "begin",
      ]),
    ),
    required(
      column("year_to", "Last model year", "year", [
        "year to",
        "to year",
        "to",
        "end year",
        "last year",
        "last model year",
        "my to",
        "until",
        "thru",
        "through",
      ]),
    ),
    column("powertrain", "Powertrain (combustion, hybrid, electric)", "powertrain", [
      "powertrain",
      "drivetrain type",
      "propulsion",
      "fuel type",
      "hybrid",
      "electrified",
    ]),
  ],
};

/** The spec of one column of a kind, or undefined. */
export function findColumn(kind: ImportKind, key: string): ColumnSpec | undefined {
  return IMPORT_COLUMNS[kind].find((c) => c.key === key);
}
