import type { FaultStatus } from "@/db/schema";
import { LAST_DAY, isoDate, isoTimestamp, weekdayOf } from "./calendar";
import { findPartFit, findUnitCostCents } from "./part-numbers";
import type { Random } from "./random";
import type {
  DemoFaultEvent,
  DemoVehicle,
  DemoRepairLine,
  DemoRepairOrder,
  FaultDef,
  OrgKind,
  Repair,
} from "./types";
import { cohortKeysOf, type Vehicle } from "./vehicles";

/**
 * The part of the generator that fleet and shop share: when faults start, how a fault turns
 * into visits and repair lines (including repairs that do not hold), and how orders are
 * finished off. fleet.ts and shop.ts supply the parts that differ (how the vehicle is driven,
 * where it is repaired, what records the codes) through a Site.
 */

/** A point in a vehicle's life: day number, hour of day and odometer (miles). */
export type Moment = { day: number; hour: number; odo: number };

/** How a vehicle's odometer moves through its time in the data. */
export type Timeline = {
  firstDay: number;
  lastDay: number;
  startOdo: number;
  endOdo: number;
  odoAt(day: number, hour: number): number;
  /** When the odometer reads this value; null outside the vehicle's time in the data. */
  momentAtOdo(odo: number): Moment | null;
};

/** Who does the work on an order, and on what terms. */
export type Workshop = {
  vendor: string | null;
  technician: string | null;
  labourRateCents: number;
  /** Price charged for parts over their cost price. */
  partsMarkup: number;
  /** Multiplies the chance that a repair does not hold. */
  comebackFactor: number;
  isWarranty: boolean;
};

export type OrderLine = Omit<DemoRepairLine, "lineNo">;

export type OrderDraft = Moment & {
  workshop: Workshop;
  isMaintenance: boolean;
  lines: OrderLine[];
};

export type Site = {
  kind: OrgKind;
  rng: Random;
  vehicle: Vehicle;
  timeline: Timeline;
  orders: OrderDraft[];
  faultEvents: DemoFaultEvent[];
  firstIncident(fault: FaultDef, onsetOdo: number): Moment | null;
  nextIncident(fault: FaultDef, after: Moment): Moment | null;
  /** The order an incident's repair goes on (an existing one or a new one); null when none. */
  placeVisit(fault: FaultDef, incident: Moment, previous: Workshop | null): OrderDraft | null;
  /** Records the codes an incident sets (telematics in a fleet, the scan tool in a shop). */
  recordCodes(fault: FaultDef, incident: Moment, codes: string[], order: OrderDraft | null): void;
};

const MAX_VISITS_PER_EPISODE = 4;

/** Failure rate per mile of a fault on a vehicle at an odometer reading. */
function findRatePerMile(fault: FaultDef, vehicle: Vehicle, kind: OrgKind, odo: number): number {
  let per10k: number;
  if (fault.cohort) {
    const isInCohort =
      fault.cohort.model === vehicle.model && fault.cohort.generation === vehicle.generation?.label;
    if (!isInCohort) return 0;
    per10k = fault.rateAt ? fault.rateAt(odo) : fault.ratePer10k;
  } else {
    const wear = fault.wearFullAtMi
      ? Math.min(1.5, 1 / 3 + ((2 / 3) * odo) / fault.wearFullAtMi)
      : 1;
    const cohort = cohortKeysOf(vehicle).reduce(
      (f, key) => f * (fault.cohortFactors?.[key] ?? 1),
      1,
    );
    per10k = fault.ratePer10k * wear * cohort * (kind === "fleet" ? fault.fleetFactor : 1);
  }
  return (per10k * (kind === "shop" ? fault.shopCapture : 1)) / 10000;
}

/**
 * Odometer readings at which a fault starts, as a Poisson process in miles (thinning against
 * the largest rate on the way), with the fault's minimum gap after each onset.
 */
export function sampleOnsets(
  rng: Random,
  fault: FaultDef,
  vehicle: Vehicle,
  kind: OrgKind,
  fromOdo: number,
  toOdo: number,
): number[] {
  let maxRate = 0;
  for (let x = fromOdo; x <= toOdo + 1000; x += 1000) {
    maxRate = Math.max(maxRate, findRatePerMile(fault, vehicle, kind, Math.min(x, toOdo)));
  }
  if (maxRate === 0) return [];
  const onsets: number[] = [];
  let x = fromOdo;
  for (;;) {
    x += rng.exponential(1 / maxRate);
    if (x >= toOdo) return onsets;
    if (rng.next() * maxRate < findRatePerMile(fault, vehicle, kind, x)) {
      onsets.push(x);
      x += fault.minGapMi;
    }
  }
}

