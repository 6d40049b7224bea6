import "server-only";
import { and, asc, desc, eq, gt, notInArray, or, sql } from "drizzle-orm";
import type { SQLiteColumn } from "drizzle-orm/sqlite-core";
import type { Db } from "@/db";
import {
  analysisRuns,
  cellStats,
  components,
  dtcCodes,
  generations,
  vehicles,
  visibleFaultEvents,
  visibleFuelTransactions,
  visibleOdometerReadings,
  visibleRepairLineCodes,
  visibleRepairLines,
  visibleRepairOrders,
  type FaultStatus,
  type Symptom,
} from "@/db/schema";
import type { AnalysedKind } from "@/lib/component-kinds";
import { faultName } from "@/lib/plain-words";
import { cleanOdometerReadings } from "@/lib/stats";
import { assertCan, countRows, orgWhere, type OrgScope } from "./scope";

/**
 * Most rows of one kind returned for a vehicle (the latest ones). Repair lines are not capped: a
 * vehicle has at most hundreds; telematics fault events and fill-ups can run to thousands.
 */
export const TIMELINE_RECORD_LIMIT = 5000;

/**
 * Every record carries isOdometerDoubtful: its reading is one the statistics ignore as well
 * (cleanOdometerReadings over all of the vehicle's readings: backwards, or an impossible jump).
 */
export type TimelineRepairLine = {
  id: number;
  repairOrderId: number;
  roNumber: string;
  lineNo: number;
  openedOn: string;
  closedOn: string | null;
  odometerMi: number | null;
  complaint: string | null;
  cause: string | null;
  correction: string | null;
  /** The line's DTCs, one each (from repair_line_codes). */
  dtcs: string[];
  /** The same DTCs by name: "P0496 — Purge flow …" (the code alone when not in the catalogue). */
  dtcNames: string[];
  componentId: number | null;
  componentSlug: string | null;
  componentSystem: string | null;
  componentName: string | null;
  symptom: Symptom | null;
  laborHours: number | null;
  partsCostCents: number | null;
  laborCostCents: number | null;
  partNumbers: string | null;
  technician: string | null;
  /** The line's vendor, or the repair order's. */
  vendor: string | null;
  isWarranty: boolean;
  isOdometerDoubtful: boolean;
};

export type TimelineFaultEvent = {
  id: number;
  occurredAt: string;
  odometerMi: number | null;
  dtc: string;
  /** Recurra's description of the code, when the code is in its list. */
  description: string | null;
  milOn: boolean;
  status: FaultStatus;
  isOdometerDoubtful: boolean;
};

export type TimelineFillUp = {
  id: number;
  filledAt: string;
  odometerMi: number | null;
  volumeL: number | null;
  priceTotalCents: number | null;
  station: string | null;
  isOdometerDoubtful: boolean;
};

export type TimelineOdometerReading = {
  id: number;
  readOn: string;
  odometerMi: number;
  source: "roster" | "manual";
  isOdometerDoubtful: boolean;
};

/**
 * Where the vehicle's current odometer stands against a cell's mileage band: inside it, before
 * it by at most one band width (approaching), further before it (ahead), beyond it (past), or
 * unknown when the vehicle has no reading.
 */
export const BAND_POSITIONS = ["inside", "approaching", "ahead", "past", "unknown"] as const;
export type BandPosition = (typeof BAND_POSITIONS)[number];

/** A cell of the vehicle's cohort that is a signal or ranks high, and this vehicle against it. */
export type MatchedPattern = {
  make: string;
  model: string;
  /** Generation label, or the model year when no generation covers the vehicle. */
  cohortLabel: string;
  bandIndex: number;
  bandFromMi: number;
  bandToMi: number;
  /** "dtc:P0496" or "component:fuel-vapour/purge-valve", as the pattern drill-down takes it. */
  faultKey: string;
  /** Failure or wear: which repair lines the cell counts (wear is shown as wear). */
  kind: AnalysedKind;
  dtc: string | null;
  dtcDescription: string | null;
  componentSlug: string | null;
  componentSystem: string | null;
  componentName: string | null;
  events: number;
  exposureMi: number;
  vehiclesAtRisk: number;
  vehiclesAffected: number;
  /** Repairs per 10,000 mi of exposure, with its interval at the run's confidence level. */
  ratePer10k: number | null;
  rateLower: number | null;
  rateUpper: number | null;
  /** Against the rest of the fleet in the same band; null with events when the rest had none. */
  rateRatio: number | null;
  ratioLower: number | null;
  ratioUpper: number | null;
  /** Exact test of the ratio (two-sided), and its false-discovery q-value. */
  pValue: number | null;
  qValue: number | null;
  isSignal: boolean;
  position: BandPosition;
  /** This vehicle's repair lines on this fault, at any mileage and inside the band. */
  vehicleRepairs: number;
  vehicleRepairsInBand: number;
  /** This vehicle's fault-code events with this DTC (0 for a component fault). */
  vehicleFaultEvents: number;
  hasHadFault: boolean;
};

