import { dayOf, isoDate } from "./calendar";
import {
  SHIFT_START,
  simulateDriving,
  simulateFills,
  toFuelTransaction,
  type DrivingTimeline,
  type Fill,
} from "./driving";
import {
  createFaultEvent,
  findRecurrence,
  findWorkingDay,
  finishVehicle,
  numberOrders,
  runEpisode,
  sampleOnsets,
  type Moment,
  type NumberedOrder,
  type OrderDraft,
  type OrderSeries,
  type Site,
  type Workshop,
} from "./episodes";
import { ORDINARY_FAULTS } from "./faults";
import { PLANTED_PATTERNS } from "./patterns";
import type { Random } from "./random";
import {
  IN_HOUSE,
  MAKES,
  TIDEWATER,
  TIDEWATER_BATCHES,
  TIDEWATER_TECHNICIANS,
  TIDEWATER_VENDORS,
} from "./scenario";
import { TRANSIENT_CODES, addServiceLine } from "./service";
import type {
  DemoFaultEvent,
  DemoFuelTransaction,
  DemoOrganisation,
  DemoVehicle,
  FaultDef,
} from "./types";
import { createVehicle, listGenerations, type MakeVin, type Vehicle } from "./vehicles";

/**
 * Tidewater Parcel Co-op: about 140 delivery vehicles driven six days a week, filled up on fuel
 * cards, reporting fault codes over telematics and serviced in-house every 7,500 mi or so.
 */

/** Share of post-refuel stalls the driver shrugs off (restarts and drives on) without a report. */
const UNREPORTED_STALL_SHARE = 0.25;
/** Chance that a given fill-up sets off a stall once a purge valve sticks open. */
const STALL_PER_FILL = 0.3;

const DEALER_LABOUR_CENTS = 16500;
const IN_HOUSE_LABOUR_CENTS = 9200;
const OUTSIDE_LABOUR_CENTS = 14500;

/** Where a repair is done: the dealer under warranty, the depot's own bay, or an outside vendor. */
function chooseWorkshop(rng: Random, vehicle: Vehicle, fault: FaultDef, at: Moment): Workshop {
  const ageYears = (at.day - vehicle.inServiceDay) / 365.25;
  const isUnderWarranty =
    !fault.isWearItem &&
    ((ageYears < 3 && at.odo < 36000) || (fault.isPowertrain && ageYears < 5 && at.odo < 60000));
  if (isUnderWarranty) {
    return {
      vendor: MAKES[vehicle.make].dealer,
      technician: null,
      labourRateCents: DEALER_LABOUR_CENTS,
      partsMarkup: 1,
      comebackFactor: 1,
      isWarranty: true,
    };
  }
  if (rng.chance(0.82)) return chooseTechnician(rng);
  const system = fault.fix.component?.split("/")[0] ?? "";
  const vendor = system.startsWith("transmission")
    ? TIDEWATER_VENDORS.transmission
    : ["starting-charging", "power-distribution", "network", "body-electrical"].includes(system)
      ? TIDEWATER_VENDORS.electrical
      : ["brakes", "steering", "suspension"].includes(system) && rng.chance(0.7)
        ? TIDEWATER_VENDORS.chassis
        : TIDEWATER_VENDORS.general;
  return {
    vendor: vendor.name,
    technician: null,
    labourRateCents: OUTSIDE_LABOUR_CENTS,
    partsMarkup: 1.3,
    comebackFactor: vendor.comebackFactor,
    isWarranty: false,
  };
}

function chooseTechnician(rng: Random): Workshop {
  const tech = rng.pick(TIDEWATER_TECHNICIANS);
  return {
    vendor: IN_HOUSE,
    technician: tech.name,
    labourRateCents: IN_HOUSE_LABOUR_CENTS,
    partsMarkup: 1,
    comebackFactor: tech.comebackFactor,
    isWarranty: false,
  };
}

/** Preventive maintenance every 7,500 mi or so, on the next working morning. */
function schedulePreventiveMaintenance(site: Site, timeline: DrivingTimeline): void {
  const { rng } = site;
  let due = timeline.startOdo + rng.between(0, 7500);
  for (;;) {
    const at = timeline.momentAtOdo(due);
    if (!at) return;
    const day = findWorkingDay(at.day + 1);
    if (day > timeline.lastDay) return;
    const order: OrderDraft = {
      day,
      hour: rng.between(6.5, 7),
      odo: timeline.odoAt(day, SHIFT_START),
      workshop: chooseTechnician(rng),
      isMaintenance: true,
      lines: [],
    };
    addServiceLine(site, order);
    site.orders.push(order);
    due = order.odo + rng.between(7100, 7900);
  }
}

