import { COMPONENTS, type ComponentSlug } from "../reference";
import { LAST_DAY, dayOf } from "./calendar";
import {
  createFaultEvent,
  findRecurrence,
  findWorkingDay,
  finishVehicle,
  numberOrders,
  runEpisode,
  sampleOnsets,
  type NumberedOrder,
  type OrderDraft,
  type Site,
  type Timeline,
  type Workshop,
} from "./episodes";
import { ORDINARY_FAULTS } from "./faults";
import { findPartFit, findUnitCostCents, type PartFit } from "./part-numbers";
import { PLANTED_PATTERNS } from "./patterns";
import type { Random } from "./random";
import { NORTHGATE, NORTHGATE_MIX, NORTHGATE_TECHNICIANS, NORTHGATE_VEHICLES } from "./scenario";
import { TRANSIENT_CODES, addServiceLine } from "./service";
import type { DemoFaultEvent, DemoOrganisation, DemoPart, DemoVehicle, FaultDef } from "./types";
import { createVehicle, listGenerations, type MakeVin, type Vehicle } from "./vehicles";

/**
 * Northgate Auto Clinic: an independent shop with about 2,000 customer vehicles. Customers
 * come for a service once or twice a year and bring in what breaks; the shop sees only part of
 * what goes wrong (the rest is fixed elsewhere), and reads codes with a scan tool at the visit.
 */

const LABOUR_CENTS = 14200;
const PARTS_MARKUP = 1.45;
const INVENTORY_SIZE = 130;

/** Customer vehicles are mostly 4–12 years old; brand-new ones still go to the dealer. */
function findAgeWeight(age: number): number {
  if (age < 0) return 0.6;
  if (age <= 8) return 2 + age;
  return Math.max(0.5, 10 - (age - 8));
}

function chooseModelYear(rng: Random, years: readonly [number, number]): number {
  const options: [number, number][] = [];
  for (let y = years[0]; y <= years[1]; y++) options.push([y, findAgeWeight(2024 - y)]);
  return rng.weighted(options);
}

/** Straight-line mileage between the customer's first and last day with the shop. */
function createCustomerTimeline(rng: Random, vehicle: Vehicle): Timeline {
  const annual =
    vehicle.model === "Skua"
      ? rng.between(9000, 17000)
      : vehicle.model === "Merlin"
        ? rng.between(10000, 18000)
        : rng.between(6000, 14000);
  const perDay = annual / 365.25;
  let firstDay = rng.chance(0.7) ? 0 : rng.int(0, LAST_DAY - 150);
  // New cars reach an independent shop a year or so after they leave the dealer.
  firstDay = Math.min(
    Math.max(firstDay, vehicle.inServiceDay + rng.int(60, 400)),
    LAST_DAY - rng.int(10, 60),
  );
  firstDay = Math.max(firstDay, vehicle.inServiceDay + 1, 0);
  const lastDay = rng.chance(0.15)
    ? rng.int(Math.min(firstDay + 120, LAST_DAY), LAST_DAY)
    : LAST_DAY;
  const startOdo = Math.max(
    5,
    (firstDay - vehicle.inServiceDay) * perDay * rng.between(0.85, 1.15),
  );
  const odoAt = (day: number, hour: number) => startOdo + perDay * (day + hour / 24 - firstDay);
  const endOdo = odoAt(lastDay, 24);
  return {
    firstDay,
    lastDay,
    startOdo,
    endOdo,
    odoAt,
    momentAtOdo(odo) {
      if (odo < startOdo || odo >= endOdo) return null;
      const t = firstDay + (odo - startOdo) / perDay;
      return { day: Math.floor(t), hour: (t - Math.floor(t)) * 24, odo };
    },
  };
}

function chooseTechnician(rng: Random): Workshop {
  const tech = rng.weighted(NORTHGATE_TECHNICIANS.map((t) => [t, t.weight] as const));
  return {
    vendor: null,
    technician: tech.name,
    labourRateCents: LABOUR_CENTS,
    partsMarkup: PARTS_MARKUP,
    comebackFactor: tech.comebackFactor,
    isWarranty: false,
  };
}

