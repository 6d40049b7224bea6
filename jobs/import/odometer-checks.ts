/**
 * Odometer sanity per vehicle while reading a file: readings going backwards, a jump of an
 * order of magnitude, an implausible daily distance, or a reading about 1.609 times the last
 * one (kilometres keyed as miles). These are warnings, never rejections: pump-keyed odometers
 * are noisy (common practice) and the exposure calculation drops implausible readings itself.
 */
type Last = { on: string; mi: number };

const MAX_MILES_PER_DAY = 1_500;
const KM_AS_MILES = 1.609344;

function daysBetween(a: string, b: string): number {
  return (
    (Date.parse(`${b.slice(0, 10)}T00:00:00Z`) - Date.parse(`${a.slice(0, 10)}T00:00:00Z`)) /
    86_400_000
  );
}

export class OdometerChecks {
  /** Latest-dated reading per vehicle in the file so far. */
  private readonly last = new Map<string, Last>();
  /** Latest reading per vehicle already in the database, used until the file has one. */
  private readonly known = new Map<string, Last>();

  /** Seeds a vehicle's latest known reading from the database. */
  seed(vehicleKey: string, on: string | null, mi: number | null): void {
    if (on && mi !== null) this.known.set(vehicleKey, { on, mi });
  }

  /** Returns a warning for this reading, or null; remembers plausible readings. */
  check(vehicleKey: string, on: string, mi: number): string | null {
    const prev = this.last.get(vehicleKey) ?? this.known.get(vehicleKey);
    if (!prev) {
      this.last.set(vehicleKey, { on, mi });
      return null;
    }
    const days = daysBetween(prev.on, on);
    const fmt = (n: number) => Math.round(n).toLocaleString("en-GB");
    let warning: string | null = null;
    if (days < 0) {
      // An older reading than the latest known: only remembered when the file has none yet.
      if (!this.last.has(vehicleKey)) this.last.set(vehicleKey, { on, mi });
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
    if (!warning) this.last.set(vehicleKey, { on, mi });
    return warning;
  }
}
