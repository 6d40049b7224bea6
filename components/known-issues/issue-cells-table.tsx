import Link from "next/link";
import { FigureDetails } from "@/components/ui/figure-details";
import { KindBadge } from "@/components/ui/kind-badge";
import type { EvidenceCell } from "@/db/queries/known-issue-evidence";
import { formatBand } from "@/lib/format";
import {
  cellDetails,
  metricFigure,
  metricFor,
  metricHeader,
  RATIO,
  type MetricContext,
} from "@/lib/metrics";
import { formatPlain } from "@/lib/plain-words";
import { milesToUnit } from "@/lib/units";

/** A figure of the table: the value, and its interval in words. */
function Figure({ value, likely }: { value: string; likely: string }) {
  return (
    <>
      {value} <span className="block text-xs text-ink-soft">{likely}</span>
    </>
  );
}

/** The computed cells a known issue covers, each figure from the metric registry. */
export function IssueCellsTable({ cells, ctx }: { cells: EvidenceCell[]; ctx: MetricContext }) {
  if (cells.length === 0)
    return (
      <p className="text-sm text-ink-soft">
        No computed cell covers these cohorts, mileage and fault yet.
      </p>
    );
  const rate = metricFor("rate", cells[0]?.kind ?? "failure");
  const th = "py-1 pr-3 font-medium";
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Computed cells covered by this known issue</caption>
        <thead className="text-ink-soft">
          <tr>
            <th scope="col" className={th}>
              Cohort
            </th>
            <th scope="col" className={th}>
              Mileage band
            </th>
            <th scope="col" className={th}>
              Fault
            </th>
            <th scope="col" className={`${th} text-right`}>
              Repairs, and distance driven
            </th>
            <th scope="col" className={th}>
              {metricHeader(rate, ctx)}
            </th>
            <th scope="col" className={th}>
              {metricHeader(RATIO, ctx)}
            </th>
            <th scope="col" className="py-1 font-medium">
              Signal, and how it is worked out
            </th>
          </tr>
        </thead>
        <tbody>
          {cells.map((c) => {
            const fault = c.faultKey.replace(/^dtc:|^component:/, "");
            const href = `/patterns/cell?${new URLSearchParams({ make: c.make, model: c.model, generation: c.cohortLabel, band: String(c.bandIndex), fault }).toString()}`;
            return (
              <tr
                key={`${c.make}|${c.model}|${c.cohortLabel}|${c.faultKey}|${c.bandIndex}`}
                className="border-t border-line/60 align-top"
              >
                <td className="py-1 pr-3">
                  {c.make} {c.model} {c.cohortLabel}
                </td>
                <td className="whitespace-nowrap py-1 pr-3">
                  <Link href={href}>{formatBand(c.bandFromMi, c.bandToMi, ctx.unit)}</Link>
                </td>
                <td className="py-1 pr-3">
                  {c.faultName} <KindBadge kind={c.kind} />
                </td>
                <td className="py-1 pr-3 text-right tabular-nums">
                  {c.events} in {formatPlain(milesToUnit(c.exposureMi, ctx.unit))} {ctx.unit}
                </td>
                <td className="py-1 pr-3 tabular-nums">
                  {c.hasTooLittleData ? (
                    "too little data"
                  ) : (
                    <Figure {...metricFigure(metricFor("rate", c.kind), c, ctx.unit)} />
                  )}
                </td>
                <td className="py-1 pr-3 tabular-nums">
                  {c.hasTooLittleData ? "—" : <Figure {...metricFigure(RATIO, c, ctx.unit)} />}
                </td>
                <td className="py-1">
                  {c.isSignal ? (
                    <span className="rounded bg-ochre-100 px-1.5 text-xs font-semibold text-ochre-700">
                      signal
                    </span>
                  ) : (
                    <span className="text-xs text-ink-soft">not a signal</span>
                  )}
                  <FigureDetails summary="Details" className="text-xs" rows={cellDetails(c, ctx)} />
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
