import Link from "next/link";
import { FixHeldFigure } from "@/components/known-issues/fix-held-figure";
import { CautionList } from "@/components/ui/caution-list";
import { FigureDetails } from "@/components/ui/figure-details";
import type { CauseResult } from "@/db/queries/lookup";
import { STATE_LABELS } from "@/lib/known-issues";
import { describeCell, describeTooLittle, SHARE, type MetricContext } from "@/lib/metrics";
import { describeShare, formatPercent, formatPlain, intervalLabel } from "@/lib/plain-words";
import { ComponentFindingForm, KnownIssueFindingForm, type FindingContext } from "./finding-forms";

/** One likely cause: how often it was the cause, its checks, its fix and how often it held, its cautions. */
export function CauseBlock({
  cause: c,
  rank,
  ctx,
  cellConfidence,
  recording,
  isPrinted,
}: {
  cause: CauseResult;
  rank: number;
  /** The organisation's unit and confidence (the shares' intervals). */
  ctx: MetricContext;
  /** The confidence of the cells' run (the cell's intervals). */
  cellConfidence: number;
  recording: FindingContext | null;
  isPrinted: boolean;
}) {
  const s = c.share;
  const unit = ctx.unit;
  return (
    <li
      className={`break-inside-avoid rounded-lg border border-line bg-panel p-4 print:p-2 print:text-[10pt] ${isPrinted ? "" : "print:hidden"}`}
      data-testid="cause"
    >
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="text-base font-semibold">
          <span className="mr-2 text-ink-soft">{rank}.</span>
          {c.knownIssue ? (
            <Link href={`/known-issues/${c.knownIssue.id}`}>{c.title}</Link>
          ) : (
            <>Pattern: {c.title}</>
          )}
        </h3>
        <span className="rounded bg-sea-50 px-2 py-0.5 text-xs text-sea-800">
          {c.knownIssue
            ? `Known issue · ${STATE_LABELS[c.knownIssue.state].label}`
            : "Computed pattern cell"}
        </span>
      </div>
      <div className="mt-1" data-testid="cause-share">
        {s.trials > 0 ? (
          <>
            <p>
              Was the cause in{" "}
              <strong>
                {describeShare({
                  count: s.successes,
                  of: s.trials,
                  lower: s.lower,
                  upper: s.upper,
                  noun: ["case"],
                })}
              </strong>
            </p>
            <FigureDetails
              className="print:hidden"
              rows={[
                ["Repair lines fixed at this", `${s.fromLines.fixed} of ${s.fromLines.of}`],
                [
                  "Technicians' findings",
                  `${s.fromFindings.confirmed} the cause, ${s.fromFindings.notTheCause} not the cause`,
                ],
                [
                  intervalLabel(ctx.confidence),
                  `${formatPercent(s.lower)} to ${formatPercent(s.upper)}`,
                ],
                ["Method", SHARE.method],
              ]}
            />
          </>
        ) : (
          <p className="text-ink-soft">No matching repairs or findings yet: no share to show.</p>
        )}
      </div>
      {c.cell ? (
        <p className="text-sm text-ink-soft print:hidden" data-testid="cause-cell">
          {c.kind === "cell" ? "This pattern" : "Its pattern"} in this band:{" "}
          {c.cell.hasTooLittleData
            ? describeTooLittle(c.cell, unit)
            : `${describeCell(c.cell, { unit, confidence: cellConfidence })} (${intervalLabel(cellConfidence)}s)`}
          {c.cell.isSignal ? " A signal." : ""}
        </p>
      ) : null}
      <div className="mt-3 grid gap-4 md:grid-cols-2 print:mt-1 print:grid-cols-2 print:gap-2">
        <div>
          <h4 className="text-sm font-semibold">Quick checks, in order</h4>
          {c.checks.length > 0 ? (
            <ol className="mt-1 list-decimal space-y-0.5 pl-5 text-sm" data-testid="checks">
              {c.checks.map((t) => (
                <li key={t}>{t}</li>
              ))}
            </ol>
          ) : (
            <p className="mt-1 text-sm text-ink-soft">
              None written: this is a computed pattern, not a known issue.
            </p>
          )}
        </div>
        <div className="text-sm">
          <h4 className="font-semibold">The fix</h4>
          <p className="mt-1">
            {c.fix.laborOperation ? <strong>{c.fix.laborOperation}. </strong> : null}
            {c.fix.description ??
              (c.fix.source === "records" ? "No correction text on record." : "")}
          </p>
          <p className="text-ink-soft">
            {c.fix.typicalHours !== null
              ? `${formatPlain(c.fix.typicalHours)} h ${c.fix.source === "records" ? "(median on record)" : "typical"}`
              : "Hours not known"}
            {c.fix.parts.length > 0
              ? ` · parts ${c.fix.parts.map((p) => `${p.partNumber}${p.quantity > 1 ? ` ×${p.quantity}` : ""}${p.description ? ` (${p.description})` : ""}`).join(", ")}`
              : ""}
          </p>
          <div className="mt-1">
            <FixHeldFigure fixHeld={c.fixHeld} unit={unit} />
          </div>
        </div>
      </div>
      <div className="mt-3 print:mt-1">
        <h4 className="text-sm font-semibold">Cautions</h4>
        <CautionList cautions={c.cautions} className="mt-1" />
      </div>
      {recording && c.knownIssue ? (
        <KnownIssueFindingForm context={recording} knownIssueId={c.knownIssue.id} title={c.title} />
      ) : recording && c.component ? (
        <ComponentFindingForm
          context={recording}
          componentSlug={c.component.slug}
          title={c.title}
          correction={c.fix.description}
        />
      ) : null}
    </li>
  );
}