function openOrder(
  site: Site,
  day: number,
  workshop: Workshop,
  isMaintenance: boolean,
): OrderDraft {
  const hour = isMaintenance ? site.rng.between(7.5, 10) : site.rng.between(8, 16);
  const order: OrderDraft = {
    day,
    hour,
    odo: site.timeline.odoAt(day, hour),
    workshop,
    isMaintenance,
    lines: [],
  };
  site.orders.push(order);
  return order;
}

/** Service visits every 5–11 months (each customer keeps roughly to their own rhythm). */
function scheduleServiceVisits(site: Site): void {
  const { rng, timeline } = site;
  const interval = rng.between(150, 330);
  // Every customer on the books has been in at least once.
  let day = Math.min(
    timeline.firstDay === 0 ? rng.int(0, Math.round(interval)) : timeline.firstDay,
    timeline.lastDay - 1,
  );
  while (day <= timeline.lastDay) {
    const visitDay = findWorkingDay(day);
    if (visitDay > timeline.lastDay) return;
    addServiceLine(site, openOrder(site, visitDay, chooseTechnician(rng), true));
    day = visitDay + Math.round(interval * rng.between(0.8, 1.25));
  }
}

function createShopSite(rng: Random, vehicle: Vehicle, timeline: Timeline): Site {
  const site: Site = {
    kind: "shop",
    rng,
    vehicle,
    timeline,
    orders: [],
    faultEvents: [],
    firstIncident: (_fault, onsetOdo) => timeline.momentAtOdo(onsetOdo),
    nextIncident: (fault, after) => findRecurrence(site, fault, after),
    placeVisit(fault, incident, previous) {
      // A comeback usually goes back to the technician who did the first repair.
      const workshop = previous && rng.chance(0.6) ? previous : chooseTechnician(rng);
      if (!fault.isUrgent) {
        const service = site.orders.find(
          (o) =>
            o.isMaintenance &&
            o.day > incident.day &&
            o.day <= incident.day + 120 &&
            o.lines.length < 3,
        );
        if (service && !previous) return service;
      }
      const day = findWorkingDay(incident.day + (fault.isUrgent ? rng.int(0, 2) : rng.int(3, 21)));
      if (day > timeline.lastDay) return null;
      const sameDay = site.orders.find((o) => o.day === day && o.lines.length < 3);
      return sameDay ?? openOrder(site, day, workshop, false);
    },
    recordCodes(_fault, _incident, codes, order) {
      if (!order) return;
      // Read with the scan tool a quarter of an hour after check-in.
      const at = { ...order, hour: order.hour + 0.25 };
      for (const dtc of codes) {
        site.faultEvents.push(
          createFaultEvent(vehicle.vin, at, dtc, rng.chance(0.85) ? "confirmed" : "pending"),
        );
      }
    },
  };
  return site;
}

type PartUsage = { slug: ComponentSlug; fit: PartFit["fit"]; fitsWhat: string; qty: number };

/** Tallies the parts a vehicle's lines used, by part number. */
function tallyParts(
  usage: Map<string, PartUsage>,
  vehicle: Vehicle,
  orders: readonly NumberedOrder[],
): void {
  for (const order of orders) {
    for (const line of order.lines) {
      for (const partNumber of line.partNumbers) {
        let entry = usage.get(partNumber);
        if (!entry) {
          const slug = COMPONENTS.find(
            (c) => findPartFit(c.slug, vehicle).partNumber === partNumber,
          )?.slug;
          if (!slug) continue;
          const { fit, fitsWhat } = findPartFit(slug, vehicle);
          entry = { slug, fit, fitsWhat, qty: 0 };
          usage.set(partNumber, entry);
        }
        entry.qty += 1;
      }
    }
  }
}

/**
 * The shop's stock list: every component it repaired (its most used part), then the most used
 * of the rest, with on-hand quantities near a month or two of use.
 */
