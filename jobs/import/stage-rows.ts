import type { ImportKind } from "@/db/schema";
import { isScheduledWork, lineKind, type ComponentKind } from "@/lib/component-kinds";
import type { ComponentLookup, TypedRow } from "@/lib/import";
import type { SqlValue } from "./sql-literal";

/**
 * What a row is matched against: the organisation's component text (with its aliases) and the
 * kind of each component for the organisation (its own where it set one, else Recurra's).
 */
export type RowContext = {
  componentOf: ComponentLookup;
  kindOf: (componentId: number) => ComponentKind | undefined;
};

/**
 * How a checked row is written to its staging table: the table, its columns, and a function
 * from the typed row to the column values. Components are matched here (the organisation's
 * aliases are known only to the pipeline), and a repair line's kind worked out (lineKind).
 */
export type StagingLayout<K extends ImportKind> = {
  table: string;
  columns: readonly string[];
  toValues: (row: TypedRow<K>, context: RowContext) => SqlValue[];
};

const VEHICLE_COLUMNS = ["unit_number", "vin", "make", "model", "model_year"] as const;
type VehicleFields = {
  unitNumber: string | null;
  vin: string | null;
  make: string | null;
  model: string | null;
  modelYear: number | null;
};
const vehicleValues = (r: VehicleFields): SqlValue[] => [
  r.unitNumber,
  r.vin,
  r.make,
  r.model,
  r.modelYear,
];

export const STAGING: { [K in ImportKind]: StagingLayout<K> } = {
  vehicles: {
    table: "staged_vehicles",
    columns: [
      ...VEHICLE_COLUMNS,
      "engine",
      "transmission",
      "in_service_date",
      "odometer_mi",
      "odometer_unit",
    ],
    toValues: (r) => [
      ...vehicleValues(r),
      r.engine,
      r.transmission,
      r.inServiceDate,
      r.odometerMi,
      r.odometerUnit,
    ],
  },
  repairs: {
    table: "staged_repairs",
    columns: [
      ...VEHICLE_COLUMNS,
      "ro_number",
      "opened_on",
      "closed_on",
      "odometer_mi",
      "complaint",
      "cause",
      "correction",
      "dtc_codes",
      "component_id",
      "symptom",
      "labor_hours",
      "parts_cost_cents",
      "labor_cost_cents",
      "part_numbers",
      "technician",
      "vendor",
      "is_warranty",
      "is_scheduled",
      "kind",
    ],
    toValues: (r, { componentOf, kindOf }) => {
      const componentId = componentOf(r.componentText);
      const isScheduled = isScheduledWork({
        complaint: r.complaint,
        cause: r.cause,
        correction: r.correction,
        hasDtc: r.dtcCodes.length > 0,
      });
      const kind = lineKind(
        componentId === null ? null : (kindOf(componentId) ?? null),
        isScheduled,
      );
      return [
        ...vehicleValues(r),
        r.roNumber,
        r.openedOn,
        r.closedOn,
        r.odometerMi,
        r.complaint,
        r.cause,
        r.correction,
        r.dtcCodes.length ? r.dtcCodes.join(" ") : null,
        componentId,
        r.symptom,
        r.laborHours,
        r.partsCostCents,
        r.laborCostCents,
        r.partNumbers,
        r.technician,
        r.vendor,
        r.isWarranty,
        isScheduled,
        kind,
      ];
    },
  },
  faults: {
    table: "staged_faults",
    columns: [...VEHICLE_COLUMNS, "occurred_at", "odometer_mi", "dtc", "mil_on", "status"],
    toValues: (r) => [...vehicleValues(r), r.occurredAt, r.odometerMi, r.dtc, r.milOn, r.status],
  },
  fuel: {
    table: "staged_fuel",
    columns: [
      ...VEHICLE_COLUMNS,
      "filled_at",
      "odometer_mi",
      "volume_l",
      "price_total_cents",
      "station",
    ],
    toValues: (r) => [
      ...vehicleValues(r),
      r.filledAt,
      r.odometerMi,
      r.volumeL,
      r.priceTotalCents,
      r.station,
    ],
  },
  parts: {
    table: "staged_parts",
    columns: [
      "part_number",
      "description",
      "component_id",
      "on_hand",
      "unit_cost_cents",
      "lead_time_days",
    ],
    toValues: (r, { componentOf }) => [
      r.partNumber,
      r.description,
      componentOf(r.componentText),
      r.onHand,
      r.unitCostCents,
      r.leadTimeDays,
    ],
  },
  generations: {
    table: "staged_generations",
    columns: ["make", "model", "label", "year_from", "year_to", "powertrain"],
    toValues: (r) => [r.make, r.model, r.generation, r.yearFrom, r.yearTo, r.powertrain],
  },
};

/** The date of a row's odometer reading, for the sanity checks; null for kinds without one. */
export function readingDate(kind: ImportKind, row: TypedRow<ImportKind>): string | null {
  if (kind === "repairs") return (row as TypedRow<"repairs">).openedOn;
  if (kind === "faults") return (row as TypedRow<"faults">).occurredAt.slice(0, 10);
  if (kind === "fuel") return (row as TypedRow<"fuel">).filledAt.slice(0, 10);
  return null;
}
