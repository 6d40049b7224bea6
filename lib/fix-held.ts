/**
 * "How often the fix held", one definition for every screen (the known issue, the lookup, and
 * later the digest and the comebacks screen):
 *
 * - the repairs of a fault are the failure lines of its component or of any of its DTCs (in the
 *   cohorts the caller read the lines of), one visit per vehicle and day;
 * - a repair held unless the same vehicle came back for the same fault within the
 *   organisation's comeback window (days, or distance: either is enough; lib/comebacks.ts);
 * - the share that held comes with its Wilson score interval (Wilson 1927) at the
 *   organisation's confidence.
 *
 * Pure; the data layer's reader is db/queries/fix-held.ts.
 */
import { findComebacks, type ComebackWindow, type RepairVisit } from "./comebacks";
import type { ComponentKind } from "./component-kinds";
import { describeShare, formatPercent, formatPlain, intervalLabel } from "./plain-words";
import { wilsonInterval } from "./stats";
import { milesToUnit } from "./units";

/** What was repaired: a component (slug), DTCs, or both. */
export type FixFault = { component: string | null; dtcs: readonly string[] };

/** A repair line as the definition reads it. */
export type FixLine = RepairVisit & {
  /** failure, wear or service: only failure lines are repairs of a fault. */
  kind: ComponentKind;
  componentSlug: string | null;
  codes: readonly string[];
};

export type FixHeld = {
  /** Visits (vehicle and day) that repaired the fault. */
  fixes: number;
  /** Those not followed by a comeback within the window. */
  held: number;
  comebacks: number;
  /** held / fixes and its Wilson interval at `confidence`. */
  estimate: number;
  lower: number;
  upper: number;
  confidence: number;
  /** The comeback window, in days and miles. */
  window: ComebackWindow;
};

/** Whether a line repaired the fault: a failure line of its component or of one of its DTCs. */
export function isRepairOf(line: Omit<FixLine, keyof RepairVisit>, fault: FixFault): boolean {
  if (line.kind !== "failure") return false;
  if (fault.component !== null && line.componentSlug === fault.component) return true;
  return line.codes.some((c) => fault.dtcs.includes(c));
}

/**
 * How often the fix of a fault held, over the lines given (the caller picks the cohorts). Null
 * when no line repaired the fault.
 */
export function fixHeld(
  lines: readonly FixLine[],
  fault: FixFault,
  window: ComebackWindow,
  confidence: number,
): FixHeld | null {
  const visits: RepairVisit[] = lines
    .filter((l) => isRepairOf(l, fault))
    .map((l) => ({
      id: l.id,
      vehicleId: l.vehicleId,
      openedOn: l.openedOn,
      odometerMi: l.odometerMi,
    }));
  const fixes = new Set(visits.map((v) => `${v.vehicleId}|${v.openedOn}`)).size;
  if (fixes === 0) return null;
  // Each visit is the first of at most one comeback pair (findComebacks).
  const comebacks = findComebacks(visits, window).length;
  const held = fixes - comebacks;
  return {
    fixes,
    held,
    comebacks,
    ...wilsonInterval(held, fixes, confidence),
    confidence,
    window,
  };
}

/** The window as people say it: "30 days or 3,000 mi". */
export function describeWindow(window: ComebackWindow, unit: "mi" | "km"): string {
  return `${window.days} days or ${formatPlain(Math.round(milesToUnit(window.miles, unit)))} ${unit}`;
}

/**
 * The figure in words: "The fix held in 35 of 36 repairs (97%), likely between 88% and 99%;
 * 1 came back within 30 days or 3,000 mi." Without repairs: says so.
 */
export function describeFixHeld(f: FixHeld | null, unit: "mi" | "km"): string {
  if (!f) return "No repairs of this fault on record yet.";
  const share = describeShare({
    count: f.held,
    of: f.fixes,
    lower: f.lower,
    upper: f.upper,
    noun: ["repair"],
  });
  return `The fix held in ${share}; ${f.comebacks} came back within ${describeWindow(f.window, unit)}.`;
}

/** The method and exact figures, one click away. */
export function fixHeldDetails(f: FixHeld, unit: "mi" | "km"): [string, string][] {
  return [
    [
      "Repairs counted",
      "Failure lines of this fault's component or any of its codes, in its cohorts, one visit per vehicle and day",
    ],
    [
      "Came back",
      `The same vehicle back for the same fault within ${describeWindow(f.window, unit)}`,
    ],
    ["Held", `${f.held} of ${f.fixes} (${formatPercent(f.estimate)})`],
    [
      intervalLabel(f.confidence),
      `${(f.lower * 100).toFixed(1)}% to ${(f.upper * 100).toFixed(1)}%`,
    ],
    ["Method", "Wilson score interval (Wilson 1927)"],
  ];
}
