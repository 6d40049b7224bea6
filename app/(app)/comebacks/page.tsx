import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { buttonClass, inputClass } from "@/components/ui/button";
import { FigureCard } from "@/components/ui/figure-card";
import { FigureDetails } from "@/components/ui/figure-details";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { getComebackReport } from "@/db/queries/comebacks";
import { requirePage } from "@/lib/auth/guard";
import type { ComebackLine, ComebackRate } from "@/lib/comeback-rates";
import { numberFormat } from "@/lib/format";
import { describeShare, formatPercent, formatPlain, intervalLabel } from "@/lib/plain-words";
import { milesToUnit } from "@/lib/units";
import { parseOrDefaults, queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Comebacks" };

const VIEWS = [
  ["fault", "Per fault"],
  ["fix", "Per fix"],
  ["vendor", "Per vendor"],
  ["technician", "Per technician"],
  ["coaching", "Technician × job type"],
] as const;
type View = (typeof VIEWS)[number][0];

const ComebackPageQuery = z.object({
  view: z.enum(VIEWS.map(([v]) => v) as [View, ...View[]]).default("fault"),
  min: z.coerce
    .number({ message: "Minimum repairs must be a number." })
    .int("Minimum repairs must be a whole number.")
    .min(1, "Minimum repairs is at least 1.")
    .max(10000, "Minimum repairs is at most 10,000.")
    .default(5),
});

/** Rows of the comeback list shown on the page; the CSV has them all. */
const LIST_LIMIT = 25;

const pct = formatPercent;
/** A share to two significant figures for the details: "8.4%", "0.53%". */
const exactPct = (v: number | null) => (v === null ? "—" : `${formatPlain(v * 100)}%`);
const METHOD = "Wilson score interval for a proportion (Wilson 1927)";

function RateTable({
  rows,
  firstColumn,
  caption,
  testId,
  confidence,
}: {
  rows: (ComebackRate & { group?: string })[];
  firstColumn: string;
  caption: string;
  testId: string;
  confidence: number;
}) {
  const scaleMax = Math.max(0.05, ...rows.map((r) => r.upper ?? 0));
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm" data-testid={testId}>
        <caption className="sr-only">{caption}</caption>
        <thead className="text-ink-soft">
          <tr>
            <th scope="col" className="py-1 pr-3 font-medium">
              {firstColumn}
            </th>
            <th scope="col" className="py-1 pr-3 text-right font-medium">
              Repairs
            </th>
            <th scope="col" className="py-1 pr-3 text-right font-medium">
              Came back
            </th>
            <th scope="col" className="py-1 pr-3 text-right font-medium">
              Share that came back
            </th>
            <th scope="col" className="py-1 pr-3 text-right font-medium">
              Likely between ({intervalLabel(confidence)})
            </th>
            <th scope="col" className="w-48 py-1 font-medium">
              <span className="sr-only">Interval drawn on a scale of 0 to </span>
              0–{pct(scaleMax)}
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} className="border-t border-line/60">
              <th scope="row" className="py-1 pr-3 font-normal">
                {r.group ? <span className="text-ink-soft">{r.group}: </span> : null}
                {r.group ? r.label.slice(r.group.length + 2) : r.label}
              </th>
              <td className="py-1 pr-3 text-right tabular-nums">{r.repairs}</td>
              <td className="py-1 pr-3 text-right tabular-nums">{r.comebacks}</td>
              <td className="py-1 pr-3 text-right font-semibold tabular-nums">{pct(r.rate)}</td>
              <td className="py-1 pr-3 text-right tabular-nums">
                {pct(r.lower)} to {pct(r.upper)}
              </td>
              <td className="py-1" aria-hidden="true">
                <div className="relative h-3 w-48 rounded bg-sea-50">
                  <div
                    className="absolute top-1 h-1 rounded bg-sea-600"
                    style={{
                      left: `${((r.lower ?? 0) / scaleMax) * 100}%`,
                      width: `${Math.max(1, (((r.upper ?? 0) - (r.lower ?? 0)) / scaleMax) * 100)}%`,
                    }}
                  />
                  <div
                    className="absolute top-0 h-3 w-0.5 bg-ink"
                    style={{ left: `${((r.rate ?? 0) / scaleMax) * 100}%` }}
                  />
                </div>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function RepairCell({ line, unit }: { line: ComebackLine; unit: "mi" | "km" }) {
  return (
    <div className="text-sm">
      <p>
        <span className="font-mono text-[13px] font-semibold">{line.roNumber}</span> ·{" "}
        {line.openedOn} ·{" "}
        {line.odometerMi === null
          ? "no odometer"
          : `${numberFormat(0).format(milesToUnit(line.odometerMi, unit))} ${unit}`}
      </p>
      <p>
        <span className="text-ink-soft">Cause:</span> {line.cause ?? "—"}
      </p>
      <p>
        <span className="text-ink-soft">Correction:</span> {line.correction ?? "—"}
      </p>
      <p className="text-ink-soft">
        {line.technician ?? "technician not recorded"} · {line.vendor ?? "vendor not recorded"}
      </p>
    </div>
  );
}

export default async function ComebacksPage({ searchParams }: { searchParams: PageSearchParams }) {
  const auth = await requirePage("comebacks:read");
  const { query: q, problem } = parseOrDefaults(ComebackPageQuery, await queryValues(searchParams));
  const r = await getComebackReport(await getDb(), auth);
  const unit = r.settings.unit;
  const confidence = r.settings.confidence;
  const enough = (x: ComebackRate) => x.repairs >= q.min;
  const tables: Record<View, (ComebackRate & { group?: string })[]> = {
    fault: r.byFault.filter(enough),
    fix: r.byFix.filter(enough),
    vendor: r.byVendor.filter(enough),
    technician: r.byTechnician.filter(enough),
    coaching: r.byTechnicianJob.filter(enough).map((x) => ({ ...x, group: x.technician })),
  };
  const firstColumn: Record<View, string> = {
    fault: "Fault (DTC or component)",
    fix: "Fix (component: action of the correction)",
    vendor: "Vendor",
    technician: "Technician",
    coaching: "Technician: job type (component system)",
  };
  const link = (view: View) => `/comebacks?${new URLSearchParams({ view, min: String(q.min) })}`;

  return (
    <>
      <PageHeader
        title="Comebacks"
        description={`The same vehicle back for the same fault (a DTC or a component) within ${r.settings.days} days or ${numberFormat(0).format(r.settings.distance)} ${unit} after a repair (the organisation's comeback window).`}
        actions={
          <a href="/api/comebacks?format=csv" className={buttonClass.secondary}>
            Download comebacks (CSV)
          </a>
        }
      />
      {problem ? (
        <p role="alert" className="mb-4 text-alarm-700">
          {problem}: showing the defaults.
        </p>
      ) : null}

      <div className="grid gap-4 sm:grid-cols-4">
        <FigureCard
          label="Repairs"
          value={numberFormat(0).format(r.repairs)}
          note="repair lines naming a DTC or component"
        />
        <FigureCard
          label="Comebacks"
          value={numberFormat(0).format(r.comebacks)}
          note="repairs followed by a return"
        />
        <FigureCard
          label="Share that came back"
          value={pct(r.overall.rate)}
          testId="comeback-share"
          note={describeShare({
            count: r.comebacks,
            of: r.repairs,
            lower: r.overall.lower,
            upper: r.overall.upper,
            noun: ["repair"],
          })}
          details={
            <FigureDetails
              rows={[
                ["Share", exactPct(r.overall.rate)],
                [
                  intervalLabel(confidence),
                  `${exactPct(r.overall.lower)} to ${exactPct(r.overall.upper)}`,
                ],
                ["Method", METHOD],
              ]}
            />
          }
        />
        <FigureCard
          label="Window still open"
          value={numberFormat(0).format(r.stillOpen)}
          note={`repairs within ${r.settings.days} days of the latest (${r.asOf ?? "—"}); left out`}
        />
      </div>

      <Panel title="Comeback rates" className="mt-4">
        <nav aria-label="Group by" className="mb-3 flex flex-wrap gap-1 border-b border-line pb-2">
          {VIEWS.map(([view, label]) => (
            <Link
              key={view}
              href={link(view)}
              aria-current={view === q.view ? "page" : undefined}
              className={`rounded-md px-3 py-1 text-sm no-underline ${
                view === q.view ? "bg-sea-700 text-white" : "text-ink hover:bg-sea-50"
              }`}
            >
              {label}
            </Link>
          ))}
        </nav>
        <form method="get" className="mb-3 flex items-end gap-3 text-sm" aria-label="Filter">
          <input type="hidden" name="view" value={q.view} />
          <label className="flex flex-col gap-1">
            <span className="font-medium">Groups with at least (repairs)</span>
            <input
              name="min"
              inputMode="numeric"
              defaultValue={q.min}
              className={`${inputClass} w-28`}
            />
          </label>
          <button type="submit" className={buttonClass.secondary}>
            Apply
          </button>
        </form>
        <p className="text-sm text-ink-soft">
          Share that came back = repairs followed by a comeback ÷ repairs; &ldquo;likely
          between&rdquo; is its {intervalLabel(confidence)}. Highest lower end first, so a small
          group with a wide range does not top the list.{" "}
          {q.view === "fix"
            ? "A fix is the component plus the action its correction names first (replace, clean, adjust, repair, reprogram, clear codes / no fault found, service); repair lines carry no labour operation code. "
            : ""}
          {q.view === "coaching"
            ? "For coaching: compare a technician with the shop on the same kind of job, and read the interval before the rate. "
            : ""}
          {q.view === "fault"
            ? "Per fault, a repair counts as come back when that same fault returned; the fix held in the rest (the figure a known issue of that fault shows). "
            : "A repair counts as come back when any of its faults returned. "}
          Repairs with no DTC and no component ({r.noFault}) cannot be matched and are left out.
        </p>
        <FigureDetails className="mb-3" rows={[["Method", METHOD]]} />
        {tables[q.view].length === 0 ? (
          <p className="text-sm text-ink-soft">No group has {q.min} or more repairs.</p>
        ) : (
          <RateTable
            rows={tables[q.view]}
            firstColumn={firstColumn[q.view]}
            caption={`Comeback rates, ${VIEWS.find(([v]) => v === q.view)?.[1] ?? ""}`}
            testId={`comeback-rates-${q.view}`}
            confidence={confidence}
          />
        )}
      </Panel>

      <Panel title="Comebacks, newest first" className="mt-4">
        <p className="mb-3 text-sm text-ink-soft">
          {r.pairs.length} comebacks on record
          {r.pairs.length > LIST_LIMIT
            ? `; the newest ${LIST_LIMIT} are shown, the CSV has all`
            : ""}
          . Each row shows the repair and the return side by side.
        </p>
        <div className="overflow-x-auto">
          <table className="w-full text-left align-top" data-testid="comeback-list">
            <caption className="sr-only">Comebacks with both repair orders</caption>
            <thead className="text-sm text-ink-soft">
              <tr>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Fault
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Repair
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Back after
                </th>
                <th scope="col" className="py-1 font-medium">
                  Return
                </th>
              </tr>
            </thead>
            <tbody>
              {r.pairs.slice(0, LIST_LIMIT).map((p) => (
                <tr
                  key={`${p.first.id}-${p.again.id}`}
                  className="border-t border-line/60 align-top"
                >
                  <td className="py-2 pr-3 text-sm">
                    {p.faults.join("; ")}
                    <br />
                    <Link href={`/vehicles/${p.first.vehicleId}`} className="text-xs">
                      Vehicle history
                    </Link>
                  </td>
                  <td className="py-2 pr-3">
                    <RepairCell line={p.first} unit={unit} />
                  </td>
                  <td className="py-2 pr-3 text-sm tabular-nums whitespace-nowrap">
                    {p.days} days
                    <br />
                    {p.miles === null
                      ? "distance unknown"
                      : `${numberFormat(0).format(milesToUnit(p.miles, unit))} ${unit}`}
                  </td>
                  <td className="py-2">
                    <RepairCell line={p.again} unit={unit} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Panel>
    </>
  );
}
