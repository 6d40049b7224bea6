import { Panel } from "@/components/ui/panel";
import { VehicleLink } from "@/components/vehicles/vehicle-link";
import type { KnownIssueDetail } from "@/db/queries/known-issues";
import { STATE_LABELS } from "@/lib/known-issues";
import { formatDistance } from "@/lib/units";
import { CommentForm } from "./issue-forms";

/** Findings from the bay, then the history of states and comments (with the comment form). */
export function IssueTimeline({
  issue,
  unit,
  canSeeVehicles,
  mayComment,
}: {
  issue: Pick<KnownIssueDetail, "id" | "findings" | "history">;
  unit: "mi" | "km";
  canSeeVehicles: boolean;
  mayComment: boolean;
}) {
  return (
    <>
      <Panel title="Findings from the bay" className="mt-4">
        {issue.findings.length === 0 ? (
          <p className="text-sm text-ink-soft">No findings recorded yet (Lookup → record).</p>
        ) : (
          <ul className="space-y-1 text-sm">
            {issue.findings.slice(0, 30).map((f) => (
              <li key={f.id}>
                <span className="font-medium">
                  {f.outcome === "confirmed"
                    ? "The cause"
                    : f.outcome === "not-the-cause"
                      ? "Not the cause"
                      : "Something else"}
                </span>{" "}
                ·{" "}
                <VehicleLink id={f.vehicleId} canOpen={canSeeVehicles}>
                  {f.unitNumber ?? f.vin ?? `#${f.vehicleId}`}
                </VehicleLink>
                {f.odometerMi !== null ? ` at ${formatDistance(f.odometerMi, unit)}` : ""} ·{" "}
                {f.userName ?? "someone"}, {f.createdAt.slice(0, 10)}
                {f.cause ? <span className="block text-ink-soft">{f.cause}</span> : null}
              </li>
            ))}
          </ul>
        )}
      </Panel>
      <Panel title="History" className="mt-4">
        <ol className="space-y-2 text-sm" data-testid="history">
          {issue.history.map((h, i) => (
            <li key={i} className="border-l-2 border-line pl-3">
              <span className="text-ink-soft">
                {h.createdAt.slice(0, 16).replace("T", " ")} · {h.userName ?? "someone"}
              </span>
              {h.type === "state" ? (
                <p>
                  {h.fromState
                    ? `${STATE_LABELS[h.fromState].label} → ${STATE_LABELS[h.toState].label}`
                    : `Started as ${STATE_LABELS[h.toState].label.toLowerCase()}`}
                  : {h.reason}
                </p>
              ) : (
                <p className="whitespace-pre-line">{h.body}</p>
              )}
            </li>
          ))}
        </ol>
        {mayComment ? <CommentForm knownIssueId={issue.id} /> : null}
      </Panel>
    </>
  );
}
