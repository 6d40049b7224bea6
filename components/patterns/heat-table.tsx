import type { HeatRow } from "@/db/queries/patterns";
import type { HeatCell } from "@/lib/cell-types";
import { formatBand } from "@/lib/format";
import { describeTooLittle, sentence, type Metric, type MetricContext } from "@/lib/metrics";

type Band = { band: number; from: number; to: number };

/** One cell in words, for the table's buttons (what a screen reader reads). */
function describeHeatCell(
  m: Metric,
  rowLabel: string,
  band: string,
  c: HeatCell | null,
  ctx: MetricContext,
): string {
  if (!c) return `${rowLabel}, ${band}: no vehicles observed in this band.`;
  if (c.hasTooLittleData)
    return `${rowLabel}, ${band}: too little data; ${describeTooLittle(c, ctx.unit).replace(/^Too little data to judge: /, "")}`;
  return `${rowLabel}, ${band}: ${m.describe(c, ctx)}${c.isSignal ? "; a signal" : ""}.`;
}

/** The heatmap's cells as a table: keyboard reachable, and what a screen reader reads. */
export function HeatTable({
  rows,
  bands,
  metric: m,
  ctx,
  title,
  onOpenCell,
}: {
  rows: HeatRow[];
  bands: Band[];
  metric: Metric;
  ctx: MetricContext;
  title: string;
  onOpenCell: (row: HeatRow, cell: HeatCell) => void;
}) {
  return (
    <details className="mt-3">
      <summary className="cursor-pointer text-sm text-sea-700">Show the heatmap as a table</summary>
      <p className="mt-2 text-xs text-ink-soft">
        {sentence(m.label(ctx.unit))}; each cell opens its repairs.
      </p>
      <div className="mt-2 overflow-x-auto">
        <table className="w-full text-left text-xs">
          <caption className="sr-only">{title}</caption>
          <thead>
            <tr>
              <th scope="col" className="py-1 pr-2 font-medium">
                Row
              </th>
              {bands.map((b) => (
                <th key={b.band} scope="col" className="whitespace-nowrap py-1 pr-2 font-medium">
                  {formatBand(b.from, b.to, ctx.unit)}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id} className="border-t border-line/60">
                <th scope="row" className="min-w-48 py-1 pr-2 font-medium">
                  {r.label}
                </th>
                {bands.map((b) => {
                  const c = r.cells.find((x) => x.bandIndex === b.band) ?? null;
                  const band = formatBand(b.from, b.to, ctx.unit);
                  return (
                    <td key={b.band} className="py-1 pr-2">
                      {c ? (
                        <button
                          type="button"
                          className="text-left text-sea-700 underline-offset-2 hover:underline"
                          onClick={() => onOpenCell(r, c)}
                          aria-label={describeHeatCell(m, r.label, band, c, ctx)}
                        >
                          {c.hasTooLittleData
                            ? "too little data"
                            : m.format(m.value(c, ctx.unit), m.interval(c, ctx.unit))}
                        </button>
                      ) : (
                        "—"
                      )}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </details>
  );
}
