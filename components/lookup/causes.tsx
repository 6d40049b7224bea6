import { Panel } from "@/components/ui/panel";
import { FigureDetails } from "@/components/ui/figure-details";
import type { LookupResult } from "@/db/queries/lookup";
import { formatBand } from "@/lib/format";
import { MIN_LINES_IN_BAND, rankingRule } from "@/lib/lookup";
import { CauseBlock } from "./cause-block";
import { SomethingElseForm, type FindingContext } from "./finding-forms";

/** How many causes the printed sheet carries (the rest stay on screen). */
const PRINTED_CAUSES = 3;

/** The ranked likely causes for the vehicle, and the form for something else. */
export function Causes({
  result,
  unit,
  isFiltered,
  recording,
}: {
  result: Extract<LookupResult, { found: true }>;
  unit: "mi" | "km";
  /** Whether the count is narrowed to the entered codes or symptom. */
  isFiltered: boolean;
  /** What a finding recorded here is about; null: no finding forms. */
  recording: FindingContext | null;
}) {
  const band = result.band ? formatBand(result.band.fromMi, result.band.toMi, unit) : null;
  return (
    <section aria-labelledby="causes-heading">
      <h2 id="causes-heading" className="text-lg font-semibold print:text-base">
        Likely causes for {result.cohort}
        {band ? ` at ${band}` : ""}
      </h2>
      <p className="mt-1 text-sm" data-testid="counted-on">
        Counted on {result.matchedLines} repair line{result.matchedLines === 1 ? "" : "s"} of{" "}
        {result.cohort}
        {result.isWidened ? " over the whole cohort (all mileages)" : band ? ` in ${band}` : ""}
        {isFiltered ? " that carry the entered codes or symptom" : ""}.
        {result.isWidened && result.band ? (
          <strong className="text-ochre-700">
            {" "}
            Fewer than {MIN_LINES_IN_BAND} such lines in this band, so the count was widened to the
            whole cohort.
          </strong>
        ) : null}
      </p>
      <FigureDetails
        summary="How the causes are ranked"
        className="print:hidden"
        rows={[["Ranking", rankingRule(result.settings.confidence)]]}
      />
      {result.causes.length === 0 ? (
        <p className="mt-3 rounded-md border border-line bg-panel px-4 py-3">
          No known issue or pattern fits this cohort and mileage with these codes. Work through the
          usual diagnosis, and record what you find below.
        </p>
      ) : (
        <ol className="mt-3 space-y-4 print:space-y-2" data-testid="causes">
          {result.causes.map((c, i) => (
            <CauseBlock
              key={c.key}
              cause={c}
              rank={i + 1}
              ctx={{ unit, confidence: result.settings.confidence }}
              cellConfidence={result.cellConfidence}
              recording={recording}
              isPrinted={i < PRINTED_CAUSES}
            />
          ))}
        </ol>
      )}
      {recording ? (
        <Panel title="Something else was the cause" className="no-print mt-4">
          <SomethingElseForm context={recording} />
        </Panel>
      ) : null}
    </section>
  );
}
