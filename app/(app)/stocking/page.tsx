import type { Metadata } from "next";
import Link from "next/link";
import { buttonClass, inputClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { getStockingPlan } from "@/db/queries/stocking";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";
import { formatInterval, formatMoney, formatSig } from "@/lib/format";
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
            Cautious: use the upper end of each rate&apos;s {Math.round(plan.confidence * 100)}%
            interval
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
          <p className="text-ink-soft">
            Expected demand over each part&apos;s lead time + {q.reviewDays} review days, from the
            failure rate of its component for each vehicle&apos;s cohort and mileage band (
            {q.cautious
              ? `upper end of its ${Math.round(plan.confidence * 100)}% interval`
              : "shrunk estimate"}
            ) × the vehicle&apos;s miles per day. Stock level: the smallest stock that covers a
            Poisson demand with {Math.round(q.serviceLevel * 100)}% probability. ABC by yearly
            demand value.{" "}
            {q.cautious
              ? "No range under the demand: with the cautious option it is already an upper bound."
              : `Under each demand, its range at ${Math.round(plan.confidence * 100)}% confidence from the uncertainty of the rates (their gamma posteriors); the stock level also covers the chance variation of the repairs themselves.`}
          </p>
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
                    "Part",
                    "Component",
                    "ABC",
                    "Demand",
                    "Stock level",
                    "On hand",
                    "Reorder",
                    "Short if not",
                    "Value",
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
                    <td className="py-1 pr-3 text-right font-semibold">{p.abc}</td>
                    <td
                      className="py-1 pr-3 text-right tabular-nums"
                      title={`over ${p.periodDays} days`}
                    >
                      {formatSig(p.expectedDemand, 3)}
                      {p.demandLower !== null && p.demandUpper !== null ? (
                        <span className="block text-xs text-ink-soft" data-testid="demand-interval">
                          {formatInterval(p.demandLower, p.demandUpper)}
                        </span>
                      ) : null}
                    </td>
                    <td className="py-1 pr-3 text-right tabular-nums">{p.stockLevel}</td>
                    <td className="py-1 pr-3 text-right tabular-nums">{p.onHand}</td>
                    <td className="py-1 pr-3 text-right font-semibold tabular-nums">
                      {p.reorder || "—"}
                    </td>
                    <td
                      className="py-1 pr-3 text-right tabular-nums"
                      title="expected units short per period with the stock on hand"
                    >
                      {formatSig(p.shortfallOnHand, 2)}
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
