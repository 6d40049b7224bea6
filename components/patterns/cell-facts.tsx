import type { HeatCell } from "@/lib/cell-types";
import { describeTooLittle, type Metric, type MetricContext, sentence } from "@/lib/metrics";
import { countOf, formatPlain, formatProbability, intervalLabel } from "@/lib/plain-words";
import { milesToUnit } from "@/lib/units";

/** A heatmap cell's figures for its tooltip: first in words, then the value, interval and method. */
export function CellFacts({
  metric: m,
  cell,
  ctx,
}: {
  metric: Metric;
  cell: HeatCell;
  ctx: MetricContext;
}) {
  if (cell.hasTooLittleData) return <p>{describeTooLittle(cell, ctx.unit)}</p>;
  const interval = m.interval(cell, ctx.unit);
  return (
    <>
      <p className="mt-1" data-testid="tooltip-sentence">
        {sentence(m.describe(cell, ctx))}.
      </p>
      <dl className="mt-1 grid grid-cols-[minmax(0,8rem)_1fr] gap-x-2">
        <dt>{m.label(ctx.unit)}</dt>
        <dd data-testid="tooltip-value">{m.format(m.value(cell, ctx.unit), interval)}</dd>
        <dt>{intervalLabel(ctx.confidence)}</dt>
        <dd data-testid="tooltip-interval">{m.formatInterval(interval)}</dd>
        <dt>Method</dt>
        <dd>{m.method}</dd>
        <dt>Repairs</dt>
        <dd>
          {countOf(cell.events, cell.kind === "wear" ? "wear repair" : "repair")} in{" "}
          {formatPlain(milesToUnit(cell.exposureMi, ctx.unit))} {ctx.unit} driven
        </dd>
        <dt>Vehicles</dt>
        <dd>
          {cell.vehiclesAffected} of {countOf(cell.vehiclesAtRisk, "vehicle")} affected
        </dd>
        {cell.isSignal ? (
          <>
            <dt>Signal</dt>
            <dd>yes (q {formatProbability(cell.qValue)})</dd>
          </>
        ) : null}
      </dl>
    </>
  );
}