/**
 * Whether a confirmed DTC lights the MIL: powertrain codes do; body, chassis and network codes
 * light their own lamps.
 */
export function isMilCode(dtc: string): boolean {
  return dtc.startsWith("P");
}

/** A fault event at a moment (its odometer to a tenth of a mile, as telematics reports it). */
export function createFaultEvent(
  vin: string,
  at: Moment,
  dtc: string,
  status: FaultStatus,
): DemoFaultEvent {
  return {
    vin,
    occurredAt: isoTimestamp(at.day, at.hour),
    odometerMi: Math.round(at.odo * 10) / 10,
    dtc,
    milOn: status === "confirmed" && isMilCode(dtc),
    status,
  };
}

function roundTo(value: number, step: number): number {
  return Math.round(value / step) * step;
}

const COMEBACK_PREFIXES = ["Back again: ", "Same concern as last visit: ", "Returned: "];

/** Writes one repair line for a repair on an order. */
export function buildLine(
  site: Site,
  fault: FaultDef,
  repair: Repair,
  order: OrderDraft,
  codes: string[],
  isComeback: boolean,
): OrderLine {
  const { rng, vehicle } = site;
  const { workshop } = order;
  const hours = roundTo(rng.between(repair.hours[0], repair.hours[1]), 0.1);
  const partNumbers: string[] = [];
  let partsCostCents = 0;
  for (const part of repair.parts) {
    const { partNumber } = findPartFit(part.slug, vehicle);
    partNumbers.push(partNumber);
    const unit = findUnitCostCents(part.slug, partNumber);
    partsCostCents += Math.round(unit * part.qty * workshop.partsMarkup * rng.between(0.97, 1.03));
  }
  const complaint = rng.pick(fault.complaints);
  const causeIndex = rng.int(0, repair.causes.length - 1);
  const isPaired = repair.causes.length === repair.corrections.length;
  const prefix =
    site.kind === "fleet" && fault.symptom !== null && rng.chance(0.3) ? "Driver reports: " : "";
  return {
    complaint: isComeback
      ? `${rng.pick(COMEBACK_PREFIXES)}${complaint.toLowerCase()}`
      : `${prefix}${complaint}`,
    cause: repair.causes[causeIndex] ?? "",
    correction:
      (isPaired ? repair.corrections[causeIndex] : undefined) ?? rng.pick(repair.corrections),
    dtcCodes: codes,
    componentSlug: repair.component,
    symptom: fault.symptom,
    laborHours: Math.round(hours * 10) / 10,
    partsCostCents,
    laborCostCents: Math.round(hours * workshop.labourRateCents),
    partNumbers,
    technician: workshop.technician,
    vendor: workshop.vendor,
    // A shop redoes its own work under its repair warranty.
    isWarranty: workshop.isWarranty || (isComeback && site.kind === "shop"),
  };
}

/**
 * Plays one fault episode: the first incident, the visit, whether the repair holds, and the
 * comebacks until it does (or the data ends).
 */
export function runEpisode(site: Site, fault: FaultDef, onsetOdo: number): void {
  const { rng } = site;
  let incident = site.firstIncident(fault, onsetOdo);
  let previous: Workshop | null = null;
  for (let visit = 0; incident && visit < MAX_VISITS_PER_EPISODE; visit++) {
    const codes =
      fault.codes.length > 0 && rng.chance(fault.codeShare) ? [...rng.pick(fault.codes)] : [];
    const order = site.placeVisit(fault, incident, previous);
    site.recordCodes(fault, incident, codes, order);
    if (!order) return;
    const isLastVisit = visit === MAX_VISITS_PER_EPISODE - 1;
    const factor = order.workshop.comebackFactor;
    const isWrongFix =
      !isLastVisit &&
      fault.wrongFixes !== undefined &&
      rng.chance((fault.wrongFixChance ?? 0) * Math.min(factor, 1.5));
    const repair = isWrongFix && fault.wrongFixes ? rng.pick(fault.wrongFixes) : fault.fix;
    order.lines.push(buildLine(site, fault, repair, order, codes, visit > 0));
    const holds = !isWrongFix && (isLastVisit || !rng.chance(fault.comebackChance * factor));
    if (holds) return;
    previous = order.workshop;
    incident = site.nextIncident(fault, order);
  }
}

