import { FigureDetails } from "@/components/ui/figure-details";
import type { CellFigures } from "@/lib/cell-types";
import {
  cellDetails,
  describeTooLittle,
  metricFor,
  RATIO,
  sentence,
  SHARE,
  SHRUNK,
  type MetricContext,
} from "@/lib/metrics";
import { formatPlain } from "@/lib/plain-words";
import { milesToUnit } from "@/lib/units";

/**
 * A cell's figures, each first in words with its denominator and likely range; the methods,
 * exact intervals, p and q one click away.
 */
export function CellFactsPanel({ cell: c, ctx }: { cell: CellFigures; ctx: MetricContext }) {
  const metrics = [metricFor("rate", c.kind), RATIO, SHARE, SHRUNK];
  const rows: [string, string][] = [
    [c.kind === "wear" ? "Wear repairs" : "Repairs", `${c.events}`],
    [
      "Distance driven",
      `${formatPlain(milesToUnit(c.exposureMi, ctx.unit))} ${ctx.unit} in the band`,
    ],
    ...(c.hasTooLittleData
      ? [["In words", describeTooLittle(c, ctx.unit)] as [string, string]]
      : metrics.map((m): [string, string] => [m.label(ctx.unit), sentence(m.describe(c, ctx))])),
  ];
  return (
    <>
      <dl className="mt-4 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        {rows.map(([k, v]) => (
          <div key={k} className="contents">
            <dt className="text-ink-soft">{k}</dt>
            <dd>{v}</dd>
          </div>
        ))}
      </dl>
      <FigureDetails rows={cellDetails(c, ctx, metrics)} className="mt-3" />
    </>
  );
}
