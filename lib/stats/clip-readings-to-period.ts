import { readingTime, sortByTime, type OdometerReading } from "./internal/readings";
import { assertNonNegativeFinite, fail } from "./internal/validate";

/**
 * One vehicle's odometer readings restricted to a period, for exposure within that period
 * (allocateExposure on the result counts only the miles driven between `from` and `to`).
 *
 * Definition: readings are sorted by time. Readings inside [from, to] are kept. Where two
 * consecutive readings straddle `from` (or `to`), a reading is added at `from` (or `to`) with
 * the odometer interpolated linearly in time between them: the vehicle is taken to have driven
 * at an even pace between two readings. Nothing is extrapolated before the first reading or
 * after the last one: an unobserved stretch adds no miles.
 *
 * Returns `{ at, odometer }` readings with `at` in epoch milliseconds, in time order.
 *
 * Source: common practice (linear interpolation of a cumulative count between observations,
 * as in person-time at risk split at calendar boundaries in life tables).
 *
 * @param readings one vehicle's readings, any order, cleaned (odometer not going backwards)
 * @param from start of the period, epoch ms or ISO date (null: no start)
 * @param to end of the period, epoch ms or ISO date (null: no end)
 * @throws Error "clipReadingsToPeriod: …" when a time is invalid, an odometer is not a finite
 *   number ≥ 0, or `from` is after `to`
 * @example
 * clipReadingsToPeriod(
 *   [{ at: "2024-01-01", odometer: 10_000 }, { at: "2024-01-11", odometer: 11_000 }],
 *   "2024-01-06", null,
 * ); // [{ at: Date.parse("2024-01-06"), odometer: 10_500 }, { at: Date.parse("2024-01-11"), odometer: 11_000 }]
 */
export function clipReadingsToPeriod(
  readings: readonly OdometerReading[],
  from: string | number | null,
  to: string | number | null,
): { at: number; odometer: number }[] {
  const fn = "clipReadingsToPeriod";
  const start = from === null ? -Infinity : readingTime(from);
  const end = to === null ? Infinity : readingTime(to);
  if (Number.isNaN(start) || Number.isNaN(end)) fail(fn, "from and to must be valid times");
  if (start > end) fail(fn, "from is after to");
  readings.forEach((r, i) => {
    if (!Number.isFinite(readingTime(r?.at))) fail(fn, `readings[${i}].at is not a valid time`);
    assertNonNegativeFinite(fn, `readings[${i}].odometer`, r.odometer);
  });
  const sorted = sortByTime(readings);
  const at = (a: { time: number; reading: OdometerReading }, b: typeof a, t: number) =>
    b.time === a.time
      ? b.reading.odometer
      : a.reading.odometer +
        ((b.reading.odometer - a.reading.odometer) * (t - a.time)) / (b.time - a.time);
  const out: { at: number; odometer: number }[] = [];
  for (let i = 0; i < sorted.length; i++) {
    const cur = sorted[i]!;
    const prev = i > 0 ? sorted[i - 1]! : null;
    if (prev && prev.time < start && cur.time > start) {
      out.push({ at: start, odometer: at(prev, cur, start) });
    }
    if (cur.time >= start && cur.time <= end) {
      out.push({ at: cur.time, odometer: cur.reading.odometer });
    }
    if (prev && prev.time < end && cur.time > end) {
      out.push({ at: end, odometer: at(prev, cur, end) });
    }
  }
  return out;
}
