import {
  benjaminiHochberg,
  gammaPoissonShrinkage,
  poissonInterval,
  rateRatio,
  wilsonInterval,
} from "@/lib/stats";
import { ANALYSED_KINDS, type ComponentKind } from "@/lib/component-kinds";
import type { Cohort } from "./cohorts";
import type { EventCount } from "./events";
import type { BandExposure } from "./exposure";

export type CellStat = {
  cohort: Cohort;
  band: number;
  bandFromMi: number;
  bandToMi: number;
  faultKey: string;
  /**
   * failure or wear: the lines counted, and the family of the false-discovery control; service
   * for the stocking planner's service rates (never tested).
   */
  kind: ComponentKind;
  dtc: string | null;
  componentId: number | null;
  events: number;
  exposureMi: number;
  vehiclesAtRisk: number;
  vehiclesAffected: number;
  /** Per 10,000 miles, exact (Garwood) limits. Null without exposure. */
  ratePer10k: number | null;
  rateLower: number | null;
  rateUpper: number | null;
  /** Share of vehicles at risk that had the fault in the band, Wilson limits. */
  shareAffected: number | null;
  shareLower: number | null;
  shareUpper: number | null;
  /** Against the rest of the fleet in the same band; null when there is no rest to compare. */
  rateRatio: number | null;
  ratioLower: number | null;
  ratioUpper: number | null;
  pValue: number | null;
  /** Benjamini–Hochberg adjusted p-value over the tested cells of the run of the same kind. */
  qValue: number | null;
  shrunkRatePer10k: number | null;
  /** The rate's gamma posterior: shape and rate (miles), null without shrinkage. */
  posteriorShape: number | null;
  posteriorExposureMi: number | null;
  isSignal: boolean;
  hasTooLittleData: boolean;
};

export type CellInput = {
  cohorts: Map<string, Cohort>;
  exposure: Map<string, Map<number, BandExposure>>;
  counts: EventCount[];
  bandWidthMi: number;
  confidence: number;
  /** Cells with less exposure are "too little data": not tested, never signals. */
  minExposureMi: number;
  /** False discovery rate for signals (statistics.md: 0.05). */
  fdr?: number;
  /** A signal needs at least this many events (statistics.md: 3). */
  minEvents?: number;
};

const PER = 10_000;
const finite = (v: number): number | null => (Number.isFinite(v) ? v : null);

/**
 * Statistics of every cohort × mileage band × fault cell (statistics.md): exact Poisson rate,
 * Wilson share of vehicles affected, exact rate ratio against the rest of the fleet in the same
 * band, Benjamini–Hochberg q over the tested cells of the same kind (failure or wear), gamma–Poisson shrunk rate (prior fitted per
 * fault across its cells) and the signal rule: q ≤ 0.05, ratio lower bound > 1, ≥ 3 events,
 * enough exposure. For each fault, every cohort with exposure in a band where the fault
 * occurred gets a cell, so a zero shows as a zero with its interval, not as a gap.
 */
