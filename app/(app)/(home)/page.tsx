import Link from "next/link";
import { OverviewFigures } from "@/components/home/overview-figures";
import { PatternPanels } from "@/components/home/pattern-panels";
import { getDb } from "@/db";
import { getLatestRun, listRankedCells } from "@/db/queries/cells";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";

export default async function HomePage() {
  const auth = await requirePage("dashboard:read");
  const org = auth.organisation;
  const db = await getDb();
  const [run, signalList, topList] = await Promise.all([
    getLatestRun(db, auth),
    listRankedCells(db, auth, { isSignalOnly: true, withFirstSeen: true, limit: 200 }),
    listRankedCells(db, auth, { limit: 5 }),
  ]);
  const signals = signalList.cells;
  const top = topList.cells;
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
        <PatternPanels
          signals={signals}
          top={top}
          unit={org.distanceUnit}
          computedAt={run?.finishedAt ?? null}
        />
        {can(auth.role, "lookup:use") ? (
          <Panel title="At the bay">
            <p className="text-sm text-ink-soft">
              Find a vehicle by VIN or unit number and see its timeline and the patterns it matches.
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
