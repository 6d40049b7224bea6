import { readingTime, sortByTime, type OdometerReading } from "./internal/readings";
import { fail } from "./internal/validate";

export interface CleanedReadings<T extends OdometerReading> {
  /** The readings kept, sorted by time (the caller's objects, not copies). */
  kept: T[];
  /** How many readings were dropped. */
  ignored: number;
}

/**
 * Fastest plausible average speed between two kept readings, miles a day: the same limit the
 * import warns at (jobs/import/odometer-checks.ts), so a reading warned about is one the
 * exposure leaves out.
 */
export const MAX_MILES_PER_DAY = 1_500;
/** A reading at least this many times the previous kept one is an order-of-magnitude jump… */
const JUMP_FACTOR = 10;
/** …when the previous kept one is at least this high (new vehicles legitimately grow ×10). */
const JUMP_FROM_MILES = 1000;
const DAY_MS = 86_400_000;
/** How far ahead a chain may skip: more than this many bad readings in a row are not bridged. */
const LOOKAHEAD = 64;

/**
 * Drop one vehicle's implausible odometer readings before they are turned into exposure.
 *
 * Rule: a reading with an invalid time or an odometer that is not a finite number ≥ 0 is
 * dropped. Of the rest, taken in time order, the largest set is kept in which every kept
 * reading, compared with the kept reading before it,
 *   1. does not go backwards (odometer not lower),
 *   2. implies at most 1,500 miles a day (a gap shorter than one day counts as one day, so
 *      same-day readings may differ by up to 1,500 miles), and
 *   3. is not an order-of-magnitude jump: not 10 or more times the previous kept reading when
 *      that one is at least 1,000 miles (a digit typed twice).
 * Keeping the largest consistent set, rather than comparing each reading with the one before
 * it, means one wrong high reading is dropped instead of every correct reading after it. When
 * two sets are equally large, the one keeping earlier readings wins (so of two readings that
 * disagree, the later, backwards one is dropped).
 *
 * Method: longest-chain dynamic programme over the time-ordered readings. A chain may skip at
 * most 63 readings in a row (LOOKAHEAD): that bounds the work to O(64·n) for n readings of one
 * vehicle, so a vehicle with years of daily telematics readings costs milliseconds, while any
 * realistic run of bad readings (a stuck or mistyped meter for dozens of fill-ups) is bridged.
 *
 * Source: common practice in fleet telematics data cleaning; the thresholds are Recurra's
 * choices, stated here and on screen as "readings ignored".
 *
 * @param readings one vehicle's readings `{ at, odometer }`, any order; not modified
 * @returns kept readings sorted by time, and the number ignored
 * @throws Error "cleanOdometerReadings: readings must be an array" when it is not an array
 * @example
 * cleanOdometerReadings([
 *   { at: "2024-01-01", odometer: 45_000 },
 *   { at: "2024-02-01", odometer: 450_000 }, // typo: ×10
 *   { at: "2024-03-01", odometer: 47_100 },
 * ]); // kept: the 45,000 and 47,100 readings, ignored: 1
 */
export function cleanOdometerReadings<T extends OdometerReading>(
  readings: readonly T[],
): CleanedReadings<T> {
  const fn = "cleanOdometerReadings";
  if (!Array.isArray(readings)) fail(fn, "readings must be an array");

  const valid = sortByTime(
    readings.filter(
      (r) =>
        Number.isFinite(readingTime(r?.at)) &&
        typeof r.odometer === "number" &&
        Number.isFinite(r.odometer) &&
        r.odometer >= 0,
    ),
  );
  const n = valid.length;
  const fits = (i: number, j: number): boolean => {
    const a = valid[i]!;
    const b = valid[j]!;
    const miles = b.reading.odometer - a.reading.odometer;
    const days = Math.max(1, (b.time - a.time) / DAY_MS);
    const isJump =
      a.reading.odometer >= JUMP_FROM_MILES &&
      b.reading.odometer >= JUMP_FACTOR * a.reading.odometer;
    return miles >= 0 && miles <= MAX_MILES_PER_DAY * days && !isJump;
  };

  // chain[i] = length of the longest consistent chain starting at reading i.
  const chain = new Array<number>(n).fill(1);
  for (let i = n - 2; i >= 0; i--) {
    for (let j = i + 1; j < n && j <= i + LOOKAHEAD; j++) {
      if (chain[j]! + 1 > chain[i]! && fits(i, j)) chain[i] = chain[j]! + 1;
    }
  }
  const kept: T[] = [];
  let length = chain.reduce((longest, value) => Math.max(longest, value), 0);
  let previous = -1;
  for (let i = 0; i < n && length > 0; i++) {
    if (chain[i] === length && (previous < 0 || fits(previous, i))) {
      kept.push(valid[i]!.reading);
      previous = i;
      length--;
    }
  }
  return { kept, ignored: readings.length - kept.length };
}