/** Telematics: what the vehicle reports for an incident's codes until it is repaired. */
function reportCodes(
  site: Site,
  timeline: DrivingTimeline,
  fault: FaultDef,
  incident: Moment,
  codes: string[],
  order: OrderDraft | null,
): void {
  const { rng, vehicle, faultEvents } = site;
  const emit = (at: Moment, dtc: string, status: "pending" | "confirmed" | "permanent") =>
    faultEvents.push(createFaultEvent(vehicle.vin, at, dtc, status));
  if (codes.length === 0) return;
  if (fault.isUrgent) {
    for (const dtc of codes) emit(incident, dtc, "confirmed");
    return;
  }
  const first = codes[0] as string;
  const before = timeline.momentAtOdo(incident.odo - rng.between(3, 60));
  if (before) emit(before, first, "pending");
  for (const dtc of codes) emit(incident, dtc, "confirmed");
  // Active codes are reported at the first key-on of each trip block, one to three times a
  // driving day, until the vehicle is repaired (fleets often wait for the next service).
  const until = Math.min(order ? order.day - 1 : timeline.lastDay, incident.day + 40);
  for (let day = incident.day + 1; day <= until; day++) {
    if (timeline.milesOn(day) === 0) continue;
    const moments = Array.from({ length: rng.int(1, 3) }, () => timeline.momentOn(day));
    for (const at of moments.sort((a, b) => a.hour - b.hour)) {
      for (const dtc of codes) emit(at, dtc, "confirmed");
    }
  }
  // An emissions code stays stored as permanent until its monitor passes again after repair.
  const isEmissions = /^P[02]/.test(first) && !first.startsWith("P07");
  if (order && isEmissions && rng.chance(0.4)) {
    const day = order.day + rng.int(1, 3);
    if (day <= timeline.lastDay && timeline.milesOn(day) > 0)
      emit(timeline.momentOn(day), first, "permanent");
  }
}

function createFleetSite(
  rng: Random,
  vehicle: Vehicle,
  timeline: DrivingTimeline,
  fills: Fill[],
): Site {
  /** The next stall a few miles after a fill-up past an odometer reading. */
  const findNextStall = (fault: FaultDef, fromOdo: number): Moment | null => {
    for (const fill of fills) {
      if (fill.odo <= fromOdo || !rng.chance(STALL_PER_FILL)) continue;
      const stall = timeline.momentAtOdo(fill.odo + 0.5 + 14.5 * rng.next() ** 2);
      if (!stall) return null;
      if (!rng.chance(UNREPORTED_STALL_SHARE)) return stall;
      // Restarted and drove on: only the telematics unit noticed.
      const codes =
        fault.codes.length > 0 && rng.chance(fault.codeShare) ? rng.pick(fault.codes) : [];
      for (const dtc of codes) {
        site.faultEvents.push(createFaultEvent(vehicle.vin, stall, dtc, "confirmed"));
      }
    }
    return null;
  };
  const site: Site = {
    kind: "fleet",
    rng,
    vehicle,
    timeline,
    orders: [],
    faultEvents: [],
    firstIncident: (fault, onsetOdo) =>
      fault.trigger === "refuel" ? findNextStall(fault, onsetOdo) : timeline.momentAtOdo(onsetOdo),
    nextIncident: (fault, after) =>
      fault.trigger === "refuel"
        ? findNextStall(fault, after.odo)
        : findRecurrence(site, fault, after),
    placeVisit(fault, incident, previous) {
      const workshop =
        previous && rng.chance(0.8) ? previous : chooseWorkshop(rng, vehicle, fault, incident);
      if (fault.isUrgent) {
        // Road call: repaired the same day at the odometer where it stopped.
        const order: OrderDraft = {
          ...incident,
          hour: Math.min(incident.hour + rng.between(0.2, 0.8), 20),
          workshop,
          isMaintenance: false,
          lines: [],
        };
        site.orders.push(order);
        return order;
      }
      if (workshop.vendor === IN_HOUSE) {
        const service = site.orders.find(
          (o) =>
            o.isMaintenance &&
            o.day > incident.day &&
            o.day <= incident.day + 45 &&
            o.odo <= incident.odo + 2500 &&
            o.lines.length < 3,
        );
        if (service) return service;
      }
      const day = findWorkingDay(incident.day + rng.int(1, 10));
      if (day > timeline.lastDay) return null;
      const order: OrderDraft = {
        day,
        hour: rng.between(6.5, 7),
        odo: timeline.odoAt(day, SHIFT_START),
        workshop,
        isMaintenance: false,
        lines: [],
      };
      site.orders.push(order);
      return order;
    },
    recordCodes: (fault, incident, codes, order) =>
      reportCodes(site, timeline, fault, incident, codes, order),
  };
  return site;
}

