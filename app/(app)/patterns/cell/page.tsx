import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { CellFactsPanel } from "@/components/patterns/cell-facts-panel";
import { McfChart } from "@/components/patterns/mcf-chart";
import { viewParams } from "@/components/patterns/query-strings";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { buttonClass, inputClass } from "@/components/ui/button";
import { CautionList } from "@/components/ui/caution-list";
import { SafetyNote } from "@/components/ui/safety-note";
import {
  formatBand,
  formatInterval,
  formatMoney,
  formatSig,
  ratePerTenThousand,
} from "@/lib/format";
import { can } from "@/lib/auth/roles";
import { milesToUnit } from "@/lib/units";
import { loadCell } from "./load-cell";
import { queryValues, type PageSearchParams } from "@/lib/search-params";
import { VehicleLink } from "@/components/vehicles/vehicle-link";

export const metadata: Metadata = { title: "Pattern detail" };

/** "opened 2024-01-01 to 2024-06-30 by Harbour Auto" from the drill-down's filters. */
function viewWords(key: { from?: string; to?: string; vendor?: string }): string {
  const period =
    key.from && key.to
      ? `opened ${key.from} to ${key.to}`
      : key.from
        ? `opened from ${key.from}`
        : key.to
          ? `opened up to ${key.to}`
          : "";
  return [period, key.vendor ? `by ${key.vendor}` : ""].filter(Boolean).join(" ");
}

