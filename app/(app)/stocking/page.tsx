import type { Metadata } from "next";
import Link from "next/link";
import { buttonClass, inputClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { getStockingPlan } from "@/db/queries/stocking";
import { FigureDetails } from "@/components/ui/figure-details";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";
import { KIND_LABELS } from "@/lib/component-kinds";
import { formatMoney } from "@/lib/format";
import { formatConfidence, formatPlain, intervalLabel } from "@/lib/plain-words";
import { demandKinds } from "@/lib/stocking";
import { SERVICE_LEVELS, StockingQuery } from "@/lib/stocking-request";
import { parseOrDefaults, queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Stocking" };

export default async function StockingPage({ searchParams }: { searchParams: PageSearchParams }) {
  const auth = await requirePage("stocking:read");
  const { query: q, problem } = parseOrDefaults(StockingQuery, await queryValues(searchParams));
  const plan = await getStockingPlan(await getDb(), auth, q);
  const rows = q.only === "all" ? plan.parts : plan.parts.filter((p) => p.reorder > 0);
  const reorderValue = plan.parts.reduce((s, p) => s + (p.unitCostCents ?? 0) * p.reorder, 0);
  const query = new URLSearchParams({
    serviceLevel: String(q.serviceLevel),
    reviewDays: String(q.reviewDays),
    months: String(q.months),
    ...(q.leadDays !== undefined ? { leadDays: String(q.leadDays) } : {}),
    ...(q.cautious ? { cautious: "1" } : {}),
  });
  return (
    <>
      <PageHeader
        title="Stocking"
        description="Which parts to keep on the shelf for the vehicles this shop sees, from their measured failure rates and how far they drive."
        actions={
          can(auth.role, "parts:manage") ? (
            <Link href="/parts" className={buttonClass.secondary}>
              Parts list
            </Link>
          ) : undefined
        }
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
          aria-label="Plan settings"
        >
          <label className="flex flex-col gap-1">
            <span className="font-medium">Service level</span>
            <select
              name="serviceLevel"
              defaultValue={String(q.serviceLevel)}
              className={inputClass}
            >
              {SERVICE_LEVELS.map((s) => (
                <option key={s} value={s}>
                  {Math.round(s * 100)}% of periods with no shortage
                </option>
              ))}
            </select>
          </label>
          <label className="flex flex-col gap-1">
            <span className="font-medium">Lead time (days)</span>
            <input
              name="leadDays"
              inputMode="numeric"
              placeholder={`each part's own, else ${plan.defaultLeadDays}`}
              defaultValue={q.leadDays ?? ""}
              className={inputClass}
            />
          </label>
          <label className="flex flex-col gap-1">
            <span className="font-medium">Review period (days)</span>
            <input
              name="reviewDays"
              inputMode="numeric"
              defaultValue={q.reviewDays}
              className={inputClass}
            />
          </label>
          <label className="flex flex-col gap-1">
            <span className="font-medium">Vehicles seen in the last (months)</span>
            <input
              name="months"
              inputMode="numeric"
              defaultValue={q.months}
              className={inputClass}
            />
          </label>
          <label className="flex items-center gap-2 pb-2">
            <input type="checkbox" name="cautious" value="1" defaultChecked={q.cautious} />
            Cautious: use the upper end of each rate&apos;s {intervalLabel(plan.confidence)}
          </label>
          <label className="flex items-center gap-2 pb-2">
            <input type="checkbox" name="only" value="all" defaultChecked={q.only === "all"} />
            Show every part
          </label>
          <button type="submit" className={buttonClass.primary}>
            Plan
          </button>
        </form>
      </Panel>

      <div className="mt-4 grid gap-4 sm:grid-cols-4">
        {[
          [
            "Customer base",
            `${plan.vehicles.toLocaleString("en-GB")} vehicles`,
            `seen since ${q.months} months before ${plan.asOf}`,
          ],
          [
            "Parts to reorder",
            String(plan.parts.filter((p) => p.reorder > 0).length),
            `of ${plan.parts.length} planned`,
          ],
          ["Reorder value", formatMoney(reorderValue), "at unit cost, parts with a known cost"],
          [
            "Mileage known",
            `${plan.vehiclesWithOwnMileage.toLocaleString("en-GB")} vehicles`,
            "from their own readings; others use their cohort's median",
          ],
        ].map(([label, value, note]) => (
          <Panel key={label}>
            <p className="text-sm text-ink-soft">{label}</p>
            <p
              className="text-2xl font-semibold tabular-nums"
              data-testid={`stock-${label?.toLowerCase().replace(/\s+/g, "-")}`}
            >
              {value}
            </p>
            <p className="text-xs text-ink-soft">{note}</p>
          </Panel>
        ))}
      </div>

      <Panel title={q.only === "all" ? "Every part" : "Parts to reorder"} className="mt-4">
        <div className="mb-3 flex flex-wrap items-center justify-between gap-2 text-sm">
          <div className="max-w-3xl">
            <p className="text-ink-soft">
              Expected demand over each part&apos;s lead time + {q.reviewDays} review days: how
              often its component is repaired or serviced on each vehicle&apos;s cohort at its
              mileage, times how far the vehicle drives a day, times the parts one job uses. Stock
              level: the smallest stock that runs short in no more than{" "}
              {formatPlain(100 - q.serviceLevel * 100)}% of periods.{" "}
              {q.cautious
                ? `Cautious: each rate is taken at the upper end of its ${intervalLabel(plan.confidence)}, so the demand is already a high estimate and has no range under it.`
                : "Under each demand, the range it likely falls in given how sure the rates are; the stock level also covers the chance ups and downs of the jobs themselves."}
            </p>
            <FigureDetails
              rows={[
                [
                  "Rates",
                  q.cautious
                    ? `Upper end of each cohort × mileage band × component rate's ${intervalLabel(plan.confidence)}`
                    : "Each cohort × mileage band × component rate's shrunk (empirical-Bayes) estimate",
                ],
                [
                  "Range under the demand",
                  q.cautious
                    ? "None with the cautious option"
                    : `${intervalLabel(plan.confidence)} of the sum of the rates' gamma posteriors, weighted by the miles and parts per job`,
                ],
                [
                  "Stock level",
                  `Poisson quantile of the expected demand at ${formatConfidence(q.serviceLevel)}`,
                ],
                [
                  "Expected shortfall without reorder",
                  "Expected units short per period with only the stock on hand (Poisson demand)",
                ],
                [
                  "ABC class",
                  "By yearly demand value: A the first 80%, B the next 15%, C the rest",
                ],
              ]}
            />
          </div>
          <a href={`/api/stocking?${query}&format=csv`} className={buttonClass.secondary}>
            Download purchase list (CSV)
          </a>
        </div>
        {rows.length === 0 ? (
          <p className="text-sm text-ink-soft">
            Nothing to reorder: the shelf covers the expected demand.{" "}
            <Link href={`/stocking?${query}&only=all`}>Show every part</Link>
          </p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Stocking plan</caption>
              <thead className="text-ink-soft">
                <tr>
                  {[
                    "Part number",
                    "Component",
                    "Demand from",
                    "ABC class",
                    "Expected demand over the period",
                    "Stock level to hold",
                    "On hand",
                    "Reorder",
                    "Expected shortfall without reorder",
                    "Reorder value",
                  ].map((h, i) => (
                    <th
                      key={h}
                      scope="col"
                      className={`py-1 pr-3 font-medium ${i >= 3 ? "text-right" : ""}`}
                    >
                      {h}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {rows.map((p) => (
                  <tr key={p.partNumber} className="border-t border-line/60">
                    <td className="py-1 pr-3 font-mono text-[13px]">
                      {p.partNumber}
                      {p.isStocked ? null : (
                        <span className="ml-1 font-sans text-xs text-ochre-700">
                          not on the shelf list
                        </span>
                      )}
                    </td>
                    <td className="py-1 pr-3">{p.component ?? p.description ?? "—"}</td>
                    <td className="py-1 pr-3" data-testid="demand-from">
                      {demandKinds(p.demandByKind)
                        .map((k) => KIND_LABELS[k])
                        .join(", ") || "—"}
                    </td>
                    <td className="py-1 pr-3 text-right font-semibold">{p.abc}</td>
                    <td className="py-1 pr-3 text-right tabular-nums">
                      {formatPlain(p.expectedDemand)}
                      {p.demandLower !== null && p.demandUpper !== null ? (
                        <span className="block text-xs text-ink-soft" data-testid="demand-interval">
                          likely {formatPlain(p.demandLower)} to {formatPlain(p.demandUpper)}
                        </span>
                      ) : null}
                      <span className="block text-xs text-ink-soft">over {p.periodDays} days</span>
                    </td>
                    <td className="py-1 pr-3 text-right tabular-nums">{p.stockLevel}</td>
                    <td className="py-1 pr-3 text-right tabular-nums">{p.onHand}</td>
                    <td className="py-1 pr-3 text-right font-semibold tabular-nums">
                      {p.reorder || "—"}
                    </td>
                    <td className="py-1 pr-3 text-right tabular-nums">
                      {formatPlain(p.shortfallOnHand)}
                    </td>
                    <td className="py-1 text-right tabular-nums">
                      {p.unitCostCents === null ? "—" : formatMoney(p.unitCostCents * p.reorder)}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>
    </>
  );
}
