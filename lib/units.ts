/** Exact conversion factor, NIST SP 811 (1 mi = 1.609344 km). */
export const KM_PER_MILE = 1.609344;
/** Exact, NIST SP 811. */
export const LITRES_PER_US_GALLON = 3.785411784;
export const LITRES_PER_IMPERIAL_GALLON = 4.54609;

export function milesToUnit(miles: number, unit: "mi" | "km"): number {
  return unit === "km" ? miles * KM_PER_MILE : miles;
}

export function unitToMiles(value: number, unit: "mi" | "km"): number {
  return unit === "km" ? value / KM_PER_MILE : value;
}

/**
 * A distance setting in another unit, rounded to two significant figures: settings are round
 * numbers, and the round trip keeps them (25,000 mi → 40,000 km → 25,000 mi).
 */
export function convertDistanceSetting(value: number, from: "mi" | "km", to: "mi" | "km"): number {
  if (from === to || value === 0) return value;
  return Number(milesToUnit(unitToMiles(value, from), to).toPrecision(2));
}

/** "48,210 mi" — whole units, grouped thousands. */
export function formatDistance(miles: number, unit: "mi" | "km"): string {
  return `${Math.round(milesToUnit(miles, unit)).toLocaleString("en-GB")} ${unit}`;
}
