import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import {
  AttachmentUpload,
  CommentForm,
  StateChangeForm,
  WatchButton,
} from "@/components/known-issues/issue-forms";
import { StateBadge } from "@/components/known-issues/state-badge";
import { buttonClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { CautionList } from "@/components/ui/caution-list";
import { SafetyNote } from "@/components/ui/safety-note";
import { getDb } from "@/db";
import { getKnownIssueEvidence } from "@/db/queries/known-issue-evidence";
import { getKnownIssue } from "@/db/queries/known-issues";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";
import { formatBand, formatInterval, formatSig, ratePerTenThousand } from "@/lib/format";
import {
  ATTACHMENT_MAX_BYTES,
  STATE_CHANGES,
  STATE_LABELS,
  SYMPTOM_LABELS,
} from "@/lib/known-issues";
import { formatDistance, milesToUnit } from "@/lib/units";
import { IssueId } from "./issue-id";
import { VehicleLink } from "@/components/vehicles/vehicle-link";

export const metadata: Metadata = { title: "Known issue" };

const percent = (v: number) => `${formatSig(v * 100, 2)}%`;

export default async function KnownIssuePage({ params }: { params: Promise<{ id: string }> }) {
  const auth = await requirePage("known-issues:read");
  const id = IssueId.safeParse((await params).id);
  if (!id.success) notFound();
  const db = await getDb();
  const issue = await getKnownIssue(db, auth, id.data);
  if (!issue) notFound();
  const evidence = await getKnownIssueEvidence(db, auth, issue);
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
    ...issue.dtcCodes,
    ...(issue.component ? [`${issue.component.system} → ${issue.component.name}`] : []),
  ].join(" · ");
  const cb = evidence.comebackRate;
  const confidence = Math.round(evidence.confidenceLevel * 100);

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
          <Panel title="The fix that held">
            <p className="whitespace-pre-line">{issue.fixDescription ?? "Not written yet."}</p>
            <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
              <dt className="text-ink-soft">Labour operation</dt>
              <dd>{issue.laborOperation ?? "—"}</dd>
              <dt className="text-ink-soft">Typical hours</dt>
              <dd className="tabular-nums">{issue.typicalHours ?? "—"}</dd>
              <dt className="text-ink-soft">Fix held</dt>
              <dd data-testid="fix-success">
                {cb
                  ? `${percent(1 - cb.estimate)} of ${cb.fixes} repairs (${confidence}% ${percent(1 - cb.upper)}–${percent(1 - cb.lower)}, Wilson); ${cb.comebacks} came back within ${evidence.comebackWindow.days} days or ${evidence.comebackWindow.distance.toLocaleString("en-GB")} ${evidence.comebackWindow.unit}`
                  : "No repairs of this fault recorded yet."}
              </dd>
            </dl>
            {issue.parts.length > 0 ? (
              <table className="mt-3 w-full text-left text-sm">
                <caption className="sr-only">Parts</caption>
                <thead className="text-ink-soft">
                  <tr>
                    <th scope="col" className="py-1 pr-3 font-medium">
                      Part number
                    </th>
                    <th scope="col" className="py-1 pr-3 font-medium">
                      Description
                    </th>
                    <th scope="col" className="py-1 pr-3 text-right font-medium">
                      Quantity
                    </th>
                    <th scope="col" className="py-1 text-right font-medium">
                      On hand
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {issue.parts.map((p) => (
                    <tr key={p.partNumber} className="border-t border-line/60">
                      <td className="py-1 pr-3 font-mono text-[13px]">{p.partNumber}</td>
                      <td className="py-1 pr-3">{p.description ?? "not in the parts list"}</td>
                      <td className="py-1 pr-3 text-right tabular-nums">{p.quantity}</td>
                      <td className="py-1 text-right tabular-nums">{p.onHand ?? "—"}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            ) : null}
          </Panel>
          <Panel title="Cautions">
            <CautionList cautions={issue.cautions} className="mb-3" />
            <SafetyNote />
          </Panel>
          {issue.references ? (
            <Panel title="References">
              <p className="whitespace-pre-line">{issue.references}</p>
            </Panel>
          ) : null}
          <Panel title="Photos">
            {issue.attachments.length === 0 ? (
              <p className="text-sm text-ink-soft">No photos yet.</p>
            ) : (
              <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3">
                {issue.attachments.map((a) => (
                  <li key={a.id} className="text-xs text-ink-soft">
                    <a href={`/api/known-issues/attachments/${a.id}`}>
                      {/* eslint-disable-next-line @next/next/no-img-element -- served by an auth-checked route */}
                      <img
                        src={`/api/known-issues/attachments/${a.id}`}
                        alt={`Photo: ${a.fileName}`}
                        className="h-32 w-full rounded border border-line object-cover"
                      />
                    </a>
                    {a.fileName} · {a.uploadedBy ?? "someone"}
                  </li>
                ))}
              </ul>
            )}
            {mayComment ? (
              <AttachmentUpload knownIssueId={issue.id} maxMb={ATTACHMENT_MAX_BYTES / 1_048_576} />
            ) : null}
          </Panel>
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
          <Panel title="Evidence now">
            <dl
              className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-1 text-sm"
              data-testid="evidence"
            >
              <dt>Technicians found it the cause</dt>
              <dd className="text-right tabular-nums" data-testid="evidence-confirmed">
                {issue.findingCounts.confirmed}
              </dd>
              <dt>Found it was not the cause</dt>
              <dd className="text-right tabular-nums" data-testid="evidence-not-the-cause">
                {issue.findingCounts.notTheCause}
              </dd>
              <dt>Repairs of this fault in range</dt>
              <dd className="text-right tabular-nums">{evidence.repairs}</dd>
              <dt>Vehicles affected</dt>
              <dd className="text-right tabular-nums">{evidence.affected.length}</dd>
              <dt>Vehicles at risk</dt>
              <dd className="text-right tabular-nums">{evidence.atRisk.length}</dd>
              <dt>Signals among its cells</dt>
              <dd className="text-right tabular-nums">{evidence.signals}</dd>
              <dt>Vehicles in its cohorts</dt>
              <dd className="text-right tabular-nums">{evidence.cohortVehicles}</dd>
            </dl>
            {evidence.unknownOdometer > 0 ? (
              <p className="mt-2 text-xs text-ink-soft">
                {evidence.unknownOdometer} vehicles of its cohorts have no odometer reading and
                cannot be placed.
              </p>
            ) : null}
          </Panel>
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
        {evidence.cells.length === 0 ? (
          <p className="text-sm text-ink-soft">
            No computed cell covers these cohorts, mileage and fault yet.
          </p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Computed cells covered by this known issue</caption>
              <thead className="text-ink-soft">
                <tr>
                  <th scope="col" className="py-1 pr-3 font-medium">
                    Cohort
                  </th>
                  <th scope="col" className="py-1 pr-3 font-medium">
                    Band
                  </th>
                  <th scope="col" className="py-1 pr-3 font-medium">
                    Fault
                  </th>
                  <th scope="col" className="py-1 pr-3 text-right font-medium">
                    Events / exposure
                  </th>
                  <th scope="col" className="py-1 pr-3 font-medium">
                    Per 10,000 {unit} ({confidence}%)
                  </th>
                  <th scope="col" className="py-1 font-medium">
                    Ratio vs rest ({confidence}%)
                  </th>
                </tr>
              </thead>
              <tbody>
                {evidence.cells.map((c) => (
                  <tr
                    key={`${c.make}|${c.model}|${c.generation}|${c.faultKey}|${c.band}`}
                    className="border-t border-line/60"
                  >
                    <td className="py-1 pr-3">
                      {c.make} {c.model} {c.generation}
                    </td>
                    <td className="py-1 pr-3 whitespace-nowrap">
                      <Link
                        href={`/patterns/cell?${new URLSearchParams({ make: c.make, model: c.model, generation: c.generation, band: String(c.band), fault: c.faultKey.replace(/^dtc:|^component:/, "") }).toString()}`}
                      >
                        {formatBand(c.bandFromMi, c.bandToMi, unit)}
                      </Link>
                    </td>
                    <td className="py-1 pr-3 font-mono text-[13px]">
                      {c.faultKey.replace(/^dtc:|^component:/, "")}
                    </td>
                    <td className="py-1 pr-3 text-right tabular-nums">
                      {c.events} in {formatSig(milesToUnit(c.exposureMi, unit))} {unit}
                    </td>
                    <td className="py-1 pr-3 tabular-nums">
                      {c.hasTooLittleData
                        ? "too little data"
                        : `${formatSig(ratePerTenThousand(c.rate, unit))} (${formatInterval(ratePerTenThousand(c.rateLower, unit), ratePerTenThousand(c.rateUpper, unit))})`}
                    </td>
                    <td className="py-1 tabular-nums">
                      {c.hasTooLittleData
                        ? "—"
                        : `${c.ratio === null ? "∞" : formatSig(c.ratio)} (${formatInterval(c.ratioLower, c.ratioUpper)})`}
                      {c.isSignal ? (
                        <span className="ml-2 rounded bg-ochre-100 px-1.5 text-xs font-semibold text-ochre-700">
                          signal
                        </span>
                      ) : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>

      <div className="mt-4 grid gap-4 lg:grid-cols-2">
        <Panel title={`Vehicles affected (${evidence.affected.length})`}>
          <VehicleList
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
          <VehicleList
            vehicles={evidence.atRisk.slice(0, 60)}
            unit={unit}
            canOpen={canSeeVehicles}
          />
        </Panel>
      </div>

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

function VehicleList({
  vehicles,
  unit,
  canOpen,
}: {
  vehicles: {
    id: number;
    unitNumber: string | null;
    vin: string | null;
    lastOdometerMi: number | null;
  }[];
  unit: "mi" | "km";
  canOpen: boolean;
}) {
  if (vehicles.length === 0) return <p className="text-sm text-ink-soft">None.</p>;
  return (
    <ul className="flex flex-wrap gap-2 text-sm">
      {vehicles.map((v) => (
        <li key={v.id}>
          <VehicleLink
            id={v.id}
            canOpen={canOpen}
            className="rounded border border-line px-2 py-1 no-underline hover:bg-sea-50"
          >
            {v.unitNumber ?? v.vin ?? `#${v.id}`}
            {v.lastOdometerMi !== null ? ` · ${formatDistance(v.lastOdometerMi, unit)}` : ""}
          </VehicleLink>
        </li>
      ))}
    </ul>
  );
}