function buildInventory(rng: Random, usage: Map<string, PartUsage>): DemoPart[] {
  const ranked = [...usage.entries()].sort((a, b) => b[1].qty - a[1].qty || (a[0] < b[0] ? -1 : 1));
  const chosen = new Map<string, PartUsage>();
  const seenSlugs = new Set<string>();
  for (const [pn, u] of ranked) {
    if (!seenSlugs.has(u.slug)) {
      seenSlugs.add(u.slug);
      chosen.set(pn, u);
    }
  }
  for (const [pn, u] of ranked) {
    if (chosen.size >= INVENTORY_SIZE) break;
    chosen.set(pn, u);
  }
  const months = LAST_DAY / 30.4;
  return [...chosen.entries()]
    .sort((a, b) => (a[0] < b[0] ? -1 : 1))
    .map(([partNumber, u]) => {
      const unitCostCents = findUnitCostCents(u.slug, partNumber);
      const name = COMPONENTS.find((c) => c.slug === u.slug)?.name ?? u.slug;
      return {
        partNumber,
        description: `${name}, ${u.fitsWhat}`,
        componentSlug: u.slug,
        onHand: Math.max(0, Math.round((u.qty / months) * rng.between(0.3, 2.5) - 0.3)),
        unitCostCents,
        // Generation-specific parts come from the maker's warehouse; universal ones from the local factor.
        leadTimeDays:
          u.fit === "universal"
            ? 1
            : (u.fit === "generation" ? rng.int(3, 10) : rng.int(1, 4)) +
              (unitCostCents > 20000 ? rng.int(2, 5) : 0),
      };
    });
}

const SHOP_FAULTS: readonly FaultDef[] = [...ORDINARY_FAULTS, ...PLANTED_PATTERNS];

export function generateNorthgate(rng: Random, makeVin: MakeVin): DemoOrganisation {
  const vehicles: DemoVehicle[] = [];
  const orders: NumberedOrder[] = [];
  const faultEvents: DemoFaultEvent[] = [];
  const usage = new Map<string, PartUsage>();
  const mix = NORTHGATE_MIX.map((m) => [m, m.share] as const);
  for (let n = 0; n < NORTHGATE_VEHICLES; n++) {
    const vrng = rng.fork(`customer-${n}`);
    const { model, years } = vrng.weighted(mix);
    const modelYear = chooseModelYear(vrng, years);
    const inServiceDay = dayOf(`${modelYear - 1}-10-01`) + vrng.int(0, 300);
    const vehicle = createVehicle(vrng, makeVin, model, modelYear, inServiceDay);
    const timeline = createCustomerTimeline(vrng, vehicle);
    const site = createShopSite(vrng, vehicle, timeline);
    scheduleServiceVisits(site);
    for (const fault of SHOP_FAULTS) {
      for (const onset of sampleOnsets(
        vrng,
        fault,
        vehicle,
        "shop",
        timeline.startOdo,
        timeline.endOdo,
      )) {
        runEpisode(site, fault, onset);
      }
    }
    for (const order of site.orders) {
      // Now and then the pre-service scan shows a pending code that comes to nothing.
      if (order.isMaintenance && vrng.chance(0.06)) {
        const at = { ...order, hour: order.hour + 0.2 };
        site.faultEvents.push(
          createFaultEvent(vehicle.vin, at, vrng.pick(TRANSIENT_CODES), "pending"),
        );
      }
    }
    const finished = finishVehicle(site);
    tallyParts(usage, vehicle, finished.orders);
    vehicles.push(finished.record);
    orders.push(...finished.orders);
    faultEvents.push(...finished.events);
  }
  return {
    slug: NORTHGATE.slug,
    name: NORTHGATE.name,
    kind: NORTHGATE.kind,
    generations: listGenerations(["Kestrel", "Merlin", "Tern", "Skua", "Wren"]),
    vehicles,
    repairOrders: numberOrders(orders, () => ({ prefix: "NG-", first: 104001 })),
    faultEvents,
    fuelTransactions: [],
    parts: buildInventory(rng.fork("inventory"), usage),
  };
}
