/**
 * Odometer plausibility per vehicle while reading a file: each reading is judged against the
 * vehicle's other readings by date, and a doubtful one is a warning on its row, never a
 * rejection (pump-keyed odometers are noisy, common practice). The row is imported; the
 * exposure calculation leaves such readings out (lib/stats/clean-odometer-readings.ts: the
 * same 1,500 mi a day, any backwards step, a tenfold jump) and counts them as "readings
 * ignored", and the vehicle page marks them doubtful.
 *
 * A reading is doubtful when it is
 * - more than 20% or 10,000 mi (whichever is larger) below an earlier-dated reading;
 * - more than 1,500 mi a day away from the reading dated just before or just after it (a gap
 *   under a day counts as a day);
 * - about ten times the reading before it (a digit typed twice), or about 1.609 times it
 *   within a month (kilometres keyed as miles).
 * Thresholds are Recurra's own, in miles, the unit readings are stored in.
 *
 * What a reading is judged against: the vehicle's stored last reading (the latest-dated one,
 * db/queries/last-odometer.ts) and the readings of this file so far that were not doubtful
 * themselves (so one typo does not cast doubt on every correct reading after it). Older stored
 * readings are not loaded: memory stays at about 16 bytes per distinct reading of the file
 * (repeats of a day and value, such as the lines of one repair order, are kept once), and at
 * most MAX_READINGS per vehicle: past that its oldest half is folded into a summary (the
 * latest day and the highest value among them), and readings dated before that day are no
 * longer judged.
 */

/** One limit for the warning and for the exposure (lib/stats/clean-odometer-readings.ts). */
import { MAX_MILES_PER_DAY } from "@/lib/stats/clean-odometer-readings";
const BACKWARDS_SHARE = 0.2;
const BACKWARDS_MILES = 10_000;
const KM_AS_MILES = 1.609344;
/** Readings remembered per vehicle (also bounds the cost of inserting out of date order). */
export const MAX_READINGS = 4_096;

const digit = (s: string, i: number) => s.charCodeAt(i) - 48;

/**
 * Days since 1970-01-01 of a checked ISO date (`YYYY-MM-DD…`), by the days-from-civil
 * arithmetic of the proleptic Gregorian calendar (H. Hinnant, "chrono-compatible low-level
 * date algorithms"): called for every row, so no Date objects or string building.
 */
export function dayNumber(iso: string): number {
  const y0 = digit(iso, 0) * 1000 + digit(iso, 1) * 100 + digit(iso, 2) * 10 + digit(iso, 3);
  const m = digit(iso, 5) * 10 + digit(iso, 6);
  const d = digit(iso, 8) * 10 + digit(iso, 9);
  const y = m <= 2 ? y0 - 1 : y0;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146_097 + doe - 719_468;
}

/** The ISO date of a day number (only for messages). */
const isoDay = (day: number) => new Date(day * 86_400_000).toISOString().slice(0, 10);

const fmt = (n: number) => Math.round(n).toLocaleString("en-GB");

/** One vehicle's remembered readings, in date order, with the highest so far at each. */
class Readings {
  days = new Int32Array(4);
  miles = new Float64Array(4);
  /** Index of the highest reading among 0..i. */
  highest = new Int32Array(4);
  n = 0;
  /** The folded-away oldest readings: their latest day, and their highest reading and its day. */
  floor: { day: number; mi: number; maxMi: number; maxDay: number } | null = null;

  /** The first index whose day is above `day` (`orEqual`: at or above). */
  after(day: number, orEqual = false): number {
    let lo = 0;
    let hi = this.n;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      const d = this.days[mid] as number;
      if (d > day || (orEqual && d === day)) hi = mid;
      else lo = mid + 1;
    }
    return lo;
  }

  insert(at: number, day: number, mi: number): void {
    if (this.n === MAX_READINGS) {
      at -= this.fold();
      if (at < 0) return;
    }
    if (this.n === this.days.length) {
      const grow = <T extends Int32Array | Float64Array>(a: T): T => {
        const b = new (a.constructor as new (n: number) => T)(a.length * 2);
        b.set(a);
        return b;
      };
      this.days = grow(this.days);
      this.miles = grow(this.miles);
      this.highest = grow(this.highest);
    }
    this.days.copyWithin(at + 1, at, this.n);
    this.miles.copyWithin(at + 1, at, this.n);
    this.days[at] = day;
    this.miles[at] = mi;
    this.n++;
    this.rank(at);
  }

  /** Folds the oldest half into `floor`; returns how many readings went. */
  private fold(): number {
    const half = this.n >> 1;
    const top = this.highest[half - 1] as number;
    const maxMi = this.miles[top] as number;
    const floor = this.floor;
    const isHigher = !floor || maxMi >= floor.maxMi;
    this.floor = {
      day: this.days[half - 1] as number,
      mi: this.miles[half - 1] as number,
      maxMi: isHigher ? maxMi : floor.maxMi,
      maxDay: isHigher ? (this.days[top] as number) : floor.maxDay,
    };
    this.days.copyWithin(0, half, this.n);
    this.miles.copyWithin(0, half, this.n);
    this.n -= half;
    this.rank(0);
    return half;
  }

  /** Recomputes `highest` from index `from` on. */
  private rank(from: number): void {
    for (let i = from; i < this.n; i++) {
      const prev = i === 0 ? -1 : (this.highest[i - 1] as number);
      this.highest[i] =
        prev >= 0 && (this.miles[prev] as number) > (this.miles[i] as number) ? prev : i;
    }
  }
}

