import Link from "next/link";
import { cellHref } from "@/components/patterns/query-strings";
import { Panel } from "@/components/ui/panel";
import type { RankedCell } from "@/db/queries/cells";
import { formatBand, formatInterval, formatSig } from "@/lib/format";

function CellLine({ c, unit }: { c: RankedCell; unit: "mi" | "km" }) {
  return (
    <li className="border-t border-line/60 py-2 first:border-0">
      <Link href={cellHref(c)} className="font-medium">
        {c.make} {c.model} {c.generation} · {c.dtc ?? c.component}
      </Link>
      <p className="text-sm text-ink-soft">
        {formatBand(c.bandFrom, c.bandTo, unit)}: {c.events} repairs,{" "}
        {c.ratio === null
          ? `none elsewhere (≥ ${formatSig(c.ratioLower)}×)`
          : `${formatSig(c.ratio)}× the rest`}{" "}
        (95% {formatInterval(c.ratioLower, c.ratioUpper)})
      </p>
    </li>
  );
}

/** Home: the newest signals and the strongest recurring failures, from the latest analysis. */
export function PatternPanels({
  signals,
  top,
  unit,
  computedAt,
}: {
  signals: (RankedCell & { firstSeen?: string | null })[];
  top: RankedCell[];
  unit: "mi" | "km";
  computedAt: string | null;
}) {
  if (!computedAt) {
    return (
      <Panel title="Patterns">
        <p className="text-sm text-ink-soft">
          No statistics yet: they are computed after the first import of repair orders. Until then
          there is nothing to show — which is not the same as &ldquo;no problems&rdquo;.
        </p>
      </Panel>
    );
  }
  const newest = [...signals]
    .sort((a, b) => String(b.firstSeen ?? "").localeCompare(String(a.firstSeen ?? "")))
    .slice(0, 5);
  return (
    <>
      <Panel title={`New signals (${signals.length})`}>
        {newest.length === 0 ? (
          <p className="text-sm text-ink-soft">No cell stands out after false-discovery control.</p>
        ) : (
          <ul>
            {newest.map((c) => (
              <CellLine key={cellHref(c)} c={c} unit={unit} />
            ))}
          </ul>
        )}
      </Panel>
      <Panel title="Top recurring failures">
        <ul>
          {top.map((c) => (
            <CellLine key={cellHref(c)} c={c} unit={unit} />
          ))}
        </ul>
        <Link href="/patterns" className="mt-2 inline-block text-sm">
          All patterns →
        </Link>
        <p className="mt-2 text-xs text-ink-soft">
          Computed {computedAt.slice(0, 16).replace("T", " ")} UTC.
        </p>
      </Panel>
    </>
  );
}