export type VehicleTimeline = {
  vehicle: {
    id: number;
    make: string;
    model: string;
    modelYear: number;
    cohortLabel: string;
    lastOdometerMi: number | null;
    lastOdometerOn: string | null;
    /** The roster's last reading, or else the highest plausible reading on any record. */
    currentOdometerMi: number | null;
  };
  totals: {
    repairOrders: number;
    repairLines: number;
    faultEvents: number;
    fillUps: number;
    odometerReadings: number;
    partsCostCents: number;
    laborCostCents: number;
    fuelCostCents: number;
  };
  /** Each list is sorted by time, oldest first; capped lists hold the latest records. */
  repairLines: TimelineRepairLine[];
  faultEvents: TimelineFaultEvent[];
  fillUps: TimelineFillUp[];
  odometerReadings: TimelineOdometerReading[];
  isCapped: { faultEvents: boolean; fillUps: boolean; odometerReadings: boolean };
  /** The latest finished analysis run, or null before the first recompute. */
  analysis: {
    runId: number;
    finishedAt: string | null;
    bandWidthMi: number;
    confidenceLevel: number;
  } | null;
  /** Inside and approaching first, then ahead and past; signals before high ranks. */
  patterns: MatchedPattern[];
};

const POSITION_ORDER: Record<BandPosition, number> = {
  inside: 0,
  approaching: 1,
  ahead: 2,
  past: 3,
  unknown: 4,
};

export function bandPosition(
  odometerMi: number | null,
  fromMi: number,
  toMi: number,
): BandPosition {
  if (odometerMi === null) return "unknown";
  if (odometerMi >= toMi) return "past";
  if (odometerMi >= fromMi) return "inside";
  return fromMi - odometerMi <= toMi - fromMi ? "approaching" : "ahead";
}

const toNumber = (v: unknown): number => Number(v ?? 0);
const maxOf = (values: (number | null)[]): number | null =>
  values.reduce<number | null>((m, v) => (v !== null && (m === null || v > m) ? v : m), null);

/**
 * One vehicle's repairs, fault-code events, fill-ups and roster readings, each sorted by time,
 * with totals and the cells of the latest analysis run that the vehicle's cohort shows as
 * signals or high ranks (lower bound of the rate ratio above 1). Null when the vehicle is not
 * in the caller's organisation.
 */