export class OdometerChecks {
  private readonly vehicles = new Map<string, Readings>();

  private of(vehicleKey: string): Readings {
    let r = this.vehicles.get(vehicleKey);
    if (!r) this.vehicles.set(vehicleKey, (r = new Readings()));
    return r;
  }

  /** Seeds a vehicle's stored last reading (the latest-dated one). */
  seed(vehicleKey: string, on: string | null, mi: number | null): void {
    if (!on || mi === null) return;
    const r = this.of(vehicleKey);
    const day = dayNumber(on);
    r.insert(r.after(day), day, mi);
  }

  /** Returns a warning for this reading, or null; remembers the reading unless doubtful. */
  check(vehicleKey: string, on: string, mi: number): string | null {
    const r = this.of(vehicleKey);
    const day = dayNumber(on);
    if (r.floor && day <= r.floor.day) return null; // older than what is remembered
    const at = r.after(day);
    // The same day and value again (another line of one repair order): already judged.
    if (at > 0 && r.days[at - 1] === day && r.miles[at - 1] === mi) return null;
    const warning = judge(r, at, day, on, mi);
    if (!warning) r.insert(at, day, mi);
    return warning;
  }
}

function judge(r: Readings, at: number, day: number, on: string, mi: number): string | null {
  // The highest reading dated before this day.
  const before = r.after(day, true);
  let maxMi = -1;
  let maxDay = 0;
  if (before > 0) {
    const top = r.highest[before - 1] as number;
    maxMi = r.miles[top] as number;
    maxDay = r.days[top] as number;
  }
  if (r.floor && r.floor.maxMi > maxMi) ({ maxMi, maxDay } = r.floor);
  if (maxMi >= 0 && maxMi - mi > Math.max(BACKWARDS_SHARE * maxMi, BACKWARDS_MILES)) {
    return `odometer goes backwards: ${fmt(mi)} mi on ${on}, below ${fmt(maxMi)} mi on ${isoDay(maxDay)}`;
  }
  // The neighbours by date: the reading just before (or on) this day, and the one just after.
  const prev =
    at > 0
      ? { day: r.days[at - 1] as number, mi: r.miles[at - 1] as number }
      : r.floor && { day: r.floor.day, mi: r.floor.mi };
  const next = at < r.n ? { day: r.days[at] as number, mi: r.miles[at] as number } : null;
  if (prev) {
    const days = Math.max(1, day - prev.day);
    if (prev.mi >= 1_000 && mi >= prev.mi * 9) {
      return `odometer jumps by an order of magnitude: ${fmt(mi)} mi after ${fmt(prev.mi)} mi on ${isoDay(prev.day)}`;
    }
    if (prev.mi >= 1_000 && days <= 31 && Math.abs(mi / prev.mi - KM_AS_MILES) < 0.02) {
      return `odometer is about 1.609 × the reading of ${isoDay(prev.day)} (${fmt(prev.mi)} mi): kilometres keyed as miles?`;
    }
    if ((mi - prev.mi) / days > MAX_MILES_PER_DAY) {
      return `odometer implies ${fmt((mi - prev.mi) / days)} mi a day since ${fmt(prev.mi)} mi on ${isoDay(prev.day)}`;
    }
  }
  if (next) {
    const days = Math.max(1, next.day - day);
    if ((next.mi - mi) / days > MAX_MILES_PER_DAY) {
      return `odometer implies ${fmt((next.mi - mi) / days)} mi a day until ${fmt(next.mi)} mi on ${isoDay(next.day)}`;
    }
  }
  return null;
}