export default async function CellPage({ searchParams }: { searchParams: PageSearchParams }) {
  const query = new URLSearchParams(await queryValues(searchParams)).toString();
  const { auth, key, detail } = await loadCell(query);
  if (!key || !detail) notFound();
  const unit = auth.organisation.distanceUnit;
  const canSeeVehicles = can(auth.role, "vehicles:read");
  const c = detail.cell;
  const cohort = `${key.make} ${key.model} ${key.generation}`;
  const band = formatBand(c.bandFrom, c.bandTo, unit);
  const rate = ratePerTenThousand(c.rate, unit);
  const confidence = Math.round(detail.confidenceLevel * 100);
  const sentence = c.hasTooLittleData
    ? `Too little data to judge: ${formatSig(milesToUnit(c.exposureMi, unit))} ${unit} of exposure and ${c.events} repair${c.events === 1 ? "" : "s"}. The cell is shown as uncertain and is not tested.`
    : `${formatSig(rate)} repairs per 10,000 ${unit}, ${confidence}% ${formatInterval(ratePerTenThousand(c.rateLower, unit), ratePerTenThousand(c.rateUpper, unit))}` +
      (c.ratio !== null
        ? `; ${formatSig(c.ratio)}× the rest of the fleet in this band (${confidence}% ${formatInterval(c.ratioLower, c.ratioUpper)}).`
        : c.events > 0
          ? `; the rest of the fleet had no such repairs in this band (ratio at least ${formatSig(c.ratioLower)}×).`
          : ".");
  const mcfPoints = detail.mcf.points.map((p) => ({ ...p, at: milesToUnit(p.at, unit) }));
  const keyQuery = new URLSearchParams({
    make: key.make,
    model: key.model,
    generation: key.generation,
    band: String(key.band),
    fault: key.fault,
  }).toString();
  const csv = `/api/patterns/cell?${query}&format=csv`;
  return (
    <>
      <PageHeader
        title={`${cohort} · ${detail.faultLabel}`}
        description={band}
        actions={
          <Link
            href={`/patterns?${new URLSearchParams({
              make: key.make,
              model: key.model,
              generation: key.generation,
              view: "faults",
              ...viewParams(key),
            }).toString()}`}
          >
            ← This cohort&apos;s faults
          </Link>
        }
      />
      <div className="grid gap-4 lg:grid-cols-3">
        <Panel title="In words" className="lg:col-span-2">
          <p className="text-lg" data-testid="cell-sentence">
            {sentence}
          </p>
          {c.isSignal ? (
            <p className="mt-2 inline-block rounded bg-ochre-100 px-2 py-0.5 text-sm font-semibold text-ochre-700">
              Signal: stands out after false-discovery control (q = {formatSig(c.qValue, 2)})
            </p>
          ) : null}
          {detail.isFiltered ? (
            <p className="mt-2 text-sm" data-testid="cell-view">
              {detail.isViewStats
                ? `For repairs ${viewWords(key)} only, ${key.from || key.to ? "with the miles driven in that period" : "against all the miles driven"}.`
                : `No exposure in this cohort and band for repairs ${viewWords(key)}: these figures are the whole history's.`}
            </p>
          ) : null}
          <CellFactsPanel cell={c} unit={unit} />
          <p className="mt-3 text-xs text-ink-soft">
            Computed {detail.computedAt.slice(0, 16).replace("T", " ")} UTC. Rates: exact Poisson
            (Garwood) intervals; share of vehicles: Wilson score interval; rate ratio: exact
            conditional binomial interval against the rest of the fleet in the same band.
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
              {formatSig(detail.totals.downtimeDays)} days (opened to closed)
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
          bandFrom={milesToUnit(c.bandFrom, unit)}
          bandTo={milesToUnit(c.bandTo, unit)}
        />
        <p className="mt-2 text-xs text-ink-soft">
          Mean cumulative number of these repairs per vehicle (Nelson&apos;s MCF) across{" "}
          {detail.mcf.units} vehicles of the cohort, each observed up to its latest odometer
          reading, with {confidence}% limits (Lawless–Nadeau variance, log scale). Dashed lines:
          this band. Vehicles are counted from 0 {unit}, so histories that start later make the
          curve conservative.
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
      <Panel title="Repair orders behind this cell" className="mt-4">
        <form
          method="get"
          action="/patterns/cell"
          className="mb-3 flex flex-wrap items-end gap-3 text-sm"
          aria-label="Narrow the repair orders"
        >
          {(["make", "model", "generation", "band", "fault"] as const).map((k) => (
            <input key={k} type="hidden" name={k} value={String(key[k])} />
          ))}
          <label className="flex flex-col gap-1">
            <span className="text-ink-soft">Opened from</span>
            <input type="date" name="from" defaultValue={key.from} className={inputClass} />
          </label>
          <label className="flex flex-col gap-1">
            <span className="text-ink-soft">to</span>
            <input type="date" name="to" defaultValue={key.to} className={inputClass} />
          </label>
          <label className="flex flex-col gap-1">
            <span className="text-ink-soft">Vendor</span>
            <select name="vendor" defaultValue={key.vendor ?? ""} className={inputClass}>
              <option value="">all vendors</option>
              {detail.vendors.map((v) => (
                <option key={v} value={v}>
                  {v}
                </option>
              ))}
            </select>
          </label>
          <button type="submit" className={buttonClass.secondary}>
            Apply
          </button>
          {detail.isFiltered ? <Link href={`/patterns/cell?${keyQuery}`}>Clear</Link> : null}
        </form>
        <div className="mb-2 flex justify-between text-sm">
          <span className="text-ink-soft" data-testid="cell-lines-count">
            {detail.lines.length} repair line{detail.lines.length === 1 ? "" : "s"}
            {detail.isCapped ? " (the latest 2,000)" : ""}
            {detail.isFiltered
              ? ` ${viewWords(key)}; cost and downtime above are for these lines.${detail.isViewStats ? "" : " The statistics cover every repair."}`
              : ""}
          </span>
          <a href={csv}>Download CSV</a>
        </div>
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Repair orders behind this cell</caption>
            <thead className="text-ink-soft">
              <tr>
                <th scope="col" className="py-1 pr-3 font-medium">
                  RO
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Vehicle
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Opened
                </th>
                <th scope="col" className="py-1 pr-3 text-right font-medium">
                  Odometer
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Complaint
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Cause / correction
                </th>
                <th scope="col" className="py-1 text-right font-medium">
                  Cost
                </th>
              </tr>
            </thead>
            <tbody>
              {detail.lines.slice(0, 200).map((l) => (
                <tr key={l.id} className="border-t border-line/60 align-top">
                  <td className="whitespace-nowrap py-1.5 pr-3 font-mono text-[13px]">
                    {l.roNumber}
                  </td>
                  <td className="whitespace-nowrap py-1.5 pr-3">
                    <VehicleLink id={l.vehicleId} canOpen={canSeeVehicles}>
                      {l.unitNumber ?? l.vin ?? `#${l.vehicleId}`}
                    </VehicleLink>
                  </td>
                  <td className="whitespace-nowrap py-1.5 pr-3">{l.openedOn}</td>
                  <td className="whitespace-nowrap py-1.5 pr-3 text-right tabular-nums">
                    {l.odometerMi === null
                      ? "—"
                      : `${formatSig(milesToUnit(l.odometerMi, unit), 6)} ${unit}`}
                  </td>
                  <td className="py-1.5 pr-3">{l.complaint ?? "—"}</td>
                  <td className="py-1.5 pr-3">
                    {l.cause ?? "—"}
                    {l.correction ? (
                      <span className="block text-ink-soft">{l.correction}</span>
                    ) : null}
                  </td>
                  <td className="py-1.5 text-right tabular-nums">{formatMoney(l.costCents)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {detail.lines.length > 200 ? (
            <p className="mt-2 text-sm text-ink-soft">
              Showing 200; the CSV has all {detail.lines.length}.
            </p>
          ) : null}
        </div>
      </Panel>
      <Panel title="Cautions" className="mt-4">
        <CautionList cautions={detail.cautions} className="mb-3" />
        <SafetyNote />
      </Panel>
    </>
  );
}
