import Link from "next/link";
import { OverviewFigures } from "@/components/home/overview-figures";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";

export default async function HomePage() {
  const auth = await requirePage("dashboard:read");
  const org = auth.organisation;
  return (
    <>
      <PageHeader
        title={org.name}
        description={
          org.kind === "fleet"
            ? "Fleet overview: which vehicles and generations keep failing, and where a pattern is more than bad luck."
            : "Shop overview: what your customers' vehicles keep coming in for, and what to keep on the shelf."
        }
      />
      <OverviewFigures organisationId={auth.organisationId} />
      <div className="mt-6 grid gap-4 lg:grid-cols-3">
        <Panel title="New signals">
          <p className="text-sm text-ink-soft">
            Signals appear here once the statistics engine has ranked this organisation&apos;s
            cohort × mileage-band cells. It has not run yet, so there is nothing to show — not
            &ldquo;no problems&rdquo;.
          </p>
        </Panel>
        <Panel title="Top recurring failures">
          <p className="text-sm text-ink-soft">
            The ranked list (by the lower bound of the rate ratio, with intervals) arrives with the
            pattern explorer.
          </p>
          {can(auth.role, "patterns:read") ? (
            <Link href="/patterns" className="mt-2 inline-block text-sm">
              Patterns →
            </Link>
          ) : null}
        </Panel>
        {can(auth.role, "lookup:use") ? (
          <Panel title="At the bay">
            <p className="text-sm text-ink-soft">
              Find a vehicle by VIN or unit number and see its repair history.
            </p>
            <Link href="/vehicles" className="mt-2 inline-block text-sm">
              Vehicles →
            </Link>
          </Panel>
        ) : (
          <Panel title="Vehicles at risk">
            <p className="text-sm text-ink-soft">
              The watch-list of vehicles approaching a known issue&apos;s mileage comes with the
              fleet workflows.
            </p>
          </Panel>
        )}
      </div>
    </>
  );
}