export async function getVehicleTimeline(
  db: Db,
  scope: OrgScope,
  vehicleId: number,
): Promise<VehicleTimeline | null> {
  assertCan(scope, "vehicles:read");
  const [vehicle] = await db
    .select({
      id: vehicles.id,
      make: vehicles.make,
      model: vehicles.model,
      modelYear: vehicles.modelYear,
      // The recompute's cohort label (jobs/recompute/cohorts.ts COHORT_LABEL_SQL).
      cohortLabel: sql<string>`coalesce(${generations.label}, cast(${vehicles.modelYear} as text))`,
      lastOdometerMi: vehicles.lastOdometerMi,
      lastOdometerOn: vehicles.lastOdometerOn,
    })
    .from(vehicles)
    .leftJoin(generations, eq(generations.id, vehicles.generationId))
    .where(orgWhere(vehicles, scope, eq(vehicles.id, vehicleId)))
    .limit(1);
  if (!vehicle) return null;
  const ofVehicle = (column: SQLiteColumn) => eq(column, vehicleId);

  const [lines, codes, faults, fills, readings, faultCounts, lineTotals, fillTotals, run] =
    await Promise.all([
      db
        .select({
          id: visibleRepairLines.id,
          repairOrderId: visibleRepairLines.repairOrderId,
          roNumber: visibleRepairOrders.roNumber,
          lineNo: visibleRepairLines.lineNo,
          openedOn: visibleRepairLines.openedOn,
          closedOn: visibleRepairOrders.closedOn,
          odometerMi: visibleRepairLines.odometerMi,
          complaint: visibleRepairLines.complaint,
          cause: visibleRepairLines.cause,
          correction: visibleRepairLines.correction,
          componentId: visibleRepairLines.componentId,
          componentSlug: components.slug,
          componentSystem: components.system,
          componentName: components.name,
          symptom: visibleRepairLines.symptom,
          laborHours: visibleRepairLines.laborHours,
          partsCostCents: visibleRepairLines.partsCostCents,
          laborCostCents: visibleRepairLines.laborCostCents,
          partNumbers: visibleRepairLines.partNumbers,
          technician: visibleRepairLines.technician,
          vendor: sql<
            string | null
          >`coalesce(${visibleRepairLines.vendor}, ${visibleRepairOrders.vendor})`,
          isWarranty: visibleRepairLines.isWarranty,
        })
        .from(visibleRepairLines)
        .innerJoin(
          visibleRepairOrders,
          and(
            eq(visibleRepairOrders.id, visibleRepairLines.repairOrderId),
            eq(visibleRepairOrders.organisationId, scope.organisationId),
          ),
        )
        .leftJoin(components, eq(components.id, visibleRepairLines.componentId))
        .where(orgWhere(visibleRepairLines, scope, ofVehicle(visibleRepairLines.vehicleId)))
        .orderBy(
          asc(visibleRepairLines.openedOn),
          asc(visibleRepairLines.repairOrderId),
          asc(visibleRepairLines.lineNo),
          asc(visibleRepairLines.id),
        ),
      db
        .select({
          lineId: visibleRepairLineCodes.repairLineId,
          dtc: visibleRepairLineCodes.dtc,
          description: dtcCodes.description,
        })
        .from(visibleRepairLineCodes)
        .leftJoin(dtcCodes, eq(dtcCodes.code, visibleRepairLineCodes.dtc))
        .where(orgWhere(visibleRepairLineCodes, scope, ofVehicle(visibleRepairLineCodes.vehicleId)))
        .orderBy(asc(visibleRepairLineCodes.id)),
      db
        .select({
          id: visibleFaultEvents.id,
          occurredAt: visibleFaultEvents.occurredAt,
          odometerMi: visibleFaultEvents.odometerMi,
          dtc: visibleFaultEvents.dtc,
          description: dtcCodes.description,
          milOn: visibleFaultEvents.milOn,
          status: visibleFaultEvents.status,
        })
        .from(visibleFaultEvents)
        .leftJoin(dtcCodes, eq(dtcCodes.code, visibleFaultEvents.dtc))
        .where(orgWhere(visibleFaultEvents, scope, ofVehicle(visibleFaultEvents.vehicleId)))
        .orderBy(desc(visibleFaultEvents.occurredAt), desc(visibleFaultEvents.id))
        .limit(TIMELINE_RECORD_LIMIT),
      db
        .select({
          id: visibleFuelTransactions.id,
          filledAt: visibleFuelTransactions.filledAt,
          odometerMi: visibleFuelTransactions.odometerMi,
          volumeL: visibleFuelTransactions.volumeL,
          priceTotalCents: visibleFuelTransactions.priceTotalCents,
          station: visibleFuelTransactions.station,
        })
        .from(visibleFuelTransactions)
        .where(
          orgWhere(visibleFuelTransactions, scope, ofVehicle(visibleFuelTransactions.vehicleId)),
        )
        .orderBy(desc(visibleFuelTransactions.filledAt), desc(visibleFuelTransactions.id))
        .limit(TIMELINE_RECORD_LIMIT),
      db
        .select({
          id: visibleOdometerReadings.id,
          readOn: visibleOdometerReadings.readOn,
          odometerMi: visibleOdometerReadings.odometerMi,
          source: visibleOdometerReadings.source,
        })
        .from(visibleOdometerReadings)
        .where(
          orgWhere(visibleOdometerReadings, scope, ofVehicle(visibleOdometerReadings.vehicleId)),
        )
        .orderBy(desc(visibleOdometerReadings.readOn), desc(visibleOdometerReadings.id))
        .limit(TIMELINE_RECORD_LIMIT),
      db
        .select({ dtc: visibleFaultEvents.dtc, n: sql<number>`count(*)` })
        .from(visibleFaultEvents)
        .where(orgWhere(visibleFaultEvents, scope, ofVehicle(visibleFaultEvents.vehicleId)))
        .groupBy(visibleFaultEvents.dtc),
      db
        .select({
          n: sql<number>`count(*)`,
          parts: sql<number>`coalesce(sum(${visibleRepairLines.partsCostCents}), 0)`,
          labour: sql<number>`coalesce(sum(${visibleRepairLines.laborCostCents}), 0)`,
        })
        .from(visibleRepairLines)
        .where(orgWhere(visibleRepairLines, scope, ofVehicle(visibleRepairLines.vehicleId))),
      db
        .select({
          n: sql<number>`count(*)`,
          price: sql<number>`coalesce(sum(${visibleFuelTransactions.priceTotalCents}), 0)`,
        })
        .from(visibleFuelTransactions)
        .where(
          orgWhere(visibleFuelTransactions, scope, ofVehicle(visibleFuelTransactions.vehicleId)),
        ),
      db
        .select({
          id: analysisRuns.id,
          finishedAt: analysisRuns.finishedAt,
          bandWidthMi: analysisRuns.bandWidthMi,
          confidenceLevel: analysisRuns.confidenceLevel,
        })
        .from(analysisRuns)
        .where(orgWhere(analysisRuns, scope, eq(analysisRuns.status, "done")))
        .orderBy(desc(analysisRuns.id))
        .limit(1),
    ]);
  const [repairOrderCount, faultEventCount, readingCount] = await Promise.all([
    countRows(
      db,
      visibleRepairOrders,
      orgWhere(visibleRepairOrders, scope, ofVehicle(visibleRepairOrders.vehicleId)),
    ),
    countRows(
      db,
      visibleFaultEvents,
      orgWhere(visibleFaultEvents, scope, ofVehicle(visibleFaultEvents.vehicleId)),
    ),
    countRows(
      db,
      visibleOdometerReadings,
      orgWhere(visibleOdometerReadings, scope, ofVehicle(visibleOdometerReadings.vehicleId)),
    ),
  ]);

  const codesByLine = new Map<number, typeof codes>();
  for (const c of codes) codesByLine.set(c.lineId, [...(codesByLine.get(c.lineId) ?? []), c]);
  const datedLines = lines.map((l) => {
    const own = codesByLine.get(l.id) ?? [];
    return {
      ...l,
      dtcs: own.map((c) => c.dtc),
      dtcNames: own.map((c) => faultName({ dtc: c.dtc, dtcDescription: c.description })),
    };
  });
  faults.reverse();
  fills.reverse();
  readings.reverse();
  // The same cleaning rule as the statistics' exposure, over all of the vehicle's readings.
  const dated = [
    ...datedLines.map((r) => ({ at: r.openedOn, odometer: r.odometerMi, r })),
    ...faults.map((r) => ({ at: r.occurredAt, odometer: r.odometerMi, r })),
    ...fills.map((r) => ({ at: r.filledAt, odometer: r.odometerMi, r })),
    ...readings.map((r) => ({ at: r.readOn, odometer: r.odometerMi, r })),
  ].filter((d): d is typeof d & { odometer: number } => d.odometer !== null);
  const { kept } = cleanOdometerReadings(dated);
  const plausible = new Set<object>(kept.map((k) => k.r));
  const flag = <T extends { odometerMi: number | null }>(r: T) => ({
    ...r,
    isOdometerDoubtful: r.odometerMi !== null && !plausible.has(r),
  });
  const repairs: TimelineRepairLine[] = datedLines.map(flag);
  const subject: VehicleTimeline["vehicle"] = {
    ...vehicle,
    cohortLabel: String(vehicle.cohortLabel),
    currentOdometerMi: vehicle.lastOdometerMi ?? maxOf(kept.map((k) => k.odometer)),
  };
  const [lineTotal] = lineTotals;
  const [fillTotal] = fillTotals;
  const [latestRun] = run;
  const faultEventsByDtc = new Map(faultCounts.map((f) => [f.dtc, toNumber(f.n)]));
  return {
    vehicle: subject,
    totals: {
      repairOrders: repairOrderCount,
      repairLines: toNumber(lineTotal?.n),
      faultEvents: faultEventCount,
      fillUps: toNumber(fillTotal?.n),
      odometerReadings: readingCount,
      partsCostCents: toNumber(lineTotal?.parts),
      laborCostCents: toNumber(lineTotal?.labour),
      fuelCostCents: toNumber(fillTotal?.price),
    },
    repairLines: repairs,
    faultEvents: faults.map(flag),
    fillUps: fills.map(flag),
    odometerReadings: readings.map(flag),
    isCapped: {
      faultEvents: faultEventCount > faults.length,
      fillUps: toNumber(fillTotal?.n) > fills.length,
      odometerReadings: readingCount > readings.length,
    },
    analysis: latestRun
      ? {
          runId: latestRun.id,
          finishedAt: latestRun.finishedAt,
          bandWidthMi: latestRun.bandWidthMi,
          confidenceLevel: latestRun.confidenceLevel,
        }
      : null,
    patterns: latestRun
      ? await listMatchedPatterns(db, scope, {
          runId: latestRun.id,
          vehicle: subject,
          repairs,
          faultEventsByDtc,
        })
      : [],
  };
}