const FLEET_FAULTS: readonly FaultDef[] = [...ORDINARY_FAULTS, ...PLANTED_PATTERNS];

/** Work-order numbers in-house; the vendor's own invoice numbers for outside work. */
const ORDER_SERIES: Readonly<Record<string, OrderSeries>> = {
  [IN_HOUSE]: { prefix: "TW-", first: 20001 },
  [TIDEWATER_VENDORS.general.name]: { prefix: "KMR-", first: 5512 },
  [TIDEWATER_VENDORS.electrical.name]: { prefix: "GQ", first: 88140 },
  [TIDEWATER_VENDORS.transmission.name]: { prefix: "FTW/", first: 1207 },
  [TIDEWATER_VENDORS.chassis.name]: { prefix: "ABS-", first: 31003 },
  [MAKES.Aurel.dealer]: { prefix: "PA-", first: 660418 },
  [MAKES.Brindle.dealer]: { prefix: "EB-", first: 240977 },
  [MAKES.Ostra.dealer]: { prefix: "OS-", first: 10455 },
};

export function generateTidewater(rng: Random, makeVin: MakeVin): DemoOrganisation {
  const vehicles: DemoVehicle[] = [];
  const orders: NumberedOrder[] = [];
  const faultEvents: DemoFaultEvent[] = [];
  const fuelTransactions: DemoFuelTransaction[] = [];
  let unit = 101;
  for (const batch of TIDEWATER_BATCHES) {
    for (let i = 0; i < batch.count; i++) {
      const unitNumber = `TP-${String(unit++).padStart(4, "0")}`;
      const vrng = rng.fork(unitNumber);
      const inServiceDay = dayOf(batch.inService) + vrng.int(0, 6);
      const vehicle = createVehicle(
        vrng,
        makeVin,
        batch.model,
        batch.modelYear,
        inServiceDay,
        unitNumber,
      );
      const timeline = simulateDriving(vrng, vehicle);
      const fills = simulateFills(vrng, vehicle, timeline);
      const site = createFleetSite(vrng, vehicle, timeline, fills);
      schedulePreventiveMaintenance(site, timeline);
      for (const fault of FLEET_FAULTS) {
        for (const onset of sampleOnsets(
          vrng,
          fault,
          vehicle,
          "fleet",
          timeline.startOdo,
          timeline.endOdo,
        )) {
          runEpisode(site, fault, onset);
        }
      }
      const transient = vrng.poisson((timeline.endOdo - timeline.startOdo) / 3000);
      for (let k = 0; k < transient; k++) {
        const at = timeline.momentAtOdo(vrng.between(timeline.startOdo, timeline.endOdo));
        if (at)
          site.faultEvents.push(
            createFaultEvent(vehicle.vin, at, vrng.pick(TRANSIENT_CODES), "pending"),
          );
      }
      // Pump-keyed odometers count as readings only when keyed cleanly.
      const cleanFills = fills
        .filter((f) => f.isKeyedClean && f.keyedOdo !== null)
        .map((f) => ({ on: isoDate(f.day), odometerMi: f.keyedOdo ?? 0 }));
      const finished = finishVehicle(site, cleanFills);
      vehicles.push(finished.record);
      orders.push(...finished.orders);
      faultEvents.push(...finished.events);
      fuelTransactions.push(...fills.map((f) => toFuelTransaction(vehicle.vin, f)));
    }
  }
  return {
    slug: TIDEWATER.slug,
    name: TIDEWATER.name,
    kind: TIDEWATER.kind,
    generations: listGenerations(["Kestrel", "Merlin", "Tern"]),
    vehicles,
    repairOrders: numberOrders(
      orders,
      (vendor) => ORDER_SERIES[vendor ?? IN_HOUSE] ?? { prefix: "RO-", first: 1 },
    ),
    faultEvents,
    fuelTransactions,
    parts: [],
  };
}
