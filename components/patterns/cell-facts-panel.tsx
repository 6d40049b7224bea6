import type { HeatCell } from "@/db/queries/patterns";
import { formatInterval, formatSig, ratePerTenThousand } from "@/lib/format";
import { milesToUnit } from "@/lib/units";

/** A cell's figures, each with its denominator and interval. */
export function CellFactsPanel({ cell: c, unit }: { cell: HeatCell; unit: "mi" | "km" }) {
  const rows: [string, string][] = [
    ["Repairs", `${c.events}`],
    ["Exposure", `${formatSig(milesToUnit(c.exposureMi, unit), 4)} ${unit} driven in the band`],
    [
      `Rate per 10,000 ${unit}`,
      `${formatSig(ratePerTenThousand(c.rate, unit))} (${formatInterval(ratePerTenThousand(c.rateLower, unit), ratePerTenThousand(c.rateUpper, unit))})`,
    ],
    [
      "Vehicles affected",
      `${c.vehiclesAffected} of ${c.vehicles} (${formatSig((c.share ?? 0) * 100)}%, ${formatSig((c.shareLower ?? 0) * 100)}–${formatSig((c.shareUpper ?? 0) * 100)}%)`,
    ],
    [
      "Rate ratio vs rest of fleet",
      c.ratio === null && c.events > 0
        ? `no repairs elsewhere (lower limit ${formatSig(c.ratioLower)})`
        : `${formatSig(c.ratio)} (${formatInterval(c.ratioLower, c.ratioUpper)})`,
    ],
    ["q (false discovery rate)", c.qValue === null ? "not tested" : formatSig(c.qValue, 2)],
  ];
  return (
    <dl className="mt-4 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-ink-soft">{k}</dt>
          <dd className="tabular-nums">{v}</dd>
        </div>
      ))}
    </dl>
  );
}
