import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { CellFactsPanel } from "@/components/patterns/cell-facts-panel";
import { CellRepairLines, viewWords } from "@/components/patterns/cell-repair-lines";
import { KindBadge } from "@/components/ui/kind-badge";
import { McfChart } from "@/components/patterns/mcf-chart";
import { viewParams } from "@/components/patterns/query-strings";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { buttonClass } from "@/components/ui/button";
import { CautionList } from "@/components/ui/caution-list";
import { SafetyNote } from "@/components/ui/safety-note";
import { VehicleLink } from "@/components/vehicles/vehicle-link";
import { can } from "@/lib/auth/roles";
import { formatBand, formatMoney } from "@/lib/format";
import { describeCell, type MetricContext } from "@/lib/metrics";
import { formatConfidence, formatPlain } from "@/lib/plain-words";
import { queryValues, type PageSearchParams } from "@/lib/search-params";
import { milesToUnit } from "@/lib/units";
import { loadCell } from "./load-cell";

export const metadata: Metadata = { title: "Pattern detail" };

export default async function CellPage({ searchParams }: { searchParams: PageSearchParams }) {
  const query = new URLSearchParams(await queryValues(searchParams)).toString();
  const { auth, key, detail } = await loadCell(query);
  if (!key || !detail) notFound();
  const unit = auth.organisation.distanceUnit;
  const ctx: MetricContext = { unit, confidence: detail.confidenceLevel };
  const canSeeVehicles = can(auth.role, "vehicles:read");
  const c = detail.cell;
  const isWear = c.kind === "wear";
  const cohort = `${key.make} ${key.model} ${key.generation}`;
  const band = formatBand(c.bandFromMi, c.bandToMi, unit);
  const mcfPoints = detail.mcf.points.map((p) => ({ ...p, at: milesToUnit(p.at, unit) }));
  const keyQuery = new URLSearchParams({
    make: key.make,
    model: key.model,
    generation: key.generation,
    band: String(key.band),
    fault: key.fault,
  }).toString();
  return (
    <>
      <PageHeader
        title={`${isWear ? "Wear: " : ""}${cohort} · ${detail.faultLabel}`}
        description={band}
        actions={
          <Link
            href={`/patterns?${new URLSearchParams({
              make: key.make,
              model: key.model,
              generation: key.generation,
              view: "faults",
              ...(isWear ? { kind: "wear" } : {}),
              ...viewParams(key),
            }).toString()}`}
          >
            ← This cohort&apos;s {isWear ? "wear" : "faults"}
          </Link>
        }
      />
      <div className="grid gap-4 lg:grid-cols-3">
        <Panel title="In words" className="lg:col-span-2">
          <KindBadge kind={c.kind} className="mb-2 inline-block" />
          <p className="text-lg" data-testid="cell-sentence">
            {describeCell(c, ctx)}
          </p>
          {c.isSignal ? (
            <p className="mt-2 inline-block rounded bg-ochre-100 px-2 py-0.5 text-sm font-semibold text-ochre-700">
              Signal: it stands out from the rest of the fleet, even allowing for the many cells
              looked at
            </p>
          ) : null}
          {detail.isFiltered ? (
            <p className="mt-2 text-sm" data-testid="cell-view">
              {detail.isViewStats
                ? `For repairs ${viewWords(key)} only, ${key.from || key.to ? "with the miles driven in that period" : "against all the miles driven"}.`
                : `No exposure in this cohort and band for repairs ${viewWords(key)}: these figures are the whole history's.`}
            </p>
          ) : null}
          <CellFactsPanel cell={c} ctx={ctx} />
          <p className="mt-3 text-xs text-ink-soft">
            Computed {detail.computedAt.slice(0, 16).replace("T", " ")} UTC.
          </p>
        </Panel>
        <Panel title="Cost and downtime">
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="text-ink-soft">Repair orders</dt>
            <dd className="tabular-nums">{detail.totals.orders}</dd>
            <dt className="text-ink-soft">Parts + labour</dt>
            <dd className="tabular-nums">{formatMoney(detail.totals.costCents)}</dd>
            <dt className="text-ink-soft">Downtime</dt>
            <dd className="tabular-nums">
              {formatPlain(detail.totals.downtimeDays)} days (opened to closed)
            </dd>
            <dt className="text-ink-soft">Vehicles affected</dt>
            <dd className="tabular-nums">{detail.vehicles.length}</dd>
          </dl>
          {can(auth.role, "known-issues:manage") ? (
            <Link
              href={`/known-issues/new?${keyQuery}`}
              className={`${buttonClass.primary} mt-4 w-full`}
            >
              Start a known issue from this
            </Link>
          ) : (
            <p className="mt-4 text-sm text-ink-soft">
              A manager can start a known issue from this cell.
            </p>
          )}
        </Panel>
      </div>
      <Panel title={`Recurrence over mileage: ${cohort}, ${detail.faultLabel}`} className="mt-4">
        <McfChart
          points={mcfPoints}
          unitLabel={unit}
          bandFrom={milesToUnit(c.bandFromMi, unit)}
          bandTo={milesToUnit(c.bandToMi, unit)}
        />
        <p className="mt-2 text-xs text-ink-soft">
          How many of these repairs a vehicle of the cohort has had on average by each odometer
          reading (Nelson&apos;s mean cumulative function), across {detail.mcf.units} vehicles, each
          observed up to its latest reading, with {formatConfidence(detail.confidenceLevel)} limits
          (Lawless–Nadeau variance, log scale). Dashed lines: this band. Vehicles are counted from 0{" "}
          {unit}, so histories that start later make the curve conservative.
          {detail.isFiltered
            ? " The curve covers every repair, whatever the period or vendor."
            : ""}
        </p>
      </Panel>
      <Panel title="Vehicles affected" className="mt-4">
        {detail.vehicles.length === 0 ? (
          <p className="text-sm text-ink-soft">None in this band.</p>
        ) : (
          <ul className="flex flex-wrap gap-2 text-sm">
            {detail.vehicles.map((v) => (
              <li key={v.vehicleId}>
                <VehicleLink
                  id={v.vehicleId}
                  canOpen={canSeeVehicles}
                  className="rounded border border-line px-2 py-1 no-underline hover:bg-sea-50"
                >
                  {v.unitNumber ?? v.vin ?? `#${v.vehicleId}`} · {v.repairs}
                </VehicleLink>
              </li>
            ))}
          </ul>
        )}
      </Panel>
      <CellRepairLines
        cellKey={key}
        keyQuery={keyQuery}
        lines={detail.lines}
        vendors={detail.vendors}
        isCapped={detail.isCapped}
        isFiltered={detail.isFiltered}
        isViewStats={detail.isViewStats}
        csvHref={`/api/patterns/cell?${query}&format=csv`}
        unit={unit}
        canSeeVehicles={canSeeVehicles}
      />
      <Panel title="Cautions" className="mt-4">
        <CautionList cautions={detail.cautions} className="mb-3" />
        <SafetyNote />
      </Panel>
    </>
  );
}
