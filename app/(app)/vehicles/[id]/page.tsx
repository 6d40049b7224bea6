import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { SafetyNote } from "@/components/ui/safety-note";
import { TimelineChart } from "@/components/vehicles/timeline-chart";
import { patternBands, TimelinePatterns } from "@/components/vehicles/timeline-patterns";
import { TimelineTable } from "@/components/vehicles/timeline-table";
import { getDb } from "@/db";
import { getVehicleTimeline } from "@/db/queries/vehicle-timeline";
import { formatConfidence, intervalLabel } from "@/lib/plain-words";
import { formatDistance } from "@/lib/units";
import { loadVehicle } from "./load-vehicle";
import { buildTimelineRecords, formatCents } from "./timeline-records";

export const metadata: Metadata = { title: "Vehicle" };

/** Rows in the records table; the chart shows at most CHART_LIMIT of the latest records. */
const TABLE_LIMIT = 200;
const CHART_LIMIT = 3000;

export default async function VehiclePage({ params }: { params: Promise<{ id: string }> }) {
  const { auth, vehicle } = await loadVehicle((await params).id);
  if (!vehicle) notFound();
  const timeline = await getVehicleTimeline(await getDb(), auth, vehicle.id);
  if (!timeline) notFound();
  const unit = auth.organisation.distanceUnit;
  const records = buildTimelineRecords(timeline, unit);
  const chartRecords = records.slice(-CHART_LIMIT);
  const { totals, patterns, analysis } = timeline;
  const cohort = `${vehicle.make} ${vehicle.model} ${timeline.vehicle.cohortLabel}`;
  const count = (n: number, one: string, many = `${one}s`) =>
    `${n.toLocaleString("en-GB")} ${n === 1 ? one : many}`;

  const facts: [string, React.ReactNode][] = [
    ["VIN", vehicle.vin ? <span className="font-mono">{vehicle.vin}</span> : "—"],
    ["Unit number", vehicle.unitNumber ?? "—"],
    ["Generation", vehicle.generation ?? "not in catalogue"],
    ["Engine", vehicle.engine ?? "—"],
    ["Transmission", vehicle.transmission ?? "—"],
    ["In service since", vehicle.inServiceDate ?? "—"],
    [
      "Last odometer",
      vehicle.lastOdometerMi === null
        ? "—"
        : `${formatDistance(vehicle.lastOdometerMi, unit)} on ${vehicle.lastOdometerOn ?? "?"}`,
    ],
  ];
  const figures: { label: string; value: string; note?: string }[] = [
    {
      label: "Repairs",
      value: totals.repairOrders.toLocaleString("en-GB"),
      note: `repair orders, ${count(totals.repairLines, "line")}`,
    },
    { label: "Fault-code events", value: totals.faultEvents.toLocaleString("en-GB") },
    {
      label: "Fill-ups",
      value: totals.fillUps.toLocaleString("en-GB"),
      note: `fuel ${formatCents(totals.fuelCostCents)}`,
    },
    {
      label: "Parts + labour",
      value: formatCents(totals.partsCostCents + totals.laborCostCents),
      note: `parts ${formatCents(totals.partsCostCents)}, labour ${formatCents(totals.laborCostCents)}`,
    },
  ];

  return (
    <>
      <PageHeader
        title={`${vehicle.modelYear} ${vehicle.make} ${vehicle.model}`}
        description={vehicle.unitNumber ? `Unit ${vehicle.unitNumber}` : (vehicle.vin ?? undefined)}
        actions={<Link href="/vehicles">← All vehicles</Link>}
      />
      <div className="grid gap-4 lg:grid-cols-3">
        <Panel title="Vehicle">
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            {facts.map(([k, v]) => (
              <div key={k} className="contents">
                <dt className="text-ink-soft">{k}</dt>
                <dd className="min-w-0 break-words">{v}</dd>
              </div>
            ))}
          </dl>
        </Panel>
        <Panel title="Totals" className="lg:col-span-2">
          <dl className="grid grid-cols-2 gap-4 text-sm sm:grid-cols-4">
            {figures.map((f) => (
              <div key={f.label}>
                <dt className="text-ink-soft">{f.label}</dt>
                <dd className="text-2xl font-semibold tabular-nums">{f.value}</dd>
                {f.note ? <dd className="text-ink-soft">{f.note}</dd> : null}
              </div>
            ))}
          </dl>
          <p className="mt-3 text-sm text-ink-soft">
            Amounts are in the currency the records were imported in. Cohort: {cohort}.
          </p>
        </Panel>
      </div>

      <Panel title="Patterns this vehicle matches" className="mt-4">
        <div className="mb-4">
          <SafetyNote />
        </div>
        {analysis === null ? (
          <p className="text-sm text-ink-soft">
            The statistics of this organisation have not been computed yet, so no pattern can be
            matched.
          </p>
        ) : patterns.length === 0 ? (
          <p className="text-sm text-ink-soft">
            Nothing on the {cohort} cohort stands out from the rest of the fleet in any mileage band
            in the latest analysis.
          </p>
        ) : (
          <>
            <p className="mb-3 text-sm text-ink-soft">
              Failures and wear on the {cohort} cohort that stand out from the rest of the fleet in
              a mileage band: signals, and those above the rest of the fleet even at the low end of
              their {intervalLabel(analysis.confidenceLevel)}. From the analysis of{" "}
              {analysis.finishedAt?.slice(0, 10) ?? "today"}; &ldquo;likely&rdquo; and &ldquo;at
              least&rdquo; at {formatConfidence(analysis.confidenceLevel)} confidence.
            </p>
            <TimelinePatterns
              patterns={patterns}
              unit={unit}
              odometerMi={timeline.vehicle.currentOdometerMi}
              confidenceLevel={analysis.confidenceLevel}
            />
          </>
        )}
      </Panel>

      <Panel title="Timeline" className="mt-4">
        <TimelineChart
          records={chartRecords}
          unit={unit}
          currentOdometerMi={timeline.vehicle.currentOdometerMi}
          bands={patternBands(patterns)}
        />
        {chartRecords.length < records.length ? (
          <p className="mt-2 text-sm text-ink-soft">
            The chart shows the latest {chartRecords.length.toLocaleString("en-GB")} of{" "}
            {records.length.toLocaleString("en-GB")} records.
          </p>
        ) : null}
        {Object.values(timeline.isCapped).some(Boolean) ? (
          <p className="mt-2 text-sm text-ink-soft">
            Only the latest fault-code events and fill-ups are loaded; the totals count them all.
          </p>
        ) : null}
      </Panel>

      <Panel title="Records" className="mt-4">
        <TimelineTable records={records} limit={TABLE_LIMIT} />
      </Panel>
    </>
  );
}
