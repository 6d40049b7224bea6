/**
 * Dated odometer readings, shared by cleanOdometerReadings and allocateExposure.
 * Internal: the type is re-exported from lib/stats/index.ts, the helpers are not.
 */

/** One odometer reading of one vehicle. `at` is an ISO date string, a Date or epoch ms. */
export interface OdometerReading {
  at: string | Date | number;
  odometer: number;
}

/** Epoch milliseconds of a reading's time, or NaN when it is not a valid time. */
export function readingTime(at: OdometerReading["at"]): number {
  if (at instanceof Date) return at.getTime();
  if (typeof at === "number") return Number.isFinite(at) ? at : NaN;
  if (typeof at === "string") return Date.parse(at);
  return NaN;
}

/** The readings with their times, sorted by time (stable: equal times keep input order). */
export function sortByTime<T extends OdometerReading>(
  readings: readonly T[],
): { reading: T; time: number }[] {
  return readings
    .map((reading) => ({ reading, time: readingTime(reading?.at) }))
    .sort((a, b) => a.time - b.time);
}
