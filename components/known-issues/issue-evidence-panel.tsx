import { Panel } from "@/components/ui/panel";
import type { KnownIssueEvidence } from "@/db/queries/known-issue-evidence";

/** The counts behind a known issue as the data stands now. */
export function IssueEvidencePanel({
  findingCounts,
  evidence,
}: {
  findingCounts: { confirmed: number; notTheCause: number };
  evidence: KnownIssueEvidence;
}) {
  const rows: [string, number, string?][] = [
    ["Technicians found it the cause", findingCounts.confirmed, "evidence-confirmed"],
    ["Found it was not the cause", findingCounts.notTheCause, "evidence-not-the-cause"],
    ["Repairs of this fault in range", evidence.repairs],
    ["Vehicles affected", evidence.affected.length],
    ["Vehicles at risk", evidence.atRisk.length],
    ["Signals among its cells", evidence.signals],
    ["Vehicles in its cohorts", evidence.cohortVehicles],
  ];
  return (
    <Panel title="Evidence now">
      <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-1 text-sm" data-testid="evidence">
        {rows.map(([label, n, testId]) => (
          <div key={label} className="contents">
            <dt>{label}</dt>
            <dd className="text-right tabular-nums" data-testid={testId}>
              {n}
            </dd>
          </div>
        ))}
      </dl>
      {evidence.unknownOdometer > 0 ? (
        <p className="mt-2 text-xs text-ink-soft">
          {evidence.unknownOdometer} vehicles of its cohorts have no odometer reading and cannot be
          placed.
        </p>
      ) : null}
    </Panel>
  );
}
