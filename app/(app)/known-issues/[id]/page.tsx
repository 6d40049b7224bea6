import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { IssueCellsTable } from "@/components/known-issues/issue-cells-table";
import { IssueEvidencePanel } from "@/components/known-issues/issue-evidence-panel";
import { StateChangeForm, WatchButton } from "@/components/known-issues/issue-forms";
import { IssueFixPanel } from "@/components/known-issues/issue-fix-panel";
import { IssuePhotos } from "@/components/known-issues/issue-photos";
import { IssueTimeline } from "@/components/known-issues/issue-timeline";
import { IssueVehicles } from "@/components/known-issues/issue-vehicles";
import { StateBadge } from "@/components/known-issues/state-badge";
import { buttonClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { CautionList } from "@/components/ui/caution-list";
import { SafetyNote } from "@/components/ui/safety-note";
import { getDb } from "@/db";
import { getKnownIssueFixHeld } from "@/db/queries/fix-held";
import { getKnownIssueEvidence } from "@/db/queries/known-issue-evidence";
import { getKnownIssue } from "@/db/queries/known-issues";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";
import { STATE_CHANGES, STATE_LABELS, SYMPTOM_LABELS } from "@/lib/known-issues";
import { formatDistance } from "@/lib/units";
import { IssueId } from "./issue-id";

export const metadata: Metadata = { title: "Known issue" };

export default async function KnownIssuePage({ params }: { params: Promise<{ id: string }> }) {
  const auth = await requirePage("known-issues:read");
  const id = IssueId.safeParse((await params).id);
  if (!id.success) notFound();
  const db = await getDb();
  const issue = await getKnownIssue(db, auth, id.data);
  if (!issue) notFound();
  const [evidence, fixHeld] = await Promise.all([
    getKnownIssueEvidence(db, auth, issue),
    getKnownIssueFixHeld(db, auth, issue),
  ]);
  const unit = auth.organisation.distanceUnit;
  const canSeeVehicles = can(auth.role, "vehicles:read");
  const mayManage = can(auth.role, "known-issues:manage");
  const mayComment = can(auth.role, "known-issues:comment");
  const range =
    issue.mileageFromMi === null && issue.mileageToMi === null
      ? "any mileage"
      : issue.mileageToMi === null
        ? `from ${formatDistance(issue.mileageFromMi ?? 0, unit)}`
        : `${formatDistance(issue.mileageFromMi ?? 0, unit)} to ${formatDistance(issue.mileageToMi, unit)}`;
  const cohorts = issue.cohorts
    .map((c) => `${c.make} ${c.model} ${c.generation ?? "(all generations)"}`)
    .join(", ");
  const fault = [
    ...issue.dtcNames,
    ...(issue.component ? [`${issue.component.system} → ${issue.component.name}`] : []),
  ].join(" · ");

  return (
    <>
      <PageHeader
        title={issue.title}
        description={`${cohorts} · ${range} · ${fault}`}
        actions={
          <div className="flex flex-wrap items-center gap-2">
            <StateBadge state={issue.state} />
            {mayComment ? (
              <WatchButton knownIssueId={issue.id} isWatching={issue.isWatching} />
            ) : null}
            {mayManage ? (
              <Link href={`/known-issues/${issue.id}/edit`} className={buttonClass.secondary}>
                Edit
              </Link>
            ) : null}
          </div>
        }
      />
      <div className="grid gap-4 lg:grid-cols-3">
        <div className="space-y-4 lg:col-span-2">
          {issue.summary ? (
            <Panel title="What happens">
              <p className="whitespace-pre-line">{issue.summary}</p>
              {issue.symptoms.length > 0 ? (
                <p className="mt-2 text-sm text-ink-soft">
                  Symptoms:{" "}
                  {issue.symptoms
                    .map((s) => SYMPTOM_LABELS[s as keyof typeof SYMPTOM_LABELS] ?? s)
                    .join(", ")}
                </p>
              ) : null}
            </Panel>
          ) : null}
          <Panel title="Check first, in this order">
            {issue.checks.length === 0 ? (
              <p className="text-sm text-ink-soft">No quick checks written yet.</p>
            ) : (
              <ol className="list-decimal space-y-1 pl-5" data-testid="quick-checks">
                {issue.checks.map((c, i) => (
                  <li key={i}>{c}</li>
                ))}
              </ol>
            )}
          </Panel>
          <IssueFixPanel issue={issue} fixHeld={fixHeld} unit={unit} />
          <Panel title="Cautions">
            <CautionList cautions={issue.cautions} className="mb-3" />
            <SafetyNote />
          </Panel>
          {issue.references ? (
            <Panel title="References">
              <p className="whitespace-pre-line">{issue.references}</p>
            </Panel>
          ) : null}
          <IssuePhotos issue={issue} mayComment={mayComment} />
        </div>

        <div className="space-y-4">
          <Panel title="State">
            <p>
              <StateBadge state={issue.state} />{" "}
              <span className="text-sm text-ink-soft">{STATE_LABELS[issue.state].meaning}</span>
            </p>
            {mayManage ? (
              <StateChangeForm
                knownIssueId={issue.id}
                options={STATE_CHANGES[issue.state].map((s) => ({
                  value: s,
                  label: STATE_LABELS[s].label,
                }))}
              />
            ) : null}
          </Panel>
          <IssueEvidencePanel findingCounts={issue.findingCounts} evidence={evidence} />
          <Panel title="Watchers">
            {issue.watchers.length === 0 ? (
              <p className="text-sm text-ink-soft">Nobody watches it.</p>
            ) : (
              <ul className="text-sm">
                {issue.watchers.map((w) => (
                  <li key={w.userId}>{w.name}</li>
                ))}
              </ul>
            )}
          </Panel>
        </div>
      </div>

      <Panel title="Its cells in the latest analysis" className="mt-4">
        <IssueCellsTable
          cells={evidence.cells}
          ctx={{ unit, confidence: evidence.cellConfidence }}
        />
      </Panel>

      <div className="mt-4 grid gap-4 lg:grid-cols-2">
        <Panel title={`Vehicles affected (${evidence.affected.length})`}>
          <IssueVehicles
            vehicles={evidence.affected.slice(0, 60)}
            unit={unit}
            canOpen={canSeeVehicles}
          />
          {evidence.affected.length > 60 ? (
            <p className="mt-2 text-xs text-ink-soft">and {evidence.affected.length - 60} more</p>
          ) : null}
        </Panel>
        <Panel title={`Vehicles at risk (${evidence.atRisk.length})`}>
          <p className="mb-2 text-xs text-ink-soft">
            Same cohorts, not affected yet, with the latest odometer inside the range or within one
            band ({formatDistance(evidence.bandWidthMi, unit)}) below it. Nearest first.
          </p>
          <IssueVehicles
            vehicles={evidence.atRisk.slice(0, 60)}
            unit={unit}
            canOpen={canSeeVehicles}
          />
        </Panel>
      </div>

      <IssueTimeline
        issue={issue}
        unit={unit}
        canSeeVehicles={canSeeVehicles}
        mayComment={mayComment}
      />
    </>
  );
}
