import { sql } from "drizzle-orm";
import { sqliteView, type SQLiteColumn } from "drizzle-orm/sqlite-core";
import {
  faultEvents,
  fuelTransactions,
  repairLineCodes,
  repairLines,
  repairOrders,
} from "./records";
import { odometerReadings } from "./vehicles";

/**
 * What readers see of the imported records: every row except those of an import that is still
 * being applied (or failed while applying, until its partial rows are removed). On a libSQL server a large import is applied in chunks of a few seconds each,
 * each committed on its own (one long write would be rolled back by the server as soon as
 * another client waits for the write lock); until its last chunk marks the import done, its
 * rows are there for the apply step but hidden by these views. Writers use the tables; every
 * data-layer read of these records goes through a view.
 *
 * `import_id not in (…)` is evaluated once per statement (the subquery is not correlated) and
 * SQLite flattens these views into the queries that use them, so the tables' indexes still
 * serve. Column names and types are the tables' own.
 */
const landed = (importId: SQLiteColumn) =>
  sql`${importId} is null or ${importId} not in (select id from imports where status in ('applying', 'failed'))`;

export const visibleRepairOrders = sqliteView("visible_repair_orders").as((qb) =>
  qb.select().from(repairOrders).where(landed(repairOrders.importId)),
);
export const visibleRepairLines = sqliteView("visible_repair_lines").as((qb) =>
  qb.select().from(repairLines).where(landed(repairLines.importId)),
);
export const visibleRepairLineCodes = sqliteView("visible_repair_line_codes").as((qb) =>
  qb.select().from(repairLineCodes).where(landed(repairLineCodes.importId)),
);
export const visibleFaultEvents = sqliteView("visible_fault_events").as((qb) =>
  qb.select().from(faultEvents).where(landed(faultEvents.importId)),
);
export const visibleFuelTransactions = sqliteView("visible_fuel_transactions").as((qb) =>
  qb.select().from(fuelTransactions).where(landed(fuelTransactions.importId)),
);
export const visibleOdometerReadings = sqliteView("visible_odometer_readings").as((qb) =>
  qb.select().from(odometerReadings).where(landed(odometerReadings.importId)),
);
