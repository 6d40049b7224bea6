/**
 * "How often the fix held", one definition for every screen (the known issue, the lookup, and
 * later the digest and the comebacks screen):
 *
 * - the repairs of a fault are the failure lines of its component or of any of its DTCs (in the
 *   cohorts the caller read the lines of), one visit per vehicle and day;
 * - a repair held unless the same vehicle came back for the same fault within the
 *   organisation's comeback window (days, or distance: either is enough; lib/comebacks.ts);
 * - a repair less than the window's days before `asOf` (the organisation's latest repair on
 *   record) may still come back: it is left out and counted (stillOpen), as on the comebacks
 *   screen, so a recent repair never counts as held before its window has passed;
 * - the share that held comes with its Wilson score interval (Wilson 1927) at the
 *   organisation's confidence.
 *
 * The comebacks screen's per-fault rows and the digest's comebacks read this function too:
 * their share that came back is comebacks / fixes of the same figure.
 *
 * Null when nothing repaired the fault; `fixes` 0 when every repair is still open.
 *
 * Pure; the data layer's reader is db/queries/fix-held.ts.
 */
import { findComebacks, type Comeback, type ComebackWindow, type RepairVisit } from "./comebacks";
import type { ComponentKind } from "./component-kinds";
import { countOf, describeShare, formatPercent, formatPlain, intervalLabel } from "./plain-words";
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

/** The organisation's comeback window and confidence, and the day its records end. */
export type FixHeldSettings = {
  window: ComebackWindow;
  confidence: number;
  /** The latest repair on record (ISO date); null: no repair is left out as still open. */
  asOf: string | null;
};

export type FixHeld = {
  /** Visits (vehicle and day) that repaired the fault, their window passed. */
  fixes: number;
  /** Visits left out: less than the window's days before the latest repair on record. */
  stillOpen: number;
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

const DAY_MS = 86_400_000;

/**
 * Whether a repair's comeback window is still open: opened less than `days` days before `asOf`
 * (the latest repair on record). Null `asOf`: never.
 */
export function isWindowOpen(openedOn: string, asOf: string | null, days: number): boolean {
  if (asOf === null) return false;
  const openFrom = new Date(Date.parse(asOf) - days * DAY_MS).toISOString().slice(0, 10);
  return openedOn > openFrom;
}

/** Every comeback of the fault among the lines, both visits (lib/comebacks.ts). */
export function comebacksOf(
  lines: readonly FixLine[],
  fault: FixFault,
  window: ComebackWindow,
): Comeback[] {
  const visits: RepairVisit[] = lines
    .filter((l) => isRepairOf(l, fault))
    .map((l) => ({
      id: l.id,
      vehicleId: l.vehicleId,
      openedOn: l.openedOn,
      odometerMi: l.odometerMi,
    }));
  return findComebacks(visits, window);
}

/**
 * How often the fix of a fault held, over the lines given (the caller picks the cohorts). Null
 * when no line repaired the fault (or every repair's window is still open).
 */
export function fixHeld(
  lines: readonly FixLine[],
  fault: FixFault,
  settings: FixHeldSettings,
): FixHeld | null {
  const { window, confidence, asOf } = settings;
  const days = new Set<string>();
  const open = new Set<string>();
  for (const l of lines) {
    if (!isRepairOf(l, fault)) continue;
    const visit = `${l.vehicleId}|${l.openedOn}`;
    (isWindowOpen(l.openedOn, asOf, window.days) ? open : days).add(visit);
  }
  const fixes = days.size;
  if (fixes === 0 && open.size === 0) return null;
  if (fixes === 0)
    // Nothing to tell yet: the share is unknown, its interval all of 0 to 1.
    return {
      fixes,
      stillOpen: open.size,
      held: 0,
      comebacks: 0,
      estimate: 0,
      lower: 0,
      upper: 1,
      confidence,
      window,
    };
  // Each visit is the first of at most one comeback pair (findComebacks); a pair whose first
  // visit is still open is not counted (that visit is left out).
  const comebacks = comebacksOf(lines, fault, window).filter((c) =>
    days.has(`${c.first.vehicleId}|${c.first.openedOn}`),
  ).length;
  const held = fixes - comebacks;
  return {
    fixes,
    stillOpen: open.size,
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
 * The share in a few words: "the fix held in 35 of 36 repairs (97%), likely between 86% and
 * 100%", or "too early to tell: all 2 repairs … are within 30 days of the latest on record".
 */
export function describeFixHeldShare(f: FixHeld): string {
  if (f.fixes === 0)
    return `too early to tell: ${f.stillOpen === 1 ? "the only repair" : `all ${f.stillOpen} repairs`} of this fault ${f.stillOpen === 1 ? "is" : "are"} within ${f.window.days} days of the latest on record`;
  return `the fix held in ${describeShare({
    count: f.held,
    of: f.fixes,
    lower: f.lower,
    upper: f.upper,
    noun: ["repair"],
  })}`;
}

/**
 * The figure in words: "The fix held in 35 of 36 repairs (97%), likely between 88% and 99%;
 * 1 came back within 30 days or 3,000 mi." Without repairs: says so.
 */
export function describeFixHeld(f: FixHeld | null, unit: "mi" | "km"): string {
  if (!f) return "No repairs of this fault on record yet.";
  const share = describeFixHeldShare(f);
  const head = share.charAt(0).toUpperCase() + share.slice(1);
  if (f.fixes === 0) return `${head}.`;
  const recent =
    f.stillOpen > 0
      ? ` ${countOf(f.stillOpen, "more repair")} ${f.stillOpen === 1 ? "is" : "are"} too recent to tell (within ${f.window.days} days of the latest on record).`
      : "";
  return `${head}; ${f.comebacks} came back within ${describeWindow(f.window, unit)}.${recent}`;
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
    [
      "Too recent to tell",
      `${f.stillOpen} (within ${f.window.days} days of the latest repair on record; left out)`,
    ],
    ["Held", f.fixes === 0 ? "—" : `${f.held} of ${f.fixes} (${formatPercent(f.estimate)})`],
    [
      intervalLabel(f.confidence),
      `${(f.lower * 100).toFixed(1)}% to ${(f.upper * 100).toFixed(1)}%`,
    ],
    ["Method", "Wilson score interval (Wilson 1927)"],
  ];
}
