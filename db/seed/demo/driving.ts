import { LAST_DAY, isoTimestamp, weekdayOf } from "./calendar";
import type { Moment, Timeline } from "./episodes";
import type { Random } from "./random";
import { FUEL_STATIONS, MODELS } from "./scenario";
import type { DemoFuelTransaction } from "./types";
import type { Vehicle } from "./vehicles";

/**
 * How a delivery vehicle is driven and fuelled: miles day by day through a six-day week, and
 * fill-ups on the fuel card with the odometer keyed at the pump (noisy, as such readings are).
 */

export const SHIFT_START = 7;
const SHIFT_HOURS = 10;
const LITRES_PER_US_GALLON = 3.785411784;

export type DrivingTimeline = Timeline & {
  milesOn(day: number): number;
  /** A random moment during the day's driving. */
  momentOn(day: number): Moment;
};

/** Day-by-day mileage: six working days a week, the odometer rising through each shift. */
export function simulateDriving(rng: Random, vehicle: Vehicle): DrivingTimeline {
  const isOld = vehicle.modelYear <= 2013;
  const annual =
    (vehicle.model === "Merlin" ? rng.between(20000, 30000) : rng.between(15000, 26000)) *
    (isOld ? 0.75 : 1);
  const firstDay = Math.max(0, vehicle.inServiceDay);
  // The oldest hatchbacks are being replaced: some leave the fleet during the period.
  const lastDay = isOld && rng.chance(0.45) ? rng.int(200, 1000) : LAST_DAY;
  const history = Math.max(0, -vehicle.inServiceDay) / 365.25;
  const startOdo = Math.round(history * annual * rng.between(0.85, 1.05) + rng.between(5, 60));
  const days = lastDay - firstDay + 1;
  const starts = new Float64Array(days + 1);
  const miles = new Float64Array(days);
  starts[0] = startOdo;
  const perShift = annual / 306;
  for (let i = 0; i < days; i++) {
    const isSunday = weekdayOf(firstDay + i) === 0;
    const m = isSunday
      ? rng.chance(0.1)
        ? rng.between(10, 40)
        : 0
      : perShift * Math.exp(rng.normal(-0.03, 0.25));
    miles[i] = Math.round(m * 10) / 10;
    starts[i + 1] = (starts[i] ?? 0) + (miles[i] ?? 0);
  }
  const endOdo = starts[days] ?? startOdo;
  const odoAt = (day: number, hour: number) => {
    const i = Math.min(Math.max(day - firstDay, 0), days - 1);
    const share = Math.min(Math.max((hour - SHIFT_START) / SHIFT_HOURS, 0), 1);
    return (starts[i] ?? 0) + (miles[i] ?? 0) * share;
  };
  return {
    firstDay,
    lastDay,
    startOdo,
    endOdo,
    odoAt,
    milesOn: (day) => miles[day - firstDay] ?? 0,
    momentOn(day) {
      const hour = SHIFT_START + rng.between(0.2, 0.95) * SHIFT_HOURS;
      return { day, hour, odo: odoAt(day, hour) };
    },
    momentAtOdo(odo) {
      if (odo < startOdo || odo >= endOdo) return null;
      let lo = 0;
      let hi = days - 1;
      while (lo < hi) {
        const mid = (lo + hi + 1) >> 1;
        if ((starts[mid] ?? 0) <= odo) lo = mid;
        else hi = mid - 1;
      }
      const driven = miles[lo] ?? 0;
      const share = driven > 0 ? (odo - (starts[lo] ?? 0)) / driven : 0;
      return { day: firstDay + lo, hour: SHIFT_START + share * SHIFT_HOURS, odo };
    },
  };
}

export type Fill = Moment & {
  keyedOdo: number | null;
  isKeyedClean: boolean;
  litres: number;
  station: string;
};

/**
 * The odometer as keyed at the pump: mostly right, sometimes rounded or remembered from the
 * last fill, now and then a typo (a digit dropped, doubled or swapped) or left blank.
 */
function keyOdometer(
  rng: Random,
  odo: number,
  lastKeyed: number | null,
): { value: number | null; isClean: boolean } {
  const exact = Math.floor(odo);
  const r = rng.next();
  if (r < 0.87) return { value: exact, isClean: true };
  if (r < 0.93) return { value: Math.max(0, exact + rng.int(-9, 9)), isClean: true };
  if (r < 0.96 && lastKeyed !== null) return { value: lastKeyed + rng.int(0, 40), isClean: false };
  if (r < 0.97) return { value: null, isClean: false };
  const digits = String(exact);
  const at = rng.int(0, digits.length - 2);
  const typo = rng.pick(["drop", "double", "swap"] as const);
  const keyed =
    typo === "drop"
      ? digits.slice(0, at) + digits.slice(at + 1)
      : typo === "double"
        ? digits.slice(0, at + 1) + digits.slice(at)
        : digits.slice(0, at) + (digits[at + 1] ?? "") + (digits[at] ?? "") + digits.slice(at + 2);
  return { value: Number(keyed), isClean: keyed === digits };
}

/** Fill-ups every 250–400 mi, each filling the tank back up with what was burnt since. */
export function simulateFills(rng: Random, vehicle: Vehicle, timeline: DrivingTimeline): Fill[] {
  const fills: Fill[] = [];
  const home = rng.weighted(FUEL_STATIONS);
  const mpg = MODELS[vehicle.model].mpg;
  let last = timeline.startOdo - rng.between(0, 250);
  let lastKeyed: number | null = null;
  for (;;) {
    const target = last + rng.between(250, 400);
    const at = timeline.momentAtOdo(target);
    if (!at) return fills;
    const gallons = ((target - last) / (mpg * rng.between(0.9, 1.1))) * rng.between(0.97, 1.03);
    const keyed = keyOdometer(rng, target, lastKeyed);
    if (keyed.value !== null) lastKeyed = keyed.value;
    fills.push({
      ...at,
      keyedOdo: keyed.value,
      isKeyedClean: keyed.isClean,
      litres: Math.round(gallons * LITRES_PER_US_GALLON * 100) / 100,
      station: rng.chance(0.55) ? home : rng.weighted(FUEL_STATIONS),
    });
    last = target;
  }
}

/** Pump price per litre in cents: seasonal swing, a slow rise, and each station's margin. */
function findPricePerLitreCents(day: number, station: string): number {
  const stationIndex = FUEL_STATIONS.findIndex(([name]) => name === station);
  const margin = [0, 2, -1, 3, 1, -2, 4, 2][stationIndex] ?? 0;
  return 91 + 7 * Math.sin((2 * Math.PI * day) / 365 - 1.3) + (5 * day) / 1095 + margin;
}

export function toFuelTransaction(vin: string, fill: Fill): DemoFuelTransaction {
  return {
    vin,
    filledAt: isoTimestamp(fill.day, fill.hour),
    odometerMi: fill.keyedOdo,
    volumeL: fill.litres,
    priceTotalCents: Math.round(fill.litres * findPricePerLitreCents(fill.day, fill.station)),
    station: fill.station,
  };
}
