import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { StateBadge } from "@/components/known-issues/state-badge";
import { buttonClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { listKnownIssues } from "@/db/queries/known-issues";
import { KNOWN_ISSUE_STATES } from "@/db/schema/known-issues";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";
import { STATE_LABELS } from "@/lib/known-issues";
import { formatDistance } from "@/lib/units";
import { queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Known issues" };

const Query = z.object({ state: z.enum(KNOWN_ISSUE_STATES).optional().catch(undefined) });

export default async function KnownIssuesPage({
  searchParams,
}: {
  searchParams: PageSearchParams;
}) {
  const auth = await requirePage("known-issues:read");
  const { state } = Query.parse(await queryValues(searchParams));
  const issues = await listKnownIssues(await getDb(), auth, { state });
  const unit = auth.organisation.distanceUnit;
  const range = (from: number | null, to: number | null) =>
    from === null && to === null
      ? "any mileage"
      : to === null
        ? `from ${formatDistance(from ?? 0, unit)}`
        : `${formatDistance(from ?? 0, unit)}–${formatDistance(to, unit)}`;
  return (
    <>
      <PageHeader
        title="Known issues"
        description="Curated patterns your team stands behind: affected cohorts and mileage, quick checks, the fix that held, and the cautions."
        actions={
          can(auth.role, "known-issues:manage") ? (
            <Link href="/known-issues/new" className={buttonClass.primary}>
              New known issue
            </Link>
          ) : null
        }
      />
      <nav aria-label="Filter by state" className="mb-4 flex flex-wrap gap-2 text-sm">
        {[undefined, ...KNOWN_ISSUE_STATES].map((s) => (
          <Link
            key={s ?? "all"}
            href={s ? `/known-issues?state=${s}` : "/known-issues"}
            aria-current={s === state ? "page" : undefined}
            className={`rounded-full border px-3 py-1 no-underline ${s === state ? "border-sea-700 bg-sea-700 text-white" : "border-line-strong text-ink hover:bg-sea-50"}`}
          >
            {s ? STATE_LABELS[s].label : "All"}
          </Link>
        ))}
      </nav>
      <Panel>
        {issues.length === 0 ? (
          <p className="text-sm text-ink-soft">
            No known issues {state ? `in the state "${STATE_LABELS[state].label}"` : "yet"}. Start
            one from a signal on the Patterns page, or by hand.
          </p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Known issues</caption>
              <thead className="text-ink-soft">
                <tr>
                  <th scope="col" className="py-2 pr-3 font-medium">
                    Known issue
                  </th>
                  <th scope="col" className="py-2 pr-3 font-medium">
                    State
                  </th>
                  <th scope="col" className="py-2 pr-3 font-medium">
                    Cohorts and mileage
                  </th>
                  <th scope="col" className="py-2 pr-3 font-medium">
                    Fault
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right font-medium">
                    Technicians&apos; findings: the cause / not the cause
                  </th>
                  <th scope="col" className="py-2 font-medium">
                    Changed
                  </th>
                </tr>
              </thead>
              <tbody>
                {issues.map((k) => (
                  <tr key={k.id} className="border-t border-line/60 align-top">
                    <td className="py-2 pr-3">
                      <Link href={`/known-issues/${k.id}`} className="font-medium">
                        {k.title}
                      </Link>
                    </td>
                    <td className="py-2 pr-3">
                      <StateBadge state={k.state} />
                    </td>
                    <td className="py-2 pr-3">
                      {k.cohorts.join(", ")}
                      <span className="block text-ink-soft">
                        {range(k.mileageFromMi, k.mileageToMi)}
                      </span>
                    </td>
                    <td className="py-2 pr-3">
                      {k.dtcNames.map((name) => (
                        <span key={name} className="block">
                          {name}
                        </span>
                      ))}
                      {k.component ? <span className="block">{k.component}</span> : null}
                    </td>
                    <td className="py-2 pr-3 text-right tabular-nums">
                      {k.confirmedFindings} / {k.notTheCause}
                    </td>
                    <td className="py-2 whitespace-nowrap">{k.updatedAt.slice(0, 10)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>
    </>
  );
}
