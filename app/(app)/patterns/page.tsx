import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { PlannedScreen } from "@/components/ui/planned-screen";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Patterns" };

export default async function PatternsPage() {
  await requirePage("patterns:read");
  return (
    <>
      <PageHeader
        title={"Patterns"}
        description={"Where failures concentrate by cohort and mileage, and how sure we are."}
      />
      <PlannedScreen
        what={
          "The pattern explorer will show cohort \u00d7 mileage-band heatmaps with uncertainty made visible, and a ranked list of recurring failures."
        }
        points={[
          "Heatmap of cohorts (make \u00b7 model \u00b7 generation) against mileage bands, cells fading toward neutral where the interval is wide",
          "Ranked recurring failures by the lower bound of the rate ratio, each with its interval",
          "Filters kept in the address so a view can be shared; drill-down to a cell's vehicles and repair orders",
        ]}
      />
    </>
  );
}
