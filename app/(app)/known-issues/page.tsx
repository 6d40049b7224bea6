import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { PlannedScreen } from "@/components/ui/planned-screen";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Known issues" };

export default async function KnownIssuesPage() {
  await requirePage("known-issues:read");
  return (
    <>
      <PageHeader
        title={"Known issues"}
        description={"Curated patterns your team stands behind."}
      />
      <PlannedScreen
        what={
          "The known-issue library will hold patterns with affected cohorts and mileage, quick checks, the fix that held, parts and cautions."
        }
        points={[
          "States: watching \u2192 confirmed \u2192 mitigated \u2192 retired, each change with who, when and why",
          "Live evidence: current rates and intervals, vehicles affected and at risk",
          "Start a known issue from a signal, or by hand",
        ]}
      />
    </>
  );
}
