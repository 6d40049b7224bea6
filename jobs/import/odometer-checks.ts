/**
 * Odometer sanity per vehicle while reading a file: readings going backwards, a jump of an
 * order of magnitude, an implausible daily distance, or a reading about 1.609 times the last
 * one (kilometres keyed as miles). These are warnings, never rejections: pump-keyed odometers
 * are noisy (common practice) and the exposure calculation drops implausible readings itself.
 */
type Last = { on: string; day: number; mi: number };

const MAX_MILES_PER_DAY = 1_500;
const KM_AS_MILES = 1.609344;

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

const fmt = (n: number) => Math.round(n).toLocaleString("en-GB");

export class OdometerChecks {
  /** Latest-dated reading per vehicle in the file so far. */
  private readonly last = new Map<string, Last>();
  /** Latest reading per vehicle already in the database, used until the file has one. */
  private readonly known = new Map<string, Last>();

  /** Seeds a vehicle's latest known reading from the database. */
  seed(vehicleKey: string, on: string | null, mi: number | null): void {
    if (on && mi !== null) this.known.set(vehicleKey, { on, day: dayNumber(on), mi });
  }

  /** Returns a warning for this reading, or null; remembers plausible readings. */
  check(vehicleKey: string, on: string, mi: number): string | null {
    const prev = this.last.get(vehicleKey) ?? this.known.get(vehicleKey);
    const day = dayNumber(on);
    if (!prev) {
      this.last.set(vehicleKey, { on, day, mi });
      return null;
    }
    const days = day - prev.day;
    let warning: string | null = null;
    if (days < 0) {
      // An older reading than the latest known: only remembered when the file has none yet.
      if (!this.last.has(vehicleKey)) this.last.set(vehicleKey, { on, day, mi });
      return null;
    }
    if (mi < prev.mi - 5) {
      warning = `odometer goes backwards: ${fmt(mi)} mi on ${on} after ${fmt(prev.mi)} mi on ${prev.on}`;
    } else if (prev.mi >= 1_000 && mi >= prev.mi * 9) {
      warning = `odometer jumps by an order of magnitude: ${fmt(mi)} mi after ${fmt(prev.mi)} mi`;
    } else if (prev.mi >= 1_000 && days <= 31 && Math.abs(mi / prev.mi - KM_AS_MILES) < 0.02) {
      warning = `odometer is about 1.609 × the last reading (${fmt(prev.mi)} mi): kilometres keyed as miles?`;
    } else if (days > 0 && (mi - prev.mi) / days > MAX_MILES_PER_DAY) {
      warning = `odometer implies ${fmt((mi - prev.mi) / days)} mi a day since ${prev.on}`;
    }
    if (!warning) this.last.set(vehicleKey, { on, day, mi });
    return warning;
  }
}