/** The cohort's cells that stand out in the run, with this vehicle's position and history. */
async function listMatchedPatterns(
  db: Db,
  scope: OrgScope,
  input: {
    runId: number;
    vehicle: Pick<
      VehicleTimeline["vehicle"],
      "make" | "model" | "cohortLabel" | "currentOdometerMi"
    >;
    repairs: TimelineRepairLine[];
    faultEventsByDtc: Map<string, number>;
  },
): Promise<MatchedPattern[]> {
  const { vehicle, repairs } = input;
  const cells = await db
    .select({
      make: cellStats.make,
      model: cellStats.model,
      cohortLabel: cellStats.cohortLabel,
      bandIndex: cellStats.bandIndex,
      bandFromMi: cellStats.bandFromMi,
      bandToMi: cellStats.bandToMi,
      faultKey: cellStats.faultKey,
      kind: cellStats.kind,
      dtc: cellStats.dtc,
      dtcDescription: dtcCodes.description,
      componentId: cellStats.componentId,
      componentSlug: components.slug,
      componentSystem: components.system,
      componentName: components.name,
      events: cellStats.events,
      exposureMi: cellStats.exposureMi,
      vehiclesAtRisk: cellStats.vehiclesAtRisk,
      vehiclesAffected: cellStats.vehiclesAffected,
      ratePer10k: cellStats.ratePer10k,
      rateLower: cellStats.rateLower,
      rateUpper: cellStats.rateUpper,
      rateRatio: cellStats.rateRatio,
      ratioLower: cellStats.ratioLower,
      ratioUpper: cellStats.ratioUpper,
      pValue: cellStats.pValue,
      qValue: cellStats.qValue,
      isSignal: cellStats.isSignal,
    })
    .from(cellStats)
    .leftJoin(components, eq(components.id, cellStats.componentId))
    .leftJoin(dtcCodes, eq(dtcCodes.code, cellStats.dtc))
    .where(
      orgWhere(
        cellStats,
        scope,
        eq(cellStats.runId, input.runId),
        eq(cellStats.make, vehicle.make),
        eq(cellStats.model, vehicle.model),
        eq(cellStats.cohortLabel, vehicle.cohortLabel),
        notInArray(cellStats.faultKey, ["all", "all:wear"]),
        or(eq(cellStats.isSignal, true), gt(cellStats.ratioLower, 1)),
      ),
    );
  return cells
    .map(({ componentId, ...cell }): MatchedPattern => {
      const onFault = repairs.filter(
        (r) =>
          (cell.dtc !== null && r.dtcs.includes(cell.dtc)) ||
          (componentId !== null && r.componentId === componentId),
      );
      const inBand = onFault.filter(
        (r) =>
          r.odometerMi !== null && r.odometerMi >= cell.bandFromMi && r.odometerMi < cell.bandToMi,
      );
      const vehicleFaultEvents =
        cell.dtc === null ? 0 : (input.faultEventsByDtc.get(cell.dtc) ?? 0);
      return {
        ...cell,
        // Cells are computed for failure and wear lines only; service is never a pattern.
        kind: cell.kind === "wear" ? "wear" : "failure",
        position: bandPosition(vehicle.currentOdometerMi, cell.bandFromMi, cell.bandToMi),
        vehicleRepairs: onFault.length,
        vehicleRepairsInBand: inBand.length,
        vehicleFaultEvents,
        hasHadFault: onFault.length > 0 || vehicleFaultEvents > 0,
      };
    })
    .sort(
      (a, b) =>
        POSITION_ORDER[a.position] - POSITION_ORDER[b.position] ||
        Number(b.isSignal) - Number(a.isSignal) ||
        (b.ratioLower ?? 0) - (a.ratioLower ?? 0) ||
        a.bandIndex - b.bandIndex ||
        a.faultKey.localeCompare(b.faultKey),
    );
}
