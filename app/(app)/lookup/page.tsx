import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { PlannedScreen } from "@/components/ui/planned-screen";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Lookup" };

export default async function LookupPage() {
  await requirePage("lookup:use");
  return (
    <>
      <PageHeader
        title={"Lookup"}
        description={"Likely causes for this vehicle at this mileage, before you start."}
      />
      <PlannedScreen
        what={
          "The technician's lookup will take a VIN or unit number, the odometer, codes and symptom words, and rank the known issues and patterns that fit."
        }
        points={[
          "How often each was the cause for this cohort and mileage band, with the count behind it",
          "Quick checks in order, the fix that held, and the safety cautions",
          "A printable one-page sheet for the bay, and one click to record what was found",
        ]}
      />
    </>
  );
}
