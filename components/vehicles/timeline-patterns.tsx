import Link from "next/link";
import { FigureDetails } from "@/components/ui/figure-details";
import type { BandPosition, MatchedPattern } from "@/db/queries/vehicle-timeline";
import { KIND_LABELS } from "@/lib/component-kinds";
import {
  cellFigureRows,
  describeRate,
  describeRatio,
  describeShare,
  faultName as nameOfFault,
} from "@/lib/plain-words";
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

function bandText(p: MatchedPattern, unit: Unit): string {
  return `${whole(p.bandFromMi, unit)}–${formatDistance(p.bandToMi, unit)}`;
}

/** "P0496 — Purge flow …" or "Fuel vapour → Purge valve": the fault by its name. */
function faultName(p: MatchedPattern): string {
  return nameOfFault(p);
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
  if (p.kind === "wear") {
    if (!p.hasHadFault) return "Not replaced on this vehicle so far.";
    return `Already replaced on this vehicle: ${p.vehicleRepairs} time${p.vehicleRepairs === 1 ? "" : "s"} (${p.vehicleRepairsInBand} in this band).`;
  }
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

/**
 * A matched pattern in one sentence: the cohort, band and fault by name, the count over the
 * distance driven with its rate, how it stands against the rest of the fleet (for wear: that it
 * wears out sooner), and where this vehicle is.
 */
export function patternSentence(p: MatchedPattern, { unit, odometerMi }: Context): string {
  const isWear = p.kind === "wear";
  const rate = describeRate({
    events: p.events,
    exposureMi: p.exposureMi,
    ratePer10kMi: p.ratePer10k,
    lowerPer10kMi: p.rateLower,
    upperPer10kMi: p.rateUpper,
    unit,
    noun: isWear ? ["replacement"] : ["repair"],
  });
  const ratio = describeRatio({
    ratio: p.rateRatio,
    lower: p.ratioLower,
    upper: p.ratioUpper,
    events: p.events,
  });
  const against = isWear ? `wears out sooner than on the rest of the fleet (${ratio})` : ratio;
  return `${p.make} ${p.model} ${p.cohortLabel}, ${bandText(p, unit)}, ${faultName(p)}: ${rate}; ${against} — ${positionText(p, odometerMi, unit)}.`;
}

function PatternItem({ p, ...context }: Context & { p: MatchedPattern }) {
  const { unit, confidenceLevel } = context;
  const badge = "rounded px-1.5 py-0.5 text-xs font-medium";
  return (
    <li className="rounded-md border border-line px-4 py-3 text-sm">
      <p className="mb-1 flex flex-wrap gap-2">
        <span
          className={`${badge} ${p.isSignal ? "bg-ochre-100 text-ochre-700" : "bg-sea-100 text-sea-800"}`}
        >
          {p.isSignal ? "Signal" : "Ranks high"}
        </span>
        {p.kind === "wear" ? (
          <span className={`${badge} bg-paper text-ink ring-1 ring-line`} data-testid="wear-label">
            {KIND_LABELS.wear}
          </span>
        ) : null}
        {p.hasHadFault ? (
          <span className={`${badge} bg-alarm-100 text-alarm-700`}>
            {p.kind === "wear" ? "Replaced before" : "Had this fault"}
          </span>
        ) : null}
      </p>
      <p className="text-ink">{patternSentence(p, context)}</p>
      <p className="mt-1 text-ink-soft">
        {describeShare({
          count: p.vehiclesAffected,
          of: p.vehiclesAtRisk,
          lower: null,
          upper: null,
          noun: ["vehicle"],
        })}{" "}
        of the cohort in this band had it. {historyText(p)}
      </p>
      <FigureDetails
        summary="Figures"
        rows={cellFigureRows(
          {
            ratePer10kMi: p.ratePer10k,
            rateLower: p.rateLower,
            rateUpper: p.rateUpper,
            ratio: p.rateRatio,
            ratioLower: p.ratioLower,
            ratioUpper: p.ratioUpper,
            pValue: p.pValue,
            qValue: p.qValue,
          },
          confidenceLevel,
          unit,
        )}
      />
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
