import Link from "next/link";
import { AtRiskPanel } from "@/components/home/at-risk-panel";
import { OverviewFigures } from "@/components/home/overview-figures";
import { PatternPanels } from "@/components/home/pattern-panels";
import { getDb } from "@/db";
import { getLatestRun, listRankedCells } from "@/db/queries/cells";
import { listFaultNames } from "@/db/queries/reference";
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
  const faultNames = await listFaultNames(db, [...signals, ...top]);
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
          run={run}
          faultNames={faultNames}
        />
        {can(auth.role, "campaigns:manage") ? (
          <AtRiskPanel unit={org.distanceUnit} />
        ) : can(auth.role, "lookup:use") ? (
          <Panel title="At the bay">
            <p className="text-sm text-ink-soft">
              Before diagnosing: the common failures for a vehicle at its mileage, from its VIN or
              unit number, odometer and codes.
            </p>
            <Link href="/lookup" className="mt-2 inline-block text-sm">
              Look up a vehicle →
            </Link>{" "}
            <Link href="/vehicles" className="mt-2 ml-3 inline-block text-sm">
              Vehicles →
            </Link>
          </Panel>
        ) : (
          <Panel title="Known issues">
            <p className="text-sm text-ink-soft">
              The failures confirmed as patterns here, with their evidence, the checks to make and
              the parts.
            </p>
            <Link href="/known-issues" className="mt-2 inline-block text-sm">
              Known issues →
            </Link>{" "}
            <Link href="/refuel" className="mt-2 ml-3 inline-block text-sm">
              Refuel analysis →
            </Link>
          </Panel>
        )}
      </div>
    </>
  );
}