/** The next working day (Monday to Saturday) on or after a day. */
export function findWorkingDay(day: number): number {
  return weekdayOf(day) === 0 ? day + 1 : day;
}

/** A time-based recurrence: the complaint shows again some days after the last visit. */
export function findRecurrence(site: Site, fault: FaultDef, after: Moment): Moment | null {
  const day = after.day + site.rng.int(fault.recurrenceDays[0], fault.recurrenceDays[1]);
  if (day > site.timeline.lastDay) return null;
  const hour = site.rng.between(8, 17);
  return { day, hour, odo: site.timeline.odoAt(day, hour) };
}

export type NumberedOrder = DemoRepairOrder & { day: number; hour: number };

/** Turns a vehicle's order drafts into repair orders (numbered later, in date order). */
function finishOrders(site: Site): NumberedOrder[] {
  const { rng, vehicle } = site;
  return site.orders
    .filter((o) => o.lines.length > 0)
    .sort((a, b) => a.day - b.day || a.hour - b.hour)
    .map((o) => {
      const hours = o.lines.reduce((sum, l) => sum + l.laborHours, 0);
      const stay = hours > 4 ? rng.int(1, 3) : hours > 1.5 && rng.chance(0.4) ? 1 : 0;
      const odometerMi = Math.round(o.odo);
      return {
        vin: vehicle.vin,
        roNumber: "",
        openedOn: isoDate(o.day),
        closedOn: isoDate(Math.min(o.day + stay, LAST_DAY)),
        odometerMi,
        vendor: o.workshop.vendor,
        lines: o.lines.map((l, i) => ({ ...l, lineNo: i + 1 })),
        day: o.day,
        hour: o.hour,
      };
    });
}

export type OrderSeries = { prefix: string; first: number };

/**
 * Gives repair orders their numbers in date order, each vendor with its own series (an outside
 * vendor's invoice number is what the fleet records).
 */
export function numberOrders(
  orders: NumberedOrder[],
  seriesOf: (vendor: string | null) => OrderSeries,
): DemoRepairOrder[] {
  const next = new Map<string, number>();
  return orders
    .sort(
      (a, b) => a.day - b.day || a.hour - b.hour || (a.vin < b.vin ? -1 : a.vin > b.vin ? 1 : 0),
    )
    .map(({ day: _day, hour: _hour, ...order }) => {
      const { prefix, first } = seriesOf(order.vendor);
      const n = next.get(prefix) ?? first;
      next.set(prefix, n + 1);
      return { ...order, roNumber: `${prefix}${n}` };
    });
}

export type Reading = { on: string; odometerMi: number };

/** The latest reading (latest date; on a tie the highest odometer). */
function findLastReading(readings: Iterable<Reading>): Reading | null {
  let best: Reading | null = null;
  for (const r of readings) {
    if (!best || r.on > best.on || (r.on === best.on && r.odometerMi > best.odometerMi)) best = r;
  }
  return best;
}

/**
 * Finishes a vehicle once its episodes are played: its repair orders, its fault events in time
 * order, and its record with the latest odometer reading (from orders, events and any other
 * readings the caller trusts, such as cleanly keyed fill-ups).
 */
export function finishVehicle(
  site: Site,
  otherReadings: readonly Reading[] = [],
): { record: DemoVehicle; orders: NumberedOrder[]; events: DemoFaultEvent[] } {
  const { vehicle } = site;
  const orders = finishOrders(site);
  const events = site.faultEvents.sort((a, b) =>
    a.occurredAt < b.occurredAt ? -1 : a.occurredAt > b.occurredAt ? 1 : 0,
  );
  const last = findLastReading([
    ...orders.map((o) => ({ on: o.openedOn, odometerMi: o.odometerMi })),
    ...events.map((e) => ({ on: e.occurredAt.slice(0, 10), odometerMi: e.odometerMi })),
    ...otherReadings,
  ]);
  const record: DemoVehicle = {
    vin: vehicle.vin,
    unitNumber: vehicle.unitNumber,
    make: vehicle.make,
    model: vehicle.model,
    modelYear: vehicle.modelYear,
    engine: vehicle.engine,
    transmission: vehicle.transmission,
    inServiceDate: isoDate(vehicle.inServiceDay),
    generationLabel: vehicle.generation?.label ?? null,
    lastOdometerMi: last?.odometerMi ?? null,
    lastOdometerOn: last?.on ?? null,
  };
  return { record, orders, events };
}
