import Link from "next/link";
import { cellHref } from "@/components/patterns/query-strings";
import { FigureDetails } from "@/components/ui/figure-details";
import { Panel } from "@/components/ui/panel";
import type { RankedCell } from "@/db/queries/cells";
import { formatBand } from "@/lib/format";
import {
  cellFigureRows,
  countOf,
  describeRatio,
  faultName,
  formatConfidence,
} from "@/lib/plain-words";

type Context = {
  unit: "mi" | "km";
  /** The level of the cells' intervals (the analysis run's). */
  confidence: number;
  /** "dtc:P0496" / "component:<slug>" → the fault's name (listFaultNames). */
  faultNames: ReadonlyMap<string, string>;
};

function CellLine({ c, unit, confidence, faultNames }: Context & { c: RankedCell }) {
  const name =
    (c.dtc ? faultNames.get(`dtc:${c.dtc}`) : faultNames.get(`component:${c.component}`)) ??
    faultName({ dtc: c.dtc, faultKey: c.component ? `component:${c.component}` : null });
  return (
    <li className="border-t border-line/60 py-2 first:border-0">
      <Link href={cellHref(c)} className="font-medium">
        {c.make} {c.model} {c.generation} · {name}
      </Link>
      <p className="text-sm text-ink-soft">
        {formatBand(c.bandFrom, c.bandTo, unit)}: {countOf(c.events, "repair")},{" "}
        {describeRatio({
          ratio: c.ratio,
          lower: c.ratioLower,
          upper: c.ratioUpper,
          events: c.events,
        })}
      </p>
      <FigureDetails
        summary="Figures"
        rows={cellFigureRows(
          {
            ratePer10kMi: c.rate,
            rateLower: c.rateLower,
            rateUpper: c.rateUpper,
            ratio: c.ratio,
            ratioLower: c.ratioLower,
            ratioUpper: c.ratioUpper,
            pValue: c.pValue,
            qValue: c.qValue,
          },
          confidence,
          unit,
        )}
      />
    </li>
  );
}

/** Home: the newest signals and the strongest recurring failures, from the latest analysis. */
export function PatternPanels({
  signals,
  top,
  unit,
  run,
  faultNames,
}: {
  signals: (RankedCell & { firstSeen?: string | null })[];
  top: RankedCell[];
  unit: "mi" | "km";
  /** The latest analysis run, or null before the first. */
  run: { finishedAt: string; confidenceLevel: number } | null;
  faultNames: ReadonlyMap<string, string>;
}) {
  if (!run) {
    return (
      <Panel title="Patterns">
        <p className="text-sm text-ink-soft">
          No statistics yet: they are computed after the first import of repair orders. Until then
          there is nothing to show — which is not the same as &ldquo;no problems&rdquo;.
        </p>
      </Panel>
    );
  }
  const context: Context = { unit, confidence: run.confidenceLevel, faultNames };
  const newest = [...signals]
    .sort((a, b) => String(b.firstSeen ?? "").localeCompare(String(a.firstSeen ?? "")))
    .slice(0, 5);
  return (
    <>
      <Panel title={`New signals (${signals.length})`}>
        {newest.length === 0 ? (
          <p className="text-sm text-ink-soft">
            No failure stands out from the rest of the fleet once chance across all the cells is
            allowed for.
          </p>
        ) : (
          <ul>
            {newest.map((c) => (
              <CellLine key={cellHref(c)} c={c} {...context} />
            ))}
          </ul>
        )}
      </Panel>
      <Panel title="Top recurring failures">
        <ul>
          {top.map((c) => (
            <CellLine key={cellHref(c)} c={c} {...context} />
          ))}
        </ul>
        <Link href="/patterns" className="mt-2 inline-block text-sm">
          All patterns →
        </Link>
        <p className="mt-2 text-xs text-ink-soft">
          Computed {run.finishedAt.slice(0, 16).replace("T", " ")} UTC. Against the rest of the
          fleet in the same mileage band; &ldquo;at least&rdquo; and &ldquo;likely&rdquo; at{" "}
          {formatConfidence(run.confidenceLevel)} confidence.
        </p>
      </Panel>
    </>
  );
}
