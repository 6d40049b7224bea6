import "server-only";
import { asc, desc, eq, or, sql } from "drizzle-orm";
import type { Db } from "@/db";
import {
  generations,
  vehicles,
  visibleFaultEvents,
  visibleFuelTransactions,
  visibleRepairLines,
  visibleRepairOrders,
} from "@/db/schema";
import { recordAudit } from "./audit";
import {
  assertCan,
  ConflictError,
  containsPattern,
  countRows,
  inOrg,
  NotFoundError,
  orgWhere,
  type OrgScope,
} from "./scope";

export type VehicleListQuery = { q?: string; page: number; pageSize: number };

export async function listVehicles(db: Db, scope: OrgScope, query: VehicleListQuery) {
  assertCan(scope, "vehicles:read");
  const pattern = containsPattern(query.q);
  const search = pattern
    ? or(
        sql`${vehicles.vin} like ${pattern} escape '\\'`,
        sql`${vehicles.unitNumber} like ${pattern} escape '\\'`,
        sql`(${vehicles.make} || ' ' || ${vehicles.model}) like ${pattern} escape '\\'`,
      )
    : undefined;
  const where = orgWhere(vehicles, scope, search);
  const rows = await db
    .select({
      id: vehicles.id,
      vin: vehicles.vin,
      unitNumber: vehicles.unitNumber,
      make: vehicles.make,
      model: vehicles.model,
      modelYear: vehicles.modelYear,
      generation: generations.label,
      lastOdometerMi: vehicles.lastOdometerMi,
      lastOdometerOn: vehicles.lastOdometerOn,
    })
    .from(vehicles)
    .leftJoin(generations, eq(generations.id, vehicles.generationId))
    .where(where)
    .orderBy(asc(vehicles.unitNumber), asc(vehicles.vin), asc(vehicles.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return { rows, total: await countRows(db, vehicles, where) };
}

export async function getVehicle(db: Db, scope: OrgScope, vehicleId: number) {
  assertCan(scope, "vehicles:read");
  const [vehicle] = await db
    .select({
      id: vehicles.id,
      vin: vehicles.vin,
      unitNumber: vehicles.unitNumber,
      make: vehicles.make,
      model: vehicles.model,
      modelYear: vehicles.modelYear,
      engine: vehicles.engine,
      transmission: vehicles.transmission,
      inServiceDate: vehicles.inServiceDate,
      odometerUnit: vehicles.odometerUnit,
      lastOdometerMi: vehicles.lastOdometerMi,
      lastOdometerOn: vehicles.lastOdometerOn,
      generation: generations.label,
    })
    .from(vehicles)
    .leftJoin(generations, eq(generations.id, vehicles.generationId))
    .where(orgWhere(vehicles, scope, eq(vehicles.id, vehicleId)))
    .limit(1);
  if (!vehicle) return null;
  const [repairOrderCount, faultEventCount, fillUpCount] = await Promise.all([
    countRows(
      db,
      visibleRepairOrders,
      orgWhere(visibleRepairOrders, scope, eq(visibleRepairOrders.vehicleId, vehicleId)),
    ),
    countRows(
      db,
      visibleFaultEvents,
      orgWhere(visibleFaultEvents, scope, eq(visibleFaultEvents.vehicleId, vehicleId)),
    ),
    countRows(
      db,
      visibleFuelTransactions,
      orgWhere(visibleFuelTransactions, scope, eq(visibleFuelTransactions.vehicleId, vehicleId)),
    ),
  ]);
  const recentRepairs = await db
    .select({
      id: visibleRepairLines.id,
      roNumber: visibleRepairOrders.roNumber,
      openedOn: visibleRepairLines.openedOn,
      odometerMi: visibleRepairLines.odometerMi,
      complaint: visibleRepairLines.complaint,
      correction: visibleRepairLines.correction,
      dtcCodes: visibleRepairLines.dtcCodes,
    })
    .from(visibleRepairLines)
    .innerJoin(visibleRepairOrders, eq(visibleRepairOrders.id, visibleRepairLines.repairOrderId))
    .where(orgWhere(visibleRepairLines, scope, eq(visibleRepairLines.vehicleId, vehicleId)))
    .orderBy(desc(visibleRepairLines.openedOn), desc(visibleRepairLines.id))
    .limit(10);
  return {
    ...vehicle,
    counts: { repairOrders: repairOrderCount, faultEvents: faultEventCount, fillUps: fillUpCount },
    recentRepairs,
  };
}

export type NewVehicle = {
  vin?: string;
  unitNumber?: string;
  make: string;
  model: string;
  modelYear: number;
  engine?: string;
  transmission?: string;
  inServiceDate?: string;
  odometerUnit: "mi" | "km";
};

/** Adds a vehicle by hand; matches its generation from the organisation's catalogue. */
export async function createVehicle(db: Db, scope: OrgScope, input: NewVehicle) {
  assertCan(scope, "vehicles:write");
  return db.transaction(async (tx) => {
    const duplicate = await tx
      .select({ id: vehicles.id })
      .from(vehicles)
      .where(
        orgWhere(
          vehicles,
          scope,
          or(
            input.vin ? eq(vehicles.vin, input.vin) : undefined,
            input.unitNumber ? eq(vehicles.unitNumber, input.unitNumber) : undefined,
          ) ?? sql`0`,
        ),
      )
      .limit(1);
    if (duplicate.length > 0) {
      throw new ConflictError("A vehicle with this VIN or unit number already exists.");
    }
    const [generation] = await tx
      .select({ id: generations.id })
      .from(generations)
      .where(
        orgWhere(
          generations,
          scope,
          eq(sql`lower(${generations.make})`, input.make.toLowerCase()),
          eq(sql`lower(${generations.model})`, input.model.toLowerCase()),
          sql`${input.modelYear} between ${generations.yearFrom} and ${generations.yearTo}`,
        ),
      )
      .limit(1);
    const [created] = await tx
      .insert(vehicles)
      .values(
        inOrg(scope, {
          vin: input.vin ?? null,
          unitNumber: input.unitNumber ?? null,
          make: input.make,
          model: input.model,
          modelYear: input.modelYear,
          engine: input.engine ?? null,
          transmission: input.transmission ?? null,
          inServiceDate: input.inServiceDate ?? null,
          odometerUnit: input.odometerUnit,
          generationId: generation?.id ?? null,
        }),
      )
      .returning({ id: vehicles.id });
    if (!created) throw new Error("createVehicle: insert returned no row");
    await recordAudit(tx, scope, {
      action: "vehicle.create",
      entity: "vehicle",
      entityId: created.id,
      detail: { vin: input.vin, unitNumber: input.unitNumber },
    });
    return created;
  });
}

export async function requireVehicle(db: Db, scope: OrgScope, vehicleId: number) {
  const vehicle = await getVehicle(db, scope, vehicleId);
  if (!vehicle) throw new NotFoundError("No such vehicle in this organisation.");
  return vehicle;
}
