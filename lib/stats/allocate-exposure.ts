import { readingTime, sortByTime, type OdometerReading } from "./internal/readings";
import { assertNonNegativeFinite, assertPositiveFinite, fail } from "./internal/validate";
import { mileageBand } from "./mileage-band";

/**
 * Miles one vehicle drove in each mileage band: its exposure per band.
 *
 * Definition: readings are sorted by time; the miles between consecutive readings, from
 * odometer a to b, are split across the bands [k·width, (k + 1)·width) they cross in proportion
 * to the overlap, i.e. linearly in odometer (band k gets |[a, b) ∩ band k|). Miles before the
 * first reading are not counted: the vehicle was not observed then.
 *
 * Returns a Map from band index to miles, holding only bands with miles > 0, in ascending band
 * order; the values add up to (last odometer − first odometer). Fewer than two readings give an
 * empty Map.
 *
 * Method: one pass over consecutive pairs, visiting each band a pair crosses.
 *
 * Source: common practice (person-time / exposure allocation by interval, as in life tables).
 *
 * @param readings one vehicle's readings `{ at, odometer }`, any order; clean them first with
 *   cleanOdometerReadings; not modified
 * @param width band width in miles, finite > 0
 * @throws Error "allocateExposure: …" when readings is not an array, a time is invalid, an
 *   odometer is not a finite number ≥ 0, the odometer goes backwards in time order, or width
 *   is not a finite number > 0
 * @example
 * allocateExposure([{ at: "2024-01-01", odometer: 8_000 }, { at: "2024-06-01", odometer: 23_000 }], 10_000);
 * // Map { 0 => 2000, 1 => 10000, 2 => 3000 }
 */
export function allocateExposure(
  readings: readonly OdometerReading[],
  width: number,
): Map<number, number> {
  const fn = "allocateExposure";
  if (!Array.isArray(readings)) fail(fn, "readings must be an array");
  assertPositiveFinite(fn, "width", width);
  readings.forEach((r, i) => {
    if (!Number.isFinite(readingTime(r?.at))) fail(fn, `readings[${i}].at is not a valid time`);
    assertNonNegativeFinite(fn, `readings[${i}].odometer`, r.odometer);
  });

  const sorted = sortByTime(readings);
  const miles = new Map<number, number>();
  for (let i = 1; i < sorted.length; i++) {
    const from = sorted[i - 1]!.reading.odometer;
    const to = sorted[i]!.reading.odometer;
    if (to < from) {
      fail(fn, "odometer goes backwards in time order; clean readings with cleanOdometerReadings");
    }
    if (to === from) continue;
    for (let band = mileageBand(from, width); band.from < to;) {
      const overlap = Math.min(to, band.to) - Math.max(from, band.from);
      if (overlap > 0) miles.set(band.index, (miles.get(band.index) ?? 0) + overlap);
      const index = band.index + 1;
      band = { index, from: index * width, to: (index + 1) * width };
    }
  }
  return miles;
}
