import type { TimelineRecord } from "@/components/vehicles/timeline-kinds";
import type { TimelineRepairLine, VehicleTimeline } from "@/db/queries/vehicle-timeline";
import { formatDistance } from "@/lib/units";

type Unit = "mi" | "km";

/** Integer cents as an amount with two decimals ("1,234.50"); the data carry no currency. */
export function formatCents(cents: number): string {
  return (cents / 100).toLocaleString("en-GB", {
    minimumFractionDigits: 2,
    maximumFractionDigits: 2,
  });
}

/** A date stays a date; a timestamp reads "2024-03-26 11:28" (UTC). */
function formatWhen(at: string): string {
  return at.length <= 10 ? at : `${at.slice(0, 10)} ${at.slice(11, 16)}`;
}

/** Groups in first-seen order (Map.groupBy is not in Node 20). */
function groupBy<T, K>(items: T[], keyOf: (item: T) => K): Map<K, T[]> {
  const groups = new Map<K, T[]>();
  for (const item of items) {
    const key = keyOf(item);
    const group = groups.get(key);
    if (group) group.push(item);
    else groups.set(key, [item]);
  }
  return groups;
}

const joinParts = (parts: (string | null | undefined | false)[]) =>
  parts.filter((p): p is string => Boolean(p)).join(" · ");

type Reading = { odometerMi: number | null; isOdometerDoubtful: boolean };

function record(
  kind: TimelineRecord["kind"],
  key: string,
  at: string,
  reading: Reading,
  unit: Unit,
  summary: string,
  details: string[] = [],
): TimelineRecord {
  const { odometerMi, isOdometerDoubtful } = reading;
  return {
    key,
    kind,
    at,
    when: formatWhen(at),
    odometerMi,
    isOdometerDoubtful,
    odometer:
      odometerMi === null
        ? "—"
        : `${formatDistance(odometerMi, unit)}${isOdometerDoubtful ? " (doubtful)" : ""}`,
    summary,
    details,
  };
}

function describeLine(line: TimelineRepairLine, isOnlyLine: boolean): string[] {
  const component = line.componentSystem ? `${line.componentSystem} → ${line.componentName}` : null;
  const cost =
    line.partsCostCents !== null || line.laborCostCents !== null
      ? `parts ${formatCents(line.partsCostCents ?? 0)}, labour ${formatCents(line.laborCostCents ?? 0)}${line.laborHours !== null ? ` (${line.laborHours} h)` : ""}`
      : null;
  return [
    joinParts([
      isOnlyLine ? null : `Line ${line.lineNo}`,
      component,
      line.dtcNames.join("; "),
      line.symptom,
      line.isWarranty && "warranty",
    ]),
    line.complaint && `Complaint: ${line.complaint}`,
    line.cause && `Cause: ${line.cause}`,
    line.correction && `Correction: ${line.correction}`,
    joinParts([cost, line.technician && `technician ${line.technician}`]),
  ].filter((d): d is string => Boolean(d));
}

/**
 * The vehicle's records as one list, oldest first: a repair order with its lines, fault-code
 * events reported at the same moment, each fill-up and each roster reading.
 */
export function buildTimelineRecords(timeline: VehicleTimeline, unit: Unit): TimelineRecord[] {
  const records: TimelineRecord[] = [];
  const orders = groupBy(timeline.repairLines, (l) => l.repairOrderId);
  for (const [orderId, lines] of orders) {
    const [first] = lines;
    if (!first) continue;
    const cents = lines.reduce((s, l) => s + (l.partsCostCents ?? 0) + (l.laborCostCents ?? 0), 0);
    const summary = joinParts([
      `RO ${first.roNumber}`,
      first.vendor,
      first.closedOn && first.closedOn !== first.openedOn && `closed ${first.closedOn}`,
      `${lines.length} line${lines.length === 1 ? "" : "s"}`,
      `cost ${formatCents(cents)}`,
    ]);
    const details = lines.flatMap((l) => describeLine(l, lines.length === 1));
    records.push(
      record("repair", `repair-${orderId}`, first.openedOn, first, unit, summary, details),
    );
  }
  for (const [at, events] of groupBy(timeline.faultEvents, (e) => e.occurredAt)) {
    const [first] = events;
    if (!first) continue;
    const summary = joinParts([
      events.map((e) => e.dtc).join(", "),
      events.some((e) => e.milOn) && "MIL on",
    ]);
    const details = events.map((e) =>
      joinParts([`${e.dtc}${e.description ? `: ${e.description}` : ""}`, e.status]),
    );
    records.push(record("fault", `fault-${first.id}`, at, first, unit, summary, details));
  }
  for (const f of timeline.fillUps) {
    const summary = joinParts([
      f.volumeL !== null && `${f.volumeL.toFixed(1)} L`,
      f.priceTotalCents !== null && formatCents(f.priceTotalCents),
      f.station,
    ]);
    records.push(record("fill-up", `fill-${f.id}`, f.filledAt, f, unit, summary || "Fill-up"));
  }
  for (const r of timeline.odometerReadings) {
    records.push(record("reading", `reading-${r.id}`, r.readOn, r, unit, `Reading (${r.source})`));
  }
  return records.sort((a, b) => (a.at < b.at ? -1 : a.at > b.at ? 1 : 0));
}
