import type { Metadata } from "next";
import Link from "next/link";
import { buttonClass, inputClass } from "@/components/ui/button";
import { FigureCard } from "@/components/ui/figure-card";
import { FigureDetails } from "@/components/ui/figure-details";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { SinceFillUpChart, type SinceFillUpBar } from "@/components/refuel/since-fill-up-chart";
import { getDb } from "@/db";
import { getOrganisation } from "@/db/queries/organisations";
import { getRefuelAnalysis, type RefuelRow, type RefuelSymptom } from "@/db/queries/refuel";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";
import { numberFormat } from "@/lib/format";
import {
  describeAgainstChance,
  formatPlain,
  formatProbability,
  formatRange,
  intervalLabel,
} from "@/lib/plain-words";
import { RefuelPageQuery } from "@/lib/refuel-request";
import { milesToUnit, unitToMiles } from "@/lib/units";
import { parseOrDefaults, queryValues, type PageSearchParams } from "@/lib/search-params";
import { VehicleLink } from "@/components/vehicles/vehicle-link";

export const metadata: Metadata = { title: "Refuel analysis" };

const METHOD =
  "One-sided exact test of the count within the window, each event with its own chance (Poisson-binomial; Hong 2013). Interval: exact Poisson (Garwood) limits of the count, divided by what chance predicts.";

const SYMPTOM_CHOICES = [
  ["both", "Stalls and no-starts"],
  ["stall", "Stalls only"],
  ["no-start", "No-starts only"],
] as const;

const cohortLabel = (key: string) => key.split("|").join(" ");

/** A test result in words, with its exact figures one click away. */
function AgainstChance({ row, confidence }: { row: RefuelRow; confidence: number }) {
  return (
    <>
      {describeAgainstChance(row)}
      <FigureDetails
        summary="Figures"
        rows={[
          ["Observed ÷ chance", formatPlain(row.ratio)],
          [intervalLabel(confidence), formatRange(row.lower, row.upper)],
          ["p (one-sided exact test)", formatProbability(row.pValue)],
        ]}
      />
    </>
  );
}

