import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { AddToCampaignForm } from "@/components/campaigns/forms";
import { buttonClass, inputClass } from "@/components/ui/button";
import { FigureDetails } from "@/components/ui/figure-details";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { getAtRiskVehicles } from "@/db/queries/at-risk";
import { listCampaigns } from "@/db/queries/campaigns";
import { requirePage } from "@/lib/auth/guard";
import { formatMoney } from "@/lib/format";
import {
  countOf,
  describeOutlook,
  formatPlain,
  formatRange,
  intervalLabel,
} from "@/lib/plain-words";
import { formatDistance, unitToMiles } from "@/lib/units";
import { queryValues, type PageSearchParams } from "@/lib/search-params";
import { AT_RISK_HORIZON, AT_RISK_METHOD } from "@/lib/at-risk";

export const metadata: Metadata = { title: "At risk" };

const Query = z.object({
  next: z.coerce
    .number()
    .int()
    .min(100)
    .max(200_000)
    .catch(AT_RISK_HORIZON)
    .default(AT_RISK_HORIZON),
});

export default async function AtRiskPage({ searchParams }: { searchParams: PageSearchParams }) {
  const auth = await requirePage("campaigns:manage");
  const unit = auth.organisation.distanceUnit;
  const { next } = Query.parse(await queryValues(searchParams));
  const db = await getDb();
  const { rows, labourPerHourCents, confidence } = await getAtRiskVehicles(db, auth, {
    nextMiles: unitToMiles(next, unit),
  });
  const campaigns = await listCampaigns(db, auth);
  const totalExpected = rows.reduce((s, r) => s + r.expected, 0);
  const horizon = `${next.toLocaleString("en-GB")} ${unit}`;
  return (
    <>
      <PageHeader
        title="Vehicles at risk"
        description="Vehicles of cohorts with a confirmed known issue or a signal, inside its mileage range or within one band before it, and not yet repaired for it."
      />
      <Panel>
        <form method="get" className="flex flex-wrap items-end gap-3 text-sm" aria-label="Horizon">
          <label className="flex flex-col gap-1">
            <span className="font-medium">Expected failures over the next ({unit})</span>
            <input name="next" inputMode="numeric" defaultValue={next} className={inputClass} />
          </label>
          <button type="submit" className={buttonClass.secondary}>
            Recalculate
          </button>
          <a href={`/api/at-risk?next=${next}&format=csv`} className={buttonClass.secondary}>
            Download CSV
          </a>
          <p className="text-ink-soft">
            {countOf(rows.length, "vehicle and fault", "vehicles and faults")} to watch; in all,
            about {formatPlain(totalExpected)} failures expected over the next {horizon} of each
            vehicle. Cost to fix first = parts + typical hours at this organisation&apos;s median
            labour rate ({formatMoney(labourPerHourCents)}/h), or the average cost of past repairs
            of the fault for a signal. &ldquo;Likely between&rdquo; is the{" "}
            {intervalLabel(confidence)}: it allows for how sure the cohort&apos;s rates are, not for
            how far the vehicle will actually drive.
          </p>
        </form>
        <FigureDetails rows={[["Method", AT_RISK_METHOD]]} />
      </Panel>
      <Panel title="Watch-list" className="mt-4">
        {rows.length === 0 ? (
          <p className="text-sm text-ink-soft">
            No vehicle is approaching a confirmed known issue or a signal.
          </p>
        ) : (
          <>
            <AddToCampaignForm campaigns={campaigns.map((c) => ({ id: c.id, name: c.name }))} />
            <div className="mt-3 overflow-x-auto">
              <table className="w-full text-left text-sm">
                <caption className="sr-only">Vehicles at risk</caption>
                <thead className="text-ink-soft">
                  <tr>
                    <th scope="col" className="py-1 pr-2 font-medium">
                      <span className="sr-only">Add</span>
                    </th>
                    {[
                      "Vehicle",
                      "Cohort",
                      "Odometer",
                      "Why",
                      "Distance to its mileage range",
                      `Failures expected over the next ${horizon}`,
                      "Cost to fix first",
                    ].map((h, i) => (
                      <th
                        key={h}
                        scope="col"
                        className={`py-1 pr-3 font-medium ${i >= 4 ? "text-right" : ""}`}
                      >
                        {h}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {rows.slice(0, 500).map((r) => {
                    const name = r.unitNumber ?? r.vin ?? `#${r.vehicleId}`;
                    return (
                      <tr
                        key={`${r.vehicleId}|${r.source.kind === "signal" ? r.source.faultKey : r.source.id}`}
                        className="border-t border-line/60"
                      >
                        <td className="py-1 pr-2">
                          <input
                            type="checkbox"
                            form="add-to-campaign"
                            name={`vehicle:${r.vehicleId}`}
                            aria-label={`Add ${name}`}
                          />
                        </td>
                        <td className="py-1 pr-3">
                          <Link href={`/vehicles/${r.vehicleId}`}>{name}</Link>
                        </td>
                        <td className="py-1 pr-3">{r.cohort}</td>
                        <td className="py-1 pr-3 tabular-nums">
                          {formatDistance(r.odometerMi, unit)}
                        </td>
                        <td className="py-1 pr-3">
                          {r.source.kind === "known-issue" ? (
                            <Link href={`/known-issues/${r.source.id}`}>{r.source.title}</Link>
                          ) : (
                            <span>Signal: {r.source.label}</span>
                          )}
                        </td>
                        <td className="py-1 pr-3 text-right tabular-nums">
                          {r.toRangeMi === 0 ? "inside" : formatDistance(r.toRangeMi, unit)}
                        </td>
                        <td className="min-w-56 py-1 pr-3 text-right">
                          <span data-testid="expected">
                            {describeOutlook({
                              expected: r.expected,
                              lower: r.expectedLower,
                              upper: r.expectedUpper,
                              noun: ["failure"],
                            })}
                          </span>
                          <FigureDetails
                            summary="Figures"
                            className="text-left"
                            rows={[
                              ["Expected failures", formatPlain(r.expected)],
                              [
                                r.expectedLower === null ? "Interval" : intervalLabel(confidence),
                                r.expectedLower === null
                                  ? "not yet: the next recompute gives one"
                                  : formatRange(r.expectedLower, r.expectedUpper),
                              ],
                            ]}
                          />
                        </td>
                        <td className="py-1 text-right tabular-nums">
                          {r.fixCostCents === null ? "—" : formatMoney(r.fixCostCents)}
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
              {rows.length > 500 ? (
                <p className="mt-2 text-xs text-ink-soft">
                  The first 500; the CSV has all {rows.length}.
                </p>
              ) : null}
            </div>
          </>
        )}
      </Panel>
      <Panel title="Campaign lists" className="mt-4">
        {campaigns.length === 0 ? (
          <p className="text-sm text-ink-soft">
            No lists yet: tick vehicles above and name a list.
          </p>
        ) : (
          <ul className="space-y-1 text-sm">
            {campaigns.map((c) => (
              <li key={c.id}>
                <Link href={`/campaigns/${c.id}`}>{c.name}</Link>{" "}
                <span className="text-ink-soft">
                  {c.done} of {c.vehicles} done
                </span>
              </li>
            ))}
          </ul>
        )}
      </Panel>
    </>
  );
}
