import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { PlannedScreen } from "@/components/ui/planned-screen";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Stocking" };

export default async function StockingPage() {
  await requirePage("stocking:read");
  return (
    <>
      <PageHeader
        title={"Stocking"}
        description={"Which parts to keep on the shelf for the vehicles you see."}
      />
      <PlannedScreen
        what={
          "The stocking planner will forecast demand per part from your customer base's make-up and measured failure rates."
        }
        points={[
          "Stock level for a chosen service level from Poisson quantiles, with a cautious option",
          "Compared with on-hand stock: reorder quantity and expected shortfall",
          "Purchase list export",
        ]}
      />
    </>
  );
}
