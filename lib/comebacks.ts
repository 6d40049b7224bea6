/**
 * Comebacks: the same vehicle back for the same fault within a window after a repair
 * (trade usage, common practice; Recurra's default window is 30 days or 3,000 mi). Pure: the caller picks the lines of one fault.
 */
export type RepairVisit = {
  id: number;
  vehicleId: number;
  /** ISO date (YYYY-MM-DD). */
  openedOn: string;
  odometerMi: number | null;
};

export type ComebackWindow = { days: number; miles: number };

export type Comeback = {
  first: RepairVisit;
  again: RepairVisit;
  days: number;
  miles: number | null;
};

const DAY_MS = 86_400_000;

/**
 * Pairs each repair with the next repair of the same vehicle when the next one falls inside the
 * window: at most `days` days later, or at most `miles` further on the odometer (either is
 * enough). Lines on the same day are one visit, not a comeback; each visit is the "first" of at
 * most one pair.
 */
export function findComebacks(visits: RepairVisit[], window: ComebackWindow): Comeback[] {
  const byVehicle = new Map<number, RepairVisit[]>();
  for (const v of visits) {
    const list = byVehicle.get(v.vehicleId) ?? [];
    list.push(v);
    byVehicle.set(v.vehicleId, list);
  }
  const out: Comeback[] = [];
  for (const list of byVehicle.values()) {
    list.sort((a, b) => a.openedOn.localeCompare(b.openedOn) || a.id - b.id);
    // Lines opened the same day belong to one visit: keep the first of each day.
    const daily = list.filter((v, i) => i === 0 || v.openedOn !== list[i - 1]!.openedOn);
    for (let i = 0; i < daily.length - 1; i++) {
      const first = daily[i]!;
      const again = daily[i + 1]!;
      const days = Math.round((Date.parse(again.openedOn) - Date.parse(first.openedOn)) / DAY_MS);
      const miles =
        first.odometerMi !== null && again.odometerMi !== null
          ? again.odometerMi - first.odometerMi
          : null;
      const withinDays = days <= window.days;
      const withinMiles = miles !== null && miles >= 0 && miles <= window.miles;
      if (withinDays || withinMiles) out.push({ first, again, days, miles });
    }
  }
  return out;
}
