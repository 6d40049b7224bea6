import Link from "next/link";
import type { BandPosition, MatchedPattern } from "@/db/queries/vehicle-timeline";
import { formatDistance, milesToUnit } from "@/lib/units";
import type { TimelineBand } from "./timeline-chart";

type Unit = "mi" | "km";

const GROUPS: { position: BandPosition; heading: string }[] = [
  { position: "inside", heading: "In the band this vehicle is in now" },
  { position: "approaching", heading: "Coming up within one band" },
  { position: "ahead", heading: "Further ahead" },
  { position: "past", heading: "Bands this vehicle has passed" },
  { position: "unknown", heading: "Odometer not known" },
];

const whole = (mi: number, unit: Unit) => Math.round(milesToUnit(mi, unit)).toLocaleString("en-GB");
const figure = (v: number | null, digits = 2) => (v === null ? "—" : v.toFixed(digits));

function bandText(p: MatchedPattern, unit: Unit): string {
  return `${whole(p.bandFromMi, unit)}–${formatDistance(p.bandToMi, unit)}`;
}

/** "P0496" or "Fuel vapour → Purge valve": the fault as the bands on the chart name it. */
function faultName(p: MatchedPattern): string {
  return p.dtc ?? `${p.componentSystem ?? ""} → ${p.componentName ?? p.componentSlug ?? ""}`;
}

function faultText(p: MatchedPattern): string {
  if (p.dtc) return p.dtcDescription ? `${p.dtc} (${p.dtcDescription.toLowerCase()})` : p.dtc;
  return faultName(p);
}

function positionText(p: MatchedPattern, odometerMi: number | null, unit: Unit): string {
  if (odometerMi === null) return "this vehicle's odometer is not known";
  const at = `this vehicle is at ${formatDistance(odometerMi, unit)}`;
  switch (p.position) {
    case "inside":
      return `${at}, inside the band`;
    case "approaching":
    case "ahead":
      return `${at}, ${formatDistance(p.bandFromMi - odometerMi, unit)} before the band${p.position === "approaching" ? " (approaching)" : ""}`;
    default:
      return `${at}, past the band`;
  }
}

function historyText(p: MatchedPattern): string {
  if (!p.hasHadFault) return "No repair or fault-code event for this fault on this vehicle so far.";
  const parts: string[] = [];
  if (p.vehicleRepairs > 0)
    parts.push(
      `${p.vehicleRepairs} repair line${p.vehicleRepairs === 1 ? "" : "s"} on this fault (${p.vehicleRepairsInBand} in this band)`,
    );
  if (p.vehicleFaultEvents > 0)
    parts.push(
      `${p.vehicleFaultEvents} fault-code event${p.vehicleFaultEvents === 1 ? "" : "s"} with ${p.dtc}`,
    );
  return `This vehicle already had this fault: ${parts.join("; ")}.`;
}

/** The pattern drill-down of one cell. */
export function patternHref(p: MatchedPattern): string {
  const q = new URLSearchParams({
    make: p.make,
    model: p.model,
    generation: p.cohortLabel,
    band: String(p.bandIndex),
    fault: p.faultKey,
  });
  return `/patterns/cell?${q.toString()}`;
}

/** The bands of the patterns the vehicle is in or approaching, one shaded band each on the chart. */
export function patternBands(patterns: MatchedPattern[]): TimelineBand[] {
  const near = patterns.filter((p) => p.position === "inside" || p.position === "approaching");
  const bands = new Map<number, { fromMi: number; toMi: number; faults: string[] }>();
  for (const p of near) {
    const band = bands.get(p.bandIndex) ?? { fromMi: p.bandFromMi, toMi: p.bandToMi, faults: [] };
    band.faults.push(p.dtc ?? p.componentName ?? "component");
    bands.set(p.bandIndex, band);
  }
  return [...bands.values()].map(({ fromMi, toMi, faults }) => ({
    fromMi,
    toMi,
    label:
      faults.length > 2
        ? `${faults.slice(0, 2).join(", ")} +${faults.length - 2}`
        : faults.join(", "),
  }));
}

type Context = { unit: Unit; odometerMi: number | null; confidenceLevel: number };

function PatternItem({ p, unit, odometerMi, confidenceLevel }: Context & { p: MatchedPattern }) {
  const level = `${Math.round(confidenceLevel * 100)}%`;
  // Rates are stored per 10,000 mi; per 10,000 km is the same count over 1.609… times the distance.
  const rate = (v: number | null) => figure(v === null ? null : v / milesToUnit(1, unit));
  const ratio =
    p.rateRatio === null
      ? "while the rest of the fleet had none in this band"
      : `${p.rateRatio.toFixed(1)}× the rest of the fleet (${level} ${figure(p.ratioLower, 1)}–${figure(p.ratioUpper, 1)})`;
  return (
    <li className="rounded-md border border-line px-4 py-3 text-sm">
      <p className="mb-1 flex flex-wrap gap-2">
        <span
          className={`rounded px-1.5 py-0.5 text-xs font-medium ${p.isSignal ? "bg-ochre-100 text-ochre-700" : "bg-sea-100 text-sea-800"}`}
        >
          {p.isSignal ? "Signal" : "Ranks high"}
        </span>
        {p.hasHadFault ? (
          <span className="rounded bg-alarm-100 px-1.5 py-0.5 text-xs font-medium text-alarm-700">
            Had this fault
          </span>
        ) : null}
      </p>
      <p className="text-ink">
        {`${p.make} ${p.model} ${p.cohortLabel}, ${bandText(p, unit)}, ${faultText(p)}: ` +
          `${rate(p.ratePer10k)} repairs per 10,000 ${unit} (${level} ${rate(p.rateLower)}–${rate(p.rateUpper)}), ` +
          `${ratio} — ${positionText(p, odometerMi, unit)}.`}
      </p>
      <p className="mt-1 text-ink-soft">
        {p.events} repair{p.events === 1 ? "" : "s"} over {formatDistance(p.exposureMi, unit)} of
        exposure; {p.vehiclesAffected} of {p.vehiclesAtRisk} vehicles affected
        {p.qValue === null ? "" : `; false-discovery q = ${p.qValue.toPrecision(2)}`}.{" "}
        {historyText(p)}
      </p>
      <p className="mt-1">
        <Link
          href={patternHref(p)}
          aria-label={`Open the pattern ${faultName(p)}, ${bandText(p, unit)}`}
        >
          Open the pattern →
        </Link>
      </p>
    </li>
  );
}

/**
 * The cells of the vehicle's cohort that are signals or rank high in the latest analysis, in
 * words, grouped by where the vehicle's odometer stands against each band. Bands near the
 * vehicle's odometer are open; the others fold away.
 */
export function TimelinePatterns({
  patterns,
  ...context
}: Context & { patterns: MatchedPattern[] }) {
  return (
    <div className="space-y-5">
      {GROUPS.map(({ position, heading }) => {
        const group = patterns.filter((p) => p.position === position);
        if (group.length === 0) return null;
        const list = (
          <ul className="space-y-3">
            {group.map((p) => (
              <PatternItem key={`${p.bandIndex}-${p.faultKey}`} p={p} {...context} />
            ))}
          </ul>
        );
        const title = `${heading} (${group.length})`;
        return position === "inside" || position === "approaching" ? (
          <div key={position}>
            <h3 className="mb-2 text-sm font-semibold text-ink-soft">{title}</h3>
            {list}
          </div>
        ) : (
          <details key={position}>
            <summary className="mb-2 cursor-pointer text-sm font-semibold text-ink-soft">
              {title}
            </summary>
            {list}
          </details>
        );
      })}
    </div>
  );
}
