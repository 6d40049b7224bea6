import { defineFault, defineRepair } from "./faults";
import { buildLine, type OrderDraft, type Site } from "./episodes";

/**
 * The routine service visit both organisations run: oil and filter plus a look round. Its
 * order is what non-urgent faults found on the way get added to.
 */
const ROUTINE_SERVICE = defineFault({
  key: "routine-service",
  symptom: null,
  ratePer10k: 0,
  comebackChance: 0,
  complaints: ["Scheduled service", "Oil change and safety check", "Routine maintenance due"],
  fix: defineRepair(
    "engine-mechanical/oil-service",
    ["Service interval reached", "Due by mileage"],
    [
      "Changed oil and filter, safety inspection, fluids topped up",
      "Oil and filter, checked brakes, lamps, belts and fluids",
      "Oil service, inspected underbody and steering",
    ],
    [0.7, 1.2],
  ),
});

/** Adds the routine service line to a maintenance order. */
export function addServiceLine(site: Site, order: OrderDraft): void {
  order.lines.push(buildLine(site, ROUTINE_SERVICE, ROUTINE_SERVICE.fix, order, [], false));
}

/** Codes that show up as pending and never mature: a sensor's bad day, not a failure. */
export const TRANSIENT_CODES = [
  "P0456",
  "P0171",
  "P0300",
  "P0128",
  "P0420",
  "P0442",
  "P0507",
  "C0040",
  "U0140",
];