export default async function RefuelPage({ searchParams }: { searchParams: PageSearchParams }) {
  const auth = await requirePage("refuel:read");
  const { query: q, problem } = parseOrDefaults(RefuelPageQuery, await queryValues(searchParams));
  const db = await getDb();
  const org = await getOrganisation(db, auth);
  const unit = org.distanceUnit;
  const window = q.window ?? org.refuelWindow;
  const windowMiles = unitToMiles(window, unit);
  const symptoms: RefuelSymptom[] = q.symptom === "both" ? ["stall", "no-start"] : [q.symptom];
  const binUnits = window <= 40 ? 5 : 10;
  const maxUnits = Math.max(300, Math.ceil((window * 3) / binUnits) * binUnits);
  const r = await getRefuelAnalysis(db, auth, windowMiles, {
    symptoms,
    cohort: q.cohort,
    binMi: unitToMiles(binUnits, unit),
    maxMi: unitToMiles(maxUnits, unit),
  });
  const canSeeVehicles = can(auth.role, "vehicles:read");
  const canStartIssue = can(auth.role, "known-issues:manage");
  const dist = (mi: number | null) =>
    mi === null ? "—" : numberFormat(0).format(milesToUnit(mi, unit));
  const what = q.symptom === "both" ? "stalls and no-starts" : `${q.symptom}s`;

  const histogramCohort = r.cohorts.find((c) => c.key === r.histogram.cohort);
  const bars: SinceFillUpBar[] = r.histogram.bins.map((b) => {
    const from = Math.round(milesToUnit(b.fromMi, unit));
    const to = b.toMi === null ? null : Math.round(milesToUnit(b.toMi, unit));
    return {
      bin: to === null ? `${from}+` : `${from}–${to}`,
      observed: b.observed,
      chance: b.chance,
      isInWindow: from < window,
    };
  });
  const histogramTitle =
    r.histogram.cohort === "all"
      ? `All vehicles: ${what} by ${unit} since the last fill-up`
      : `${cohortLabel(r.histogram.cohort)}: ${what} by ${unit} since the last fill-up`;

  const within = `Within ${window} ${unit} of a fill-up`;
  const settings = (cohort?: string) =>
    new URLSearchParams({
      window: String(window),
      symptom: q.symptom,
      ...(cohort ? { cohort } : {}),
    }).toString();

  return (
    <>
      <PageHeader
        title="Refuel analysis"
        description={`Do ${what} come sooner after a fill-up than chance predicts? Per cohort and per vehicle, against each vehicle's own refuelling interval.`}
      />
      {problem ? (
        <p role="alert" className="mb-4 text-alarm-700">
          {problem}: showing the defaults.
        </p>
      ) : null}
      <Panel>
        <form
          method="get"
          className="flex flex-wrap items-end gap-4 text-sm"
          aria-label="Analysis settings"
        >
          <label className="flex flex-col gap-1">
            <span className="font-medium">Window after a fill-up ({unit})</span>
            <input
              name="window"
              inputMode="decimal"
              defaultValue={String(window)}
              className={inputClass}
            />
          </label>
          <label className="flex flex-col gap-1">
            <span className="font-medium">Events</span>
            <select name="symptom" defaultValue={q.symptom} className={inputClass}>
              {SYMPTOM_CHOICES.map(([value, label]) => (
                <option key={value} value={value}>
                  {label}
                </option>
              ))}
            </select>
          </label>
          <label className="flex flex-col gap-1">
            <span className="font-medium">Histogram of</span>
            <select name="cohort" defaultValue={r.histogram.cohort} className={inputClass}>
              <option value="all">All vehicles</option>
              {r.cohorts.map((c) => (
                <option key={c.key} value={c.key}>
                  {cohortLabel(c.key)}
                </option>
              ))}
            </select>
          </label>
          <button type="submit" className={buttonClass.primary}>
            Analyse
          </button>
        </form>
        <p className="mt-3 text-xs text-ink-soft">
          Default window: the organisation&apos;s setting ({org.refuelWindow} {unit}). Counted:
          repair orders with a {symptoms.join(" or ")} line, one event per order; and fault-code
          events whose code a known issue of the vehicle&apos;s cohort ties to a{" "}
          {symptoms.join(" or ")} (a code alone does not say the engine stopped; the known issue is
          where you say it does) — {r.faultEvents} of the events. One event per vehicle and day: a
          fault code on the day of a repair order is the same incident.
          {r.eventsWithoutOdometer > 0
            ? ` ${r.eventsWithoutOdometer} events had no odometer reading and are left out.`
            : ""}
        </p>
      </Panel>

      <div className="mt-4 grid gap-4 sm:grid-cols-4">
        <FigureCard
          label="Events"
          value={String(r.fleet.events)}
          note={`${what} with an odometer reading`}
        />
        <FigureCard
          label={within}
          value={String(r.fleet.observed)}
          note={`chance predicts about ${formatPlain(r.fleet.expected)}`}
        />
        <FigureCard
          label="Against chance"
          value={Number.isFinite(r.fleet.ratio) ? `${formatPlain(r.fleet.ratio)} times` : "—"}
          note={describeAgainstChance(r.fleet)}
          details={
            <FigureDetails
              rows={[
                ["Observed ÷ chance", formatPlain(r.fleet.ratio)],
                [intervalLabel(r.confidence), formatRange(r.fleet.lower, r.fleet.upper)],
                ["p (one-sided exact test)", formatProbability(r.fleet.pValue)],
                ["Method", METHOD],
              ]}
            />
          }
        />
        <FigureCard
          label="No fuel data"
          value={String(r.fleet.noFuelData)}
          note={`events with no fill-up in the previous ${dist(1000)} ${unit}`}
        />
      </div>

      <Panel title="Cohorts" className="mt-4">
        <p className="text-sm text-ink-soft">
          Strongest evidence first: the cohorts whose events come soon after a fill-up least likely
          by chance. Chance: an event is equally likely anywhere between the fill-ups around it, so
          it falls within the window as often as the window is a share of that distance between
          fill-ups; added up over the events, that is what chance predicts. &ldquo;Likely
          between&rdquo; is the {intervalLabel(r.confidence)}.
        </p>
        <FigureDetails className="mb-3" rows={[["Method", METHOD]]} />
        {r.cohorts.length === 0 ? (
          <p className="text-sm text-ink-soft">No {what} with an odometer reading on record.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm" data-testid="refuel-cohorts">
              <caption className="sr-only">Post-refuel test per cohort</caption>
              <thead className="text-ink-soft">
                <tr>
                  {[
                    "Cohort",
                    "Vehicles",
                    "Events",
                    within,
                    "Chance predicts",
                    "Against chance",
                    "No fuel data",
                    "Known issue",
                  ].map((h, i) => (
                    <th
                      key={h}
                      scope="col"
                      className={`py-1 pr-3 font-medium ${i >= 1 && i <= 6 && i !== 5 ? "text-right" : ""}`}
                    >
                      {h}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {r.cohorts.map((c) => {
                  const isSelected = c.key === r.histogram.cohort;
                  const startQuery = new URLSearchParams({
                    source: "refuel",
                    cohort: c.key,
                    window: String(window),
                    symptom: q.symptom,
                  });
                  return (
                    <tr
                      key={c.key}
                      className={`border-t border-line/60 ${isSelected ? "bg-sea-50" : ""}`}
                    >
                      <th scope="row" className="py-1 pr-3 font-medium">
                        <Link href={`/refuel?${settings(c.key)}`}>{cohortLabel(c.key)}</Link>
                      </th>
                      <td className="py-1 pr-3 text-right tabular-nums">{c.vehicles}</td>
                      <td className="py-1 pr-3 text-right tabular-nums">{c.events}</td>
                      <td className="py-1 pr-3 text-right font-semibold tabular-nums">
                        {c.observed}
                      </td>
                      <td className="py-1 pr-3 text-right tabular-nums">
                        {formatPlain(c.expected)}
                      </td>
                      <td className="min-w-48 py-1 pr-3">
                        <AgainstChance row={c} confidence={r.confidence} />
                      </td>
                      <td className="py-1 pr-3 text-right tabular-nums">{c.noFuelData}</td>
                      <td className="py-1">
                        {c.knownIssue ? (
                          <Link href={`/known-issues/${c.knownIssue.id}`}>
                            {c.knownIssue.title} ({c.knownIssue.state})
                          </Link>
                        ) : canStartIssue && c.pValue <= 0.05 && c.observed > 0 ? (
                          <Link href={`/known-issues/new?${startQuery}`}>Start a known issue</Link>
                        ) : (
                          <span className="text-ink-soft">—</span>
                        )}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
      </Panel>

      <Panel
        title={`${unit === "km" ? "Kilometres" : "Miles"} since the last fill-up`}
        className="mt-4"
      >
        <p className="mb-2 text-sm text-ink-soft">
          {histogramTitle}: {r.histogram.measured} events measured
          {histogramCohort
            ? `, ${histogramCohort.observed} within ${window} ${unit} where chance predicts about ${formatPlain(histogramCohort.expected)}`
            : ""}
          . A cluster shows as dark bars well above the chance bars at the left.
        </p>
        <SinceFillUpChart bars={bars} unit={unit} title={histogramTitle} />
        <details className="mt-3 text-sm">
          <summary className="cursor-pointer">Show the histogram as a table</summary>
          <table className="mt-2 text-left text-sm">
            <caption className="sr-only">{histogramTitle}</caption>
            <thead className="text-ink-soft">
              <tr>
                <th scope="col" className="pr-4 font-medium">
                  {unit} since fill-up
                </th>
                <th scope="col" className="pr-4 text-right font-medium">
                  Events
                </th>
                <th scope="col" className="text-right font-medium">
                  Chance predicts
                </th>
              </tr>
            </thead>
            <tbody>
              {bars.map((b) => (
                <tr key={b.bin}>
                  <td className="pr-4">{b.bin}</td>
                  <td className="pr-4 text-right tabular-nums">{b.observed}</td>
                  <td className="text-right tabular-nums">{formatPlain(b.chance)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </details>
      </Panel>

      <Panel title="Vehicles to look at first" className="mt-4">
        <p className="mb-3 text-sm text-ink-soft">
          Each vehicle tested against its own fill-ups, strongest evidence first. With few events
          per vehicle, one vehicle&apos;s result is weak on its own: read it with its cohort&apos;s.
        </p>
        {r.vehicles.length === 0 ? (
          <p className="text-sm text-ink-soft">No vehicles with {what}.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm" data-testid="refuel-vehicles">
              <caption className="sr-only">Vehicles ranked by post-refuel evidence</caption>
              <thead className="text-ink-soft">
                <tr>
                  {[
                    "#",
                    "Vehicle",
                    "Cohort",
                    "Typical distance between fill-ups",
                    "Events",
                    within,
                    "Chance predicts",
                    "Against chance",
                    `${unit} after the last fill-up, each event`,
                  ].map((h, i) => (
                    <th
                      key={h}
                      scope="col"
                      className={`py-1 pr-3 font-medium ${i >= 3 && i <= 6 ? "text-right" : ""}`}
                    >
                      {h}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {r.vehicles.slice(0, 20).map((v, i) => {
                  const name = v.unitNumber ?? v.vin ?? `#${v.vehicleId}`;
                  return (
                    <tr key={v.vehicleId} className="border-t border-line/60">
                      <td className="py-1 pr-3 tabular-nums text-ink-soft">{i + 1}</td>
                      <td className="py-1 pr-3 font-medium">
                        <VehicleLink id={v.vehicleId} canOpen={canSeeVehicles}>
                          {name}
                        </VehicleLink>
                      </td>
                      <td className="py-1 pr-3">
                        {v.make} {v.model} {v.generation}
                      </td>
                      <td className="py-1 pr-3 text-right tabular-nums">
                        {v.medianIntervalMi === null ? "—" : `${dist(v.medianIntervalMi)} ${unit}`}
                      </td>
                      <td className="py-1 pr-3 text-right tabular-nums">{v.events}</td>
                      <td className="py-1 pr-3 text-right font-semibold tabular-nums">
                        {v.observed}
                      </td>
                      <td className="py-1 pr-3 text-right tabular-nums">
                        {formatPlain(v.expected)}
                      </td>
                      <td className="min-w-48 py-1 pr-3">
                        <AgainstChance row={v} confidence={r.confidence} />
                      </td>
                      <td className="py-1 tabular-nums">
                        {v.sinceMi.map((s) => (s === null ? "no fuel data" : dist(s))).join(", ")}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
            {r.vehicles.length > 20 ? (
              <p className="mt-2 text-xs text-ink-soft">
                The first 20 of {r.vehicles.length} vehicles with {what}.
              </p>
            ) : null}
          </div>
        )}
      </Panel>

      <Panel title="No fuel data" className="mt-4">
        <p className="mb-3 text-sm text-ink-soft">
          Events with no fill-up in the previous {dist(1000)} {unit} cannot be measured; they are
          left out of the test and counted here, by vehicle. Missing fuel-card records make the test
          weaker, not stronger.
        </p>
        {r.noFuelData.length === 0 ? (
          <p className="text-sm text-ink-soft" data-testid="no-fuel-data">
            None: every event had a fill-up before it.
          </p>
        ) : (
          <table className="text-left text-sm" data-testid="no-fuel-data">
            <caption className="sr-only">Vehicles with events but no fuel data</caption>
            <thead className="text-ink-soft">
              <tr>
                <th scope="col" className="py-1 pr-4 font-medium">
                  Vehicle
                </th>
                <th scope="col" className="py-1 pr-4 font-medium">
                  Cohort
                </th>
                <th scope="col" className="py-1 pr-4 text-right font-medium">
                  Events without fuel data
                </th>
                <th scope="col" className="py-1 text-right font-medium">
                  Fill-ups on record
                </th>
              </tr>
            </thead>
            <tbody>
              {r.noFuelData.map((v) => {
                const name = v.unitNumber ?? v.vin ?? `#${v.vehicleId}`;
                return (
                  <tr key={v.vehicleId} className="border-t border-line/60">
                    <td className="py-1 pr-4">
                      <VehicleLink id={v.vehicleId} canOpen={canSeeVehicles}>
                        {name}
                      </VehicleLink>
                    </td>
                    <td className="py-1 pr-4">{v.cohort}</td>
                    <td className="py-1 pr-4 text-right tabular-nums">{v.events}</td>
                    <td className="py-1 text-right tabular-nums">{v.fillUps}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        )}
      </Panel>
    </>
  );
}
