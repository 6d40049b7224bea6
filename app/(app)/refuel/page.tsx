import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { PlannedScreen } from "@/components/ui/planned-screen";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Refuel analysis" };

export default async function RefuelPage() {
  await requirePage("refuel:read");
  return (
    <>
      <PageHeader
        title={"Refuel analysis"}
        description={"Stalls and no-starts that cluster shortly after fill-ups."}
      />
      <PlannedScreen
        what={
          "The post-refuel analysis will compare how many stalls happen within a few miles of a fill-up with what chance predicts from each vehicle's refuelling interval."
        }
        points={[
          "Per vehicle and per cohort, with interval and p-value",
          "Histogram of miles since the last fill-up",
          "Vehicles with no fuel data counted and listed, never dropped silently",
        ]}
      />
    </>
  );
}
