import { median } from "simple-statistics";
import type { OdometerEvent } from "@/lib/stats/refuel-window-test";

/**
 * Miles since the last fill-up for stall / no-start events, measured exactly as the post-refuel
 * window test measures them (lib/stats/refuel-window-test.ts, statistics.md §7), so that the
 * histogram and the lists show the numbers the test used. Pure.
 */

/** Events further than this from the last fill-up have no fuel data (statistics.md §7). */
export const LOOKBACK_MILES = 1000;

export type FillUpMeasure = {
  /** Miles since the last fill-up at or before the event; null = no fuel data. */
  sinceMi: number | null;
  /**
   * The refuelling interval the event fell in: to the next fill-up, or (none yet) the vehicle's
   * median interval (the fleet's when the vehicle has too few fill-ups), at least sinceMi. Null
   * when no fuel data or no interval can be estimated.
   */
  intervalMi: number | null;
};

/**
 * For each event (same order as given), miles since the vehicle's last fill-up and the
 * refuelling interval it fell in. Follows refuelWindowTest's rules: fill-ups at or before the
 * event's odometer count as "before"; more than 1,000 miles back is no fuel data.
 */
export function measureSinceFillUp(
  events: readonly OdometerEvent[],
  fillUps: readonly OdometerEvent[],
): FillUpMeasure[] {
  const byVehicle = new Map<string | number, number[]>();
  for (const { vehicle, odometer } of fillUps) {
    const list = byVehicle.get(vehicle);
    if (list) list.push(odometer);
    else byVehicle.set(vehicle, [odometer]);
  }
  const medianGap = new Map<string | number, number>();
  const allGaps: number[] = [];
  for (const [vehicle, list] of byVehicle) {
    const sorted = [...new Set(list)].sort((a, b) => a - b);
    byVehicle.set(vehicle, sorted);
    const gaps = sorted.slice(1).map((odometer, i) => odometer - sorted[i]!);
    if (gaps.length > 0) medianGap.set(vehicle, median(gaps));
    allGaps.push(...gaps);
  }
  const fleetGap = allGaps.length > 0 ? median(allGaps) : undefined;

  return events.map(({ vehicle, odometer }) => {
    const sorted = byVehicle.get(vehicle) ?? [];
    let next = 0;
    while (next < sorted.length && sorted[next]! <= odometer) next++;
    const last = next > 0 ? sorted[next - 1]! : undefined;
    if (last === undefined || odometer - last > LOOKBACK_MILES) {
      return { sinceMi: null, intervalMi: null };
    }
    const sinceMi = odometer - last;
    const typical = medianGap.get(vehicle) ?? fleetGap;
    const intervalMi =
      next < sorted.length
        ? sorted[next]! - last
        : typical === undefined
          ? null
          : Math.max(typical, sinceMi);
    return { sinceMi, intervalMi };
  });
}

/** A vehicle's median distance between distinct fill-up odometers; null with fewer than two. */
export function medianRefuelInterval(fillUpOdometers: readonly number[]): number | null {
  const sorted = [...new Set(fillUpOdometers)].sort((a, b) => a - b);
  if (sorted.length < 2) return null;
  return median(sorted.slice(1).map((o, i) => o - sorted[i]!));
}

export type HistogramBin = {
  /** Bin edges in miles, [fromMi, toMi); the last bin is open-ended (toMi = null). */
  fromMi: number;
  toMi: number | null;
  /** Events whose miles since fill-up fall in the bin. */
  observed: number;
  /**
   * Events chance predicts in the bin: each measured event is equally likely anywhere in its
   * refuelling interval (the window test's null hypothesis), so it adds the share of its
   * interval that the bin covers.
   */
  chance: number;
};

/**
 * Histogram of miles since the last fill-up with the count chance predicts per bin. Events with
 * no fuel data or no interval are left out (the caller counts them).
 *
 * @param binMi bin width in miles (> 0)
 * @param maxMi where the open-ended last bin starts (a multiple of binMi is neatest)
 */
export function sinceFillUpHistogram(
  measures: readonly FillUpMeasure[],
  binMi: number,
  maxMi: number,
): HistogramBin[] {
  if (!(binMi > 0) || !(maxMi > 0)) throw new Error("sinceFillUpHistogram: widths must be > 0");
  const count = Math.ceil(maxMi / binMi);
  const bins: HistogramBin[] = Array.from({ length: count + 1 }, (_, i) => ({
    fromMi: i * binMi,
    toMi: i < count ? Math.min((i + 1) * binMi, maxMi) : null,
    observed: 0,
    chance: 0,
  }));
  for (const m of measures) {
    if (m.sinceMi === null || m.intervalMi === null) continue;
    const index = Math.min(count, Math.floor(m.sinceMi / binMi));
    bins[index]!.observed++;
    if (m.intervalMi <= 0) {
      bins[0]!.chance++;
      continue;
    }
    for (const bin of bins) {
      const from = Math.min(bin.fromMi, m.intervalMi);
      const to = Math.min(bin.toMi ?? Infinity, m.intervalMi);
      bin.chance += (to - from) / m.intervalMi;
    }
  }
  return bins;
}
