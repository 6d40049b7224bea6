/**
 * What kind of work a repair line is, from its component and its words:
 * - `service`: scheduled maintenance (oil and filter, fluid services, filters, inspections, tyre
 *   rotation). Never a failure pattern; it counts only as exposure (odometer readings) and in
 *   cost totals.
 * - `wear`: parts that wear out in normal use (brake pads and discs, wiper blades, tyres, clutch
 *   friction). A pattern only when it comes early against the rest of the fleet: analysed in
 *   its own view, marked as wear wherever it appears.
 * - `failure`: everything else; the failure analysis counts these lines only.
 * The split is common practice in fleet maintenance (scheduled / wear / breakdown work).
 */
export const COMPONENT_KINDS = ["service", "wear", "failure"] as const;
export type ComponentKind = (typeof COMPONENT_KINDS)[number];

/** The kinds that are analysed as patterns (cells, signals, rankings). */
export const ANALYSED_KINDS = ["failure", "wear"] as const;
export type AnalysedKind = (typeof ANALYSED_KINDS)[number];

/** The fault key of a kind's "all faults" totals: "all" (failure lines), "all:wear". */
export const allFaultsKey = (kind: AnalysedKind) => (kind === "failure" ? "all" : "all:wear");

export const KIND_LABELS: Record<ComponentKind, string> = {
  service: "Scheduled service",
  wear: "Wear",
  failure: "Failure",
};

/** One sentence per kind, for the settings screen and the methods. */
export const KIND_MEANINGS: Record<ComponentKind, string> = {
  service:
    "Scheduled maintenance. Never counted as a failure; its odometer readings still count as miles driven, and its cost in cost totals.",
  wear: "Parts that wear out in normal use. Analysed on their own: a pattern only when they wear out sooner than on the rest of the fleet.",
  failure: "Something that broke. Counted in the failure analysis, signals, lookup and comebacks.",
};

/**
 * The kind of one repair line: a service or wear component gives its kind; a failure
 * component, or no component, is a failure unless the line reads as scheduled work (no
 * complaint, no DTC, and words such as "scheduled" or "per interval": isScheduledWork), which
 * is service (a part replaced by the schedule, not because it failed).
 */
export function lineKind(componentKind: ComponentKind | null, isScheduled: boolean): ComponentKind {
  if (componentKind === "service" || componentKind === "wear") return componentKind;
  return isScheduled ? "service" : "failure";
}

/** lineKind in SQL, over a component-kind expression and a 0/1 is_scheduled expression. */
export function lineKindSql(componentKindSql: string, isScheduledSql: string): string {
  return `case when ${componentKindSql} in ('service', 'wear') then ${componentKindSql}
               when ${isScheduledSql} then 'service' else 'failure' end`;
}

const SCHEDULED_WORDS =
  /\b(scheduled|schedule|per (the )?(interval|schedule|manufacturer|maintenance)|service (interval|due|schedule)|(annual|periodic|routine|safety|state|pre-trip|mot) (service|inspection|check)|maintenance|inspections?|inspected|tyre rotation|tire rotation|rotated? (the )?(tyres|tires)|oil (change|service)|changed? (the )?oil|oil and filter|\d+(,\d{3})?\s*(k|mi|miles|km)\s*service|(minor|major|full|interim|basic) service|servicing|serviced)\b/i;

/** Words that say something was wrong, whatever else the line says. */
const FAULT_WORDS =
  /\b(fail(ed|ure|ing)?|faulty|fault|broken|broke|leak(ing|s)?|seized|stuck|stall(s|ed|ing)?|no[- ]start|won'?t start|intermittent|warning lamp|mil on|noise|noisy|vibrat(es|ion|ing)|overheat(s|ed|ing)?|misfir(e|es|ing)|cracked|burnt|blown|shorted|corroded|worn out)\b/i;

/**
 * Whether a repair line reads as scheduled work rather than a repair of something that went
 * wrong: no complaint (or a complaint that itself asks for scheduled work), no DTC, and its
 * correction or cause says scheduled, per interval, inspection, maintenance or a service; words
 * of a fault anywhere ("leaking", "failed", "noise") keep it a repair. Common practice: fleet
 * and shop systems mark such lines as preventive maintenance.
 */
export function isScheduledWork(line: {
  complaint: string | null;
  cause: string | null;
  correction: string | null;
  hasDtc: boolean;
}): boolean {
  if (line.hasDtc) return false;
  const words = [line.complaint, line.cause, line.correction].filter(
    (t): t is string => typeof t === "string" && t.trim() !== "",
  );
  if (words.some((t) => FAULT_WORDS.test(t))) return false;
  const complaint = line.complaint?.trim() ?? "";
  if (complaint !== "" && !SCHEDULED_WORDS.test(complaint)) return false;
  return words.some((t) => SCHEDULED_WORDS.test(t));
}