export function computeCells(input: CellInput): CellStat[] {
  const fdr = input.fdr ?? 0.05;
  const minEvents = input.minEvents ?? 3;
  // Band totals of exposure over all cohorts.
  const bandExposure = new Map<number, number>();
  for (const bands of input.exposure.values()) {
    for (const [band, e] of bands) bandExposure.set(band, (bandExposure.get(band) ?? 0) + e.miles);
  }
  // Events by fault → band → cohort.
  const byFault = new Map<
    string,
    {
      kind: ComponentKind;
      dtc: string | null;
      componentId: number | null;
      bands: Map<number, Map<string, EventCount>>;
    }
  >();
  for (const c of input.counts) {
    let f = byFault.get(c.faultKey);
    if (!f)
      byFault.set(
        c.faultKey,
        (f = { kind: c.kind, dtc: c.dtc, componentId: c.componentId, bands: new Map() }),
      );
    let band = f.bands.get(c.band);
    if (!band) f.bands.set(c.band, (band = new Map()));
    band.set(c.cohortKey, c);
  }

  const cells: CellStat[] = [];
  for (const [faultKey, fault] of byFault) {
    const faultCells: CellStat[] = [];
    for (const [band, cohortsWithEvents] of fault.bands) {
      const totalEvents = [...cohortsWithEvents.values()].reduce((s, c) => s + c.events, 0);
      const totalExposure = bandExposure.get(band) ?? 0;
      const keys = new Set([...cohortsWithEvents.keys()]);
      for (const [key, bands] of input.exposure) if (bands.has(band)) keys.add(key);
      for (const key of keys) {
        const cohort = input.cohorts.get(key);
        if (!cohort) continue;
        const counted = cohortsWithEvents.get(key);
        const events = counted?.events ?? 0;
        const exp = input.exposure.get(key)?.get(band);
        const exposureMi = exp?.miles ?? 0;
        const atRisk = Math.max(exp?.vehicles ?? 0, counted?.vehiclesAffected ?? 0);
        const affected = counted?.vehiclesAffected ?? 0;
        const hasTooLittleData = exposureMi < Math.max(input.minExposureMi, 1e-9);
        const cell: CellStat = {
          cohort,
          band,
          bandFromMi: band * input.bandWidthMi,
          bandToMi: (band + 1) * input.bandWidthMi,
          faultKey,
          kind: fault.kind,
          dtc: fault.dtc,
          componentId: fault.componentId,
          events,
          exposureMi,
          vehiclesAtRisk: atRisk,
          vehiclesAffected: affected,
          ratePer10k: null,
          rateLower: null,
          rateUpper: null,
          shareAffected: null,
          shareLower: null,
          shareUpper: null,
          rateRatio: null,
          ratioLower: null,
          ratioUpper: null,
          pValue: null,
          qValue: null,
          shrunkRatePer10k: null,
          posteriorShape: null,
          posteriorExposureMi: null,
          isSignal: false,
          hasTooLittleData,
        };
        if (exposureMi > 0) {
          const rate = poissonInterval(events, exposureMi, input.confidence);
          cell.ratePer10k = rate.rate * PER;
          cell.rateLower = rate.lower * PER;
          cell.rateUpper = rate.upper * PER;
          const restExposure = totalExposure - exposureMi;
          if (restExposure > 0) {
            const rr = rateRatio(
              events,
              exposureMi,
              totalEvents - events,
              restExposure,
              input.confidence,
            );
            cell.rateRatio = finite(rr.ratio);
            cell.ratioLower = finite(rr.lower);
            cell.ratioUpper = finite(rr.upper);
            cell.pValue = finite(rr.pValue);
          }
        }
        if (atRisk > 0) {
          const share = wilsonInterval(affected, atRisk, input.confidence);
          cell.shareAffected = share.estimate;
          cell.shareLower = share.lower;
          cell.shareUpper = share.upper;
        }
        faultCells.push(cell);
      }
    }
    // Empirical Bayes per fault: cells borrow strength from the same fault's other cells.
    const withExposure = faultCells.filter((c) => c.exposureMi > 0);
    if (withExposure.length > 0) {
      const shrunk = gammaPoissonShrinkage(
        withExposure.map((c) => ({ events: c.events, exposure: c.exposureMi })),
        input.confidence,
      );
      withExposure.forEach((c, i) => {
        const s = shrunk.cells[i];
        if (s) c.shrunkRatePer10k = s.mean * PER;
        // The posterior itself, for intervals on what the rate predicts (lib/at-risk.ts).
        c.posteriorShape = shrunk.alpha + c.events;
        c.posteriorExposureMi = shrunk.beta + c.exposureMi;
      });
    }
    cells.push(...faultCells);
  }

  // One false-discovery correction per kind over every fault cell of that kind that was tested
  // (the "all faults" totals are a summary, not a hypothesis, and stay out of the count): the
  // failure analysis and the wear analysis are separate families, so adding wear lines never
  // moves a failure signal.
  for (const kind of ANALYSED_KINDS) {
    const tested = cells.filter(
      (c) =>
        c.kind === kind &&
        !c.faultKey.startsWith("all") &&
        !c.hasTooLittleData &&
        c.pValue !== null,
    );
    if (tested.length === 0) continue;
    const { adjusted } = benjaminiHochberg(
      tested.map((c) => c.pValue as number),
      fdr,
    );
    tested.forEach((c, i) => {
      c.qValue = adjusted[i] ?? null;
      c.isSignal = (c.qValue ?? 1) <= fdr && (c.ratioLower ?? 0) > 1 && c.events >= minEvents;
    });
  }
  return cells;
}
